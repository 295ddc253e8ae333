// Bead and dot geometry (calculators.md §2): cross-sections, cap volumes, mass per part and per hour.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { all, create } from 'mathjs';
import { runCalculator } from '@/shared/calculators';
import { beadArea, concaveFilletArea } from '@/shared/calculators/bead';
import { capHeightFromContactAngle, sphericalCapVolume } from '@/shared/calculators/dot';
import { CalculatorInputError } from '@/shared/calculators/types';
import { expectRel, q, out, catchError } from '../helpers/calc';

const PHYSICS = 1e-6;
const math = create(all, {});

const density = q(1.2, 'g/cm3');

describe('bead', () => {
  it('when a round 3 mm bead is 500 mm per part at 12 parts/min, then 7.068583 mm², 8.482300 g/m, 3.534292 mL, 4.241150 g, 3053.628 g/h', () => {
    // calculators.md §2 check cases, CRC Standard Mathematical Tables (circle area) [derived]
    const r = runCalculator('bead', {
      inputs: { profile: 'round', width: q(3, 'mm'), length: q(500, 'mm'), density, partsPerMinute: q(12, '1/min') },
    });
    expectRel(out(r, 'area', 'mm2'), 7.068583, PHYSICS);
    expectRel(out(r, 'massPerLength', 'g/m'), 8.4823, PHYSICS);
    expectRel(out(r, 'volume', 'mL'), 3.534292, PHYSICS);
    expectRel(out(r, 'mass', 'g'), 4.24115, PHYSICS);
    expectRel(out(r, 'massPerHour', 'g/h'), 3053.628, PHYSICS);
    expect(r.warnings).toEqual([]);
  });

  it('when the same bead is evaluated by mathjs with units, then 4.241150082346219 g per part', () => {
    // calculators.md §2 npm cross-check: mathjs evaluate (verified)
    const fromMath = math.evaluate('pi*(3 mm)^2/4 * 500 mm * 1.2 g/cm^3 to g').toNumber('g');
    const r = runCalculator('bead', { inputs: { profile: 'round', width: q(3, 'mm'), length: q(500, 'mm'), density } });
    expectRel(out(r, 'mass'), fromMath, 1e-12);
    expectRel(fromMath, 4.241150082346219, 1e-12);
  });

  it('when the parts rate is left out, then there is no hourly consumption', () => {
    // derived: consumption per hour needs parts per minute
    const r = runCalculator('bead', { inputs: { profile: 'round', width: q(3, 'mm'), length: q(500, 'mm'), density } });
    expect(r.outputs.massPerHour).toBeUndefined();
  });

  it('when a half-round bead is 4 mm wide, then 6.283185 mm² and 7.539822 g/m', () => {
    // calculators.md §2: A = π w² / 8 [derived]
    const r = runCalculator('bead', { inputs: { profile: 'half-round', width: q(4, 'mm'), length: q(1, 'm'), density } });
    expectRel(out(r, 'area'), 6.283185, PHYSICS);
    expectRel(out(r, 'massPerLength'), 7.539822, PHYSICS);
  });

  it('when a half-round bead has its own height, then it is a half-ellipse π w h / 4', () => {
    // calculators.md §2: half-ellipse A = π w h / 4 [derived]
    const r = runCalculator('bead', { inputs: { profile: 'half-round', width: q(4, 'mm'), height: q(1, 'mm'), length: q(1, 'm'), density } });
    expectRel(out(r, 'area'), Math.PI, PHYSICS);
  });

  it('when a fillet has 3 mm legs, then 4.5 mm² and 5.400 g/m', () => {
    // calculators.md §2: A = a b / 2 [derived]
    const r = runCalculator('bead', { inputs: { profile: 'fillet', width: q(3, 'mm'), length: q(1, 'm'), density } });
    expectRel(out(r, 'area'), 4.5, PHYSICS);
    expectRel(out(r, 'massPerLength'), 5.4, PHYSICS);
    const uneven = runCalculator('bead', { inputs: { profile: 'fillet', width: q(3, 'mm'), height: q(2, 'mm'), length: q(1, 'm'), density } });
    expectRel(out(uneven, 'area'), 3, PHYSICS);
  });

  it('when the area is in mm² and density in g/cm³, then their product is grams per metre', () => {
    // calculators.md §2 handy identity [derived]
    const area = beadArea('round', 2.5e-3) * 1e6;
    const r = runCalculator('bead', { inputs: { profile: 'round', width: q(2.5, 'mm'), length: q(1, 'm'), density } });
    expectRel(out(r, 'massPerLength', 'g/m'), area * 1.2, PHYSICS);
  });

  it('when a concave tooled fillet has radius r, then A = r² (1 − π/4)', () => {
    // calculators.md §2 optional shape [derived]
    expectRel(concaveFilletArea(2), 4 * (1 - Math.PI / 4), PHYSICS);
  });

  it('when the bead length changes, then mass per part is linear in it (property)', () => {
    // derived: m = ρ A L
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 10, noNaN: true }), fc.double({ min: 1, max: 5000, noNaN: true }), fc.double({ min: 0.1, max: 10, noNaN: true }), (width, length, k) => {
        const mass = (l: number) => out(runCalculator('bead', { inputs: { profile: 'round', width: q(width, 'mm'), length: q(l, 'mm'), density } }), 'mass');
        return Math.abs(mass(k * length) - k * mass(length)) <= 1e-9 * k * mass(length);
      }),
      { numRuns: 50 },
    );
  });

  it('when a width is negative, then the field is refused', () => {
    // calculators.md §2: reject negative dimensions [derived]
    const error = catchError(() => runCalculator('bead', { inputs: { profile: 'round', width: q(-3, 'mm'), length: q(500, 'mm'), density } }));
    expect(error).toBeInstanceOf(CalculatorInputError);
    expect((error as CalculatorInputError).fields).toEqual({ 'inputs.width': 'Width must be greater than 0 mm' });
  });
});

describe('dot', () => {
  it('when a dot has base radius 1.0 mm and height 0.5 mm, then 0.850848 µL and 1.021018 mg', () => {
    // calculators.md §2, CRC Standard Mathematical Tables, spherical cap [memory]
    const r = runCalculator('dot', { inputs: { baseDiameter: q(2, 'mm'), height: q(0.5, 'mm'), density } });
    expectRel(out(r, 'volume', 'uL'), 0.850848, PHYSICS);
    expectRel(out(r, 'mass', 'mg'), 1.021018, PHYSICS);
    expectRel(out(r, 'height', 'mm'), 0.5, PHYSICS);
  });

  it('when a dot has base radius 0.75 mm and a 60° contact angle, then h = 0.433013 mm and V = 0.425109 mm³', () => {
    // calculators.md §2: h = a tan(θc/2) [derived]
    const r = runCalculator('dot', { inputs: { baseDiameter: q(1.5, 'mm'), contactAngle: q(60, 'deg'), density } });
    expectRel(out(r, 'height'), 0.433013, PHYSICS);
    expectRel(out(r, 'volume', 'uL'), 0.425109, PHYSICS);
    expectRel(capHeightFromContactAngle(0.75, Math.PI / 3), 0.4330127, PHYSICS);
  });

  it('when h = a = 1, then the cap is a hemisphere of 2π/3', () => {
    // calculators.md §2 edge case: cap reduces to a hemisphere [derived]
    expectRel(sphericalCapVolume(1, 1), 2.094395, PHYSICS);
    expectRel(sphericalCapVolume(1, 1), (2 * Math.PI) / 3, 1e-12);
  });

  it('when the height is 0, then the volume is 0', () => {
    // calculators.md §2 edge case [derived]
    const r = runCalculator('dot', { inputs: { baseDiameter: q(2, 'mm'), height: q(0, 'mm'), density } });
    expect(out(r, 'volume')).toBe(0);
  });

  it('when dots per part and parts per minute are given, then mass per hour = m × dots × parts/min × 60', () => {
    // calculators.md §2: consumption per hour [derived]
    const r = runCalculator('dot', {
      inputs: { baseDiameter: q(2, 'mm'), height: q(0.5, 'mm'), density, dotsPerPart: q(4, '1'), partsPerMinute: q(30, '1/min') },
    });
    expectRel(out(r, 'massPerHour', 'g/h'), 1.021018e-3 * 4 * 30 * 60, PHYSICS);
  });

  it('when both height and contact angle are given, or neither, then both fields are flagged', () => {
    // derived: exactly one of height or contact angle fixes the cap
    const both = catchError(() => runCalculator('dot', { inputs: { baseDiameter: q(2, 'mm'), height: q(0.5, 'mm'), contactAngle: q(60, 'deg'), density } }));
    expect(Object.keys((both as CalculatorInputError).fields).sort()).toEqual(['inputs.contactAngle', 'inputs.height']);
    const neither = catchError(() => runCalculator('dot', { inputs: { baseDiameter: q(2, 'mm'), density } }));
    expect((neither as CalculatorInputError).fields['inputs.height']).toMatch(/height or the contact angle/);
  });
});
