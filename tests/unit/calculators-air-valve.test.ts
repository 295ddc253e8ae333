// Air-operated valve (calculators.md §6): piston and rod-side force, opening margins with spring,
// seat and friction, and free-air consumption including tubing.
import { describe, expect, it } from 'vitest';
import { all, create } from 'mathjs';
import { runCalculator } from '@/shared/calculators';
import { annulusArea, circleArea } from '@/shared/calculators/air-piston-force';
import { ISO_8778_ATMOSPHERE, STANDARD_ATMOSPHERE, freeAirPerCycle } from '@/shared/calculators/air-consumption';
import { CalculatorInputError } from '@/shared/calculators/types';
import { expectRel, expectPrinted, q, out, catchError } from '../helpers/calc';

const PHYSICS = 1e-6;
const math = create(all, {});

// Parr, Hydraulics and Pneumatics, 3rd ed. (2011) [memory] for the formulas; values derived.
const cylinder = { boreDiameter: q(20, 'mm'), rodDiameter: q(6, 'mm'), airPressure: q(6, 'bar') };
const valve = { ...cylinder, springPreload: q(60, 'N'), springRate: q(8, 'N/mm'), lift: q(1, 'mm'), fluidPressure: q(50, 'bar'), seatDiameter: q(1.5, 'mm') };

describe('air-piston-force (Parr, Hydraulics and Pneumatics [memory]; force balance derived)', () => {
  it('when D = 20 mm, rod 6 mm, 6 bar, then Ap = 314.1593 mm², F = 188.4956 N, Aann = 285.8849 mm², F_ret = 171.5310 N', () => {
    expectPrinted(circleArea(0.02) * 1e6, '314.1593');
    expectPrinted(annulusArea(0.02, 0.006) * 1e6, '285.8849');
    const r = runCalculator('air-piston-force', { inputs: { ...cylinder, springPreload: q(0, 'N'), fluidPressure: q(0, 'bar'), seatDiameter: q(0, 'mm') } });
    expectPrinted(out(r, 'pistonForce', 'N'), '188.4956');
    expectPrinted(out(r, 'returnForce', 'N'), '171.5310');
  });

  it('when mathjs evaluates (6 bar)·π(20 mm)²/4, then 188.4955592153876 N', () => {
    // calculators.md §6 npm cross-check: mathjs (verified)
    const fromMath = math.evaluate('(6 bar)*pi*(20 mm)^2/4 to N').toNumber('N');
    expectRel(fromMath, 188.4955592153876, 1e-12);
    const r = runCalculator('air-piston-force', { inputs: valve });
    expectRel(out(r, 'pistonForce'), fromMath, 1e-12);
  });

  it('when a 60 N, 8 N/mm spring, 1 mm lift and a 1.5 mm seat at 50 bar are added, then the margins are 119.6598 N and 111.6598 N', () => {
    const r = runCalculator('air-piston-force', { inputs: valve, outputUnits: { minAirPressureToCrack: 'bar', minAirPressureFullLift: 'bar' } });
    expectRel(out(r, 'fluidForce', 'N'), 8.835729, PHYSICS);
    expectPrinted(out(r, 'marginAtCrack', 'N'), '119.6598');
    expectPrinted(out(r, 'marginAtFullLift', 'N'), '111.6598');
    expectRel(out(r, 'minAirPressureToCrack', 'bar'), 2.191109, PHYSICS);
    expectRel(out(r, 'minAirPressureFullLift', 'bar'), 2.445757, PHYSICS);
    expect(r.warnings).toEqual([]);
  });

  it('when the air pressure is 0, then the margin is −68.836 N and the valve cannot open', () => {
    // calculators.md §6 edge case [derived]
    const r = runCalculator('air-piston-force', { inputs: { ...valve, airPressure: q(0, 'bar') } });
    expectPrinted(out(r, 'marginAtCrack'), '-68.836');
    expect(r.warnings.map((w) => w.code)).toEqual(['cannot-open']);
  });

  it('when the margin at full lift is under 20 % of the piston force, then a low-margin warning shows', () => {
    // calculators.md "Warnings" list: margin under 20 percent of piston force [common practice]
    const r = runCalculator('air-piston-force', { inputs: { ...valve, airPressure: q(2.8, 'bar') } });
    const ratio = out(r, 'marginAtFullLift') / out(r, 'pistonForce');
    expect(ratio).toBeGreaterThan(0);
    expect(ratio).toBeLessThan(0.2);
    expect(r.warnings.map((w) => w.code)).toEqual(['low-margin']);
  });

  it('when the valve cracks open but the spring stops it short of full lift, then cannot-open says so', () => {
    // derived: M(lift) < 0 ≤ M(0)
    const r = runCalculator('air-piston-force', { inputs: { ...valve, airPressure: q(2.3, 'bar') } });
    expect(out(r, 'marginAtCrack')).toBeGreaterThan(0);
    expect(out(r, 'marginAtFullLift')).toBeLessThan(0);
    expect(r.warnings[0]).toMatchObject({ code: 'cannot-open' });
    expect(r.warnings[0].message).toMatch(/full lift/);
  });

  it('when friction is entered, then it adds to the closing force', () => {
    // derived: M(x) = p Ap − Fs(x) − p_f As − F_fr
    const r = runCalculator('air-piston-force', { inputs: { ...valve, friction: q(10, 'N') } });
    expectRel(out(r, 'marginAtCrack'), 109.6598, 1e-6);
  });

  it('when the rod is as wide as the bore, then the rod diameter is refused', () => {
    // calculators.md §6: reject D ≤ d_rod [derived]
    const error = catchError(() => runCalculator('air-piston-force', { inputs: { ...valve, rodDiameter: q(20, 'mm') } }));
    expect((error as CalculatorInputError).fields).toEqual({ 'inputs.rodDiameter': 'Rod diameter must be smaller than the piston bore' });
  });
});

describe('air-consumption (ISO 8778:2003 title [checked]; isothermal free air derived)', () => {
  const base = { boreDiameter: q(20, 'mm'), rodDiameter: q(6, 'mm'), stroke: q(1, 'mm'), airPressure: q(6, 'bar'), cycleRate: q(300, '1/min') };

  it('when D = 20 mm, stroke 1 mm at 6 bar, then V_swept = 0.314159 cm³, ratio 6.921540, free air 2.174466 cm³ per cycle', () => {
    const swept = circleArea(0.02) * 0.001;
    expectRel(swept * 1e6, 0.314159, PHYSICS);
    expectRel((0.6e6 + STANDARD_ATMOSPHERE) / STANDARD_ATMOSPHERE, 6.92154, PHYSICS);
    const r = runCalculator('air-consumption', { inputs: base });
    expectRel(out(r, 'freeAirPerCycle', 'cm3'), 2.174466, PHYSICS);
  });

  it('when it cycles 300 times a minute, then 0.652340 L/min', () => {
    const r = runCalculator('air-consumption', { inputs: base });
    expectRel(out(r, 'freeAirPerMinute', 'L/min'), 0.65234, PHYSICS);
  });

  it('when mathjs evaluates the per-minute air, then 0.6523397387946296 L/min', () => {
    // calculators.md §6 npm cross-check: mathjs (verified)
    const fromMath = math.evaluate('pi*(20 mm)^2/4 * 1 mm * ((6 bar) + (101325 Pa))/(101325 Pa) * 300 / minute to L/minute').toNumber('L/minute');
    expectRel(fromMath, 0.6523397387946296, 1e-12);
    expectRel(out(runCalculator('air-consumption', { inputs: base }), 'freeAirPerMinute'), fromMath, 1e-12);
  });

  it('when the valve is double-acting, then both strokes count: 4.153230 cm³ per cycle', () => {
    const r = runCalculator('air-consumption', { inputs: { ...base, doubleActing: 'yes' } });
    expectRel(out(r, 'freeAirPerCycle'), 4.15323, PHYSICS);
  });

  it('when the ISO 8778 basis of 100 kPa is used instead, then the ratio is 7.0 and 2.199115 cm³ per cycle', () => {
    // ISO 8778:2003 reference atmosphere 100 kPa [memory]
    const swept = circleArea(0.02) * 0.001;
    expectRel(freeAirPerCycle(swept, 0, 0.6e6, ISO_8778_ATMOSPHERE) * 1e6, 2.199115, PHYSICS);
  });

  it('when 1 m of 4 mm tubing (12.56637 cm³) is dead volume, then +74.41226 cm³ per cycle and 22.97602 L/min in all', () => {
    const r = runCalculator('air-consumption', { inputs: { ...base, deadVolume: q(Math.PI * 0.2 * 0.2 * 100, 'cm3') } });
    expectRel(Math.PI * 0.2 * 0.2 * 100, 12.56637, PHYSICS);
    expectRel(out(r, 'freeAirPerCycle') - 2.174466, 74.41226, PHYSICS);
    expectRel(out(r, 'freeAirPerMinute'), 22.97602, PHYSICS);
    // The tubing dominates consumption by about 34 times.
    expect(Math.round((out(r, 'freeAirPerCycle') - 2.174466) / 2.174466)).toBe(34);
  });

  it('when the air pressure is 0 gauge, then only the swept volume at atmosphere is drawn', () => {
    // derived: (p_g + p_atm)/p_atm = 1 and dead volume adds nothing
    const r = runCalculator('air-consumption', { inputs: { ...base, airPressure: q(0, 'bar'), deadVolume: q(10, 'cm3') } });
    expectRel(out(r, 'freeAirPerCycle'), 0.314159, PHYSICS);
  });
});
