// Needle-lift flow area (calculators.md §11): frustum curtain area, small-lift approximation and the
// crossover lift, for a conical needle on a sharp seat.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { all, create } from 'mathjs';
import { runCalculator } from '@/shared/calculators';
import { crossoverLift, curtainArea, curtainAreaApprox } from '@/shared/calculators/needle-lift';
import { expectRel, expectPrinted, q, out } from '../helpers/calc';

const PHYSICS = 1e-6;
const math = create(all, {});

const lift = (included: number, h: number) => runCalculator('needle-lift', { inputs: { seatDiameter: q(1.5, 'mm'), coneIncludedAngle: q(included, 'deg'), lift: q(h, 'mm') } });

// Frustum area [derived], same construction as Heywood, Internal Combustion Engine Fundamentals §6.3 [memory].
describe('needle-lift: crossover table for d = 1.5 mm (calculators.md §11 [derived])', () => {
  it('when the seat is 1.5 mm, then the orifice area is 1.767146 mm²', () => {
    expectRel(out(lift(90, 0.1), 'orificeArea', 'mm2'), 1.767146, PHYSICS);
  });

  const rows = [
    { included: 90, approx: 0.53033, exact: 0.688206, areaAtApprox: 1.454756 },
    { included: 60, approx: 0.75, exact: 1.098076, areaAtApprox: 1.384548 },
    { included: 30, approx: 1.448889, exact: 2.446224, areaAtApprox: 1.340413 },
    { included: 180, approx: 0.375, exact: 0.375, areaAtApprox: 1.767146 },
  ];

  it.each(rows)('when the cone is $included° included, then h* ≈ $approx mm, exact $exact mm, and the area at the approximate h* is $areaAtApprox mm²', ({ included, approx, exact, areaAtApprox }) => {
    const r = lift(included, approx);
    expectRel(out(r, 'crossoverLiftApprox', 'mm'), approx, PHYSICS);
    expectRel(out(r, 'crossoverLift', 'mm'), exact, PHYSICS);
    expectRel(out(r, 'curtainArea', 'mm2'), areaAtApprox, PHYSICS);
  });

  it('when the cone is 90° and lifted to the approximate h*, then the exact area falls 17.7 % short of the orifice', () => {
    const r = lift(90, 0.53033);
    expectPrinted((out(r, 'areaRatio', '1') - 1) * 100, '-17.7');
  });

  it('when lifted to the exact crossover, then the curtain area equals the orifice area (property over angles)', () => {
    // derived: h* solves A_c = A_o
    fc.assert(
      fc.property(fc.double({ min: 5, max: 180, noNaN: true }), (included) => {
        const theta = (included * Math.PI) / 360;
        const h = crossoverLift(1.5, theta);
        return Math.abs(curtainArea(1.5, theta, h) / ((Math.PI * 1.5 * 1.5) / 4) - 1) < 1e-9;
      }),
    );
  });

  it('when mathjs computes the exact crossover at 45° with units, then it agrees', () => {
    // calculators.md §11 npm cross-check: mathjs trigonometry with units
    const fromMath = math.evaluate('(1.5 mm)*(1 - sqrt(1 - cos(45 deg)))/(2*sin(45 deg)*cos(45 deg)) to mm').toNumber('mm');
    expectRel(out(lift(90, 0.1), 'crossoverLift'), fromMath, 1e-12);
  });
});

describe('needle-lift: small lifts at θ = 45° (calculators.md §11 [derived])', () => {
  it('when h = 0.05 mm, then approximate 0.166608 mm², exact 0.163831 mm² (ratio 0.983333)', () => {
    const r = lift(90, 0.05);
    expectPrinted(out(r, 'curtainAreaApprox', 'mm2'), '0.166608');
    expectPrinted(out(r, 'curtainArea', 'mm2'), '0.163831');
    expectRel(out(r, 'curtainArea') / out(r, 'curtainAreaApprox'), 0.983333, PHYSICS);
    expect(r.warnings).toEqual([]);
  });

  it('when h = 0.2 mm, then approximate 0.666432 mm², exact 0.622004 mm² (ratio 0.933333)', () => {
    const r = lift(90, 0.2);
    expectPrinted(out(r, 'curtainAreaApprox'), '0.666432');
    expectPrinted(out(r, 'curtainArea'), '0.622004');
    expectRel(out(r, 'curtainArea') / out(r, 'curtainAreaApprox'), 0.933333, PHYSICS);
  });

  it('when any lift is taken, then exact / approximate = 1 − h sinθ cosθ / d (property)', () => {
    // calculators.md §11 [derived]
    fc.assert(
      fc.property(fc.double({ min: 0.001, max: 1, noNaN: true }), fc.double({ min: 0.1, max: 1.5, noNaN: true }), (h, theta) => {
        const ratio = curtainArea(1.5, theta, h) / curtainAreaApprox(1.5, theta, h);
        return Math.abs(ratio - (1 - (h * Math.sin(theta) * Math.cos(theta)) / 1.5)) < 1e-12;
      }),
    );
  });

  it('when h = 0, then both areas are 0', () => {
    // calculators.md §11 edge case [derived]
    const r = lift(90, 0);
    expect(out(r, 'curtainArea')).toBe(0);
    expect(out(r, 'curtainAreaApprox')).toBe(0);
  });

  it('when h reaches 1.5 mm at θ = 45°, then the lift is outside the formula; just below it, not', () => {
    // calculators.md §11 edge case: h ≥ d/(2 sinθ cosθ) [derived]
    expect(lift(90, 1.5).warnings.map((w) => w.code)).toEqual(['outside-geometry']);
    expect(lift(90, 1.6).warnings.map((w) => w.code)).toEqual(['outside-geometry']);
    expect(lift(90, 1.49).warnings).toEqual([]);
  });

  it('when the needle is a flat poppet (180°), then no lift is outside the formula', () => {
    // derived: cos 90° = 0, so the limit is infinite
    expect(lift(180, 10).warnings).toEqual([]);
  });
});
