// Needle flow (calculators.md §3 Newtonian, §4 power law): published and worked check cases,
// mathjs cross-checks with units, scaling properties and the laminar-flow warnings.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { all, create } from 'mathjs';
import { runCalculator, type CalculatorResponse } from '@/shared/calculators';
import { hagenPoiseuilleFlow, hagenPoiseuillePressureDrop, seriesPressureDrop, taperedPressureDrop } from '@/shared/calculators/nozzle-flow';
import { metznerReedReynolds, powerLawFlow, powerLawPressureDrop, powerLawWallShearRate } from '@/shared/calculators/nozzle-flow-power-law';
import { CalculatorInputError } from '@/shared/calculators/types';
import { expectRel, q, out, catchError } from '../helpers/calc';

const PHYSICS = 1e-6;
const math = create(all, {});

/** For values the source prints rounded: within half a unit of the last printed digit. */
function expectPrinted(actual: number, printed: string) {
  const decimals = printed.includes('.') ? printed.split('.')[1].replace(/e.*$/i, '').length : 0;
  const exponent = /e(-?\d+)/i.exec(printed);
  const step = 10 ** (-decimals + (exponent ? Number(exponent[1]) : 0));
  expect(Math.abs(actual - Number(printed))).toBeLessThanOrEqual(step / 2 + 1e-12 * Math.abs(actual));
}
const codes = (response: CalculatorResponse) => response.warnings.map((w) => w.code);

const needleB = { innerDiameter: q(0.41, 'mm'), length: q(12.7, 'mm') };

describe('nozzle-flow: OpenStax University Physics Vol. 1 §14.7 air-conditioning example [checked]', () => {
  const duct = { innerDiameter: q(0.18, 'm'), length: q(20, 'm'), viscosity: q(0.0181, 'mPa.s'), pressureDrop: q(0.054, 'Pa') };

  it('when ΔP = 0.054 Pa drives air through an 18 cm, 20 m duct, then Q = 3.843396e-3 m³/s (published 3.84e-3 with π = 3.14)', () => {
    const r = runCalculator('nozzle-flow', { inputs: duct, outputUnits: { flowRate: 'm3/s' } });
    expectRel(out(r, 'flowRate', 'm3/s'), 3.843396e-3, PHYSICS);
    expectPrinted(out(r, 'flowRate'), '3.84e-3');
  });

  it('when the 216 m³ room is replaced at that flow, then it takes 56 200 s (15.611 h; published 5.63e4 s with π = 3.14)', () => {
    const flow = out(runCalculator('nozzle-flow', { inputs: duct, outputUnits: { flowRate: 'm3/s' } }), 'flowRate');
    expectPrinted(216 / flow, '56200');
    expectPrinted(216 / flow / 3600, '15.611');
  });

  it('when the duct diameter is halved to 9 cm, then Q = 2.402122e-4 m³/s, 0.0625 of before', () => {
    const r = runCalculator('nozzle-flow', { inputs: { ...duct, innerDiameter: q(0.09, 'm') }, outputUnits: { flowRate: 'm3/s' } });
    expectRel(out(r, 'flowRate'), 2.402122e-4, PHYSICS);
    expectRel(out(r, 'flowRate') / 3.843396e-3, 0.0625, PHYSICS);
    expectPrinted(out(r, 'flowRate'), '2.40e-4');
  });

  it('when air density 1.204 kg/m³ is given, then Re = 1808 and an amber near-transition warning shows', () => {
    const r = runCalculator('nozzle-flow', { inputs: { ...duct, density: q(1.204, 'kg/m3') } });
    expectPrinted(out(r, 'reynolds', '1'), '1808');
    expect(codes(r)).toContain('transitional');
    expect(codes(r)).not.toContain('turbulent');
  });

  it('when mathjs evaluates the same example with units, then it agrees', () => {
    // calculators.md §3 npm cross-check style: mathjs evaluate with units
    const fromMath = math.evaluate('pi*(18 cm/2)^4*(0.054 Pa)/(8*(0.0181 mPa s)*(20 m)) to m^3/s').toNumber('m^3/s');
    expectRel(out(runCalculator('nozzle-flow', { inputs: duct, outputUnits: { flowRate: 'm3/s' } }), 'flowRate'), fromMath, 1e-12);
  });
});

describe('nozzle-flow: adhesive case B (Bird, Stewart & Lightfoot §2.3 [memory]; values derived)', () => {
  const caseB = { ...needleB, viscosity: q(1000, 'cP'), pressureDrop: q(2, 'bar'), density: q(1.1, 'g/cm3') };

  it('when the API example is posted, then flowRate 10.92199 µL/s and reynolds 0.03731 with no warnings', () => {
    // calculators.md "Request and response" example [derived]
    const r = runCalculator('nozzle-flow', { inputs: caseB, outputUnits: { flowRate: 'uL/s' } });
    expectPrinted(out(r, 'flowRate', 'uL/s'), '10.92199');
    expectPrinted(out(r, 'reynolds', '1'), '0.03731');
    expect(r.warnings).toEqual([]);
  });

  it('when r = 0.205 mm, L = 12.7 mm, μ = 1 Pa·s, ΔP = 0.2 MPa, then Q = 1.092199e-8 m³/s = 0.655319 mL/min', () => {
    // calculators.md §3 case B [derived]
    const r = runCalculator('nozzle-flow', { inputs: caseB, outputUnits: { flowRate: 'm3/s' } });
    expectRel(out(r, 'flowRate'), 1.092199e-8, PHYSICS);
    const perMinute = runCalculator('nozzle-flow', { inputs: caseB, outputUnits: { flowRate: 'mL/min' } });
    expectRel(out(perMinute, 'flowRate', 'mL/min'), 0.655319, PHYSICS);
  });

  it('when case B is worked through, then v̄ = 0.082726 m/s, γ̇w = 1614.173 1/s and τw = 1614.173 Pa', () => {
    // calculators.md §3 case B [derived]
    const r = runCalculator('nozzle-flow', { inputs: caseB, outputUnits: { meanVelocity: 'm/s' } });
    expectPrinted(out(r, 'meanVelocity', 'm/s'), '0.082726');
    expectRel(out(r, 'wallShearRate', '1/s'), 1614.173, PHYSICS);
    expectRel(out(r, 'wallShearStress', 'Pa'), 1614.173, PHYSICS);
    // τw = μ γ̇w for a Newtonian fluid [derived]
    expectRel(out(r, 'wallShearStress'), 1.0 * out(r, 'wallShearRate'), 1e-12);
  });

  it('when a target of 5 µL/s is asked for, then ΔP = 91 558.44 Pa', () => {
    // calculators.md §3 case B inverse [derived]
    const r = runCalculator('nozzle-flow', {
      inputs: { ...needleB, viscosity: q(1, 'Pa.s'), flowRate: q(5, 'uL/s'), density: q(1100, 'kg/m3') },
    });
    expectRel(out(r, 'pressureDrop', 'Pa'), 91558.44, PHYSICS);
    expectRel(out(r, 'flowRate', 'mL/s'), 0.005, 1e-12);
  });

  it('when mathjs evaluates case B with units, then 10.921985726378628 µL/s', () => {
    // calculators.md §3 npm cross-check: mathjs (verified)
    const fromMath = math.evaluate('pi*(0.205 mm)^4*(2 bar)/(8*(1 Pa s)*(12.7 mm)) to uL/s').toNumber('uL/s');
    expectRel(fromMath, 10.921985726378628, 1e-12);
    expectRel(out(runCalculator('nozzle-flow', { inputs: caseB, outputUnits: { flowRate: 'uL/s' } }), 'flowRate'), fromMath, 1e-12);
  });

  it('when no density is given, then the Reynolds number is left out and a warning says so', () => {
    // derived: Re needs ρ
    const { density: _omit, ...noDensity } = caseB;
    const r = runCalculator('nozzle-flow', { inputs: noDensity });
    expect(r.outputs.reynolds).toBeUndefined();
    expect(codes(r)).toEqual(['no-density']);
  });
});

describe('nozzle-flow: tapered tip and series sections (calculators.md §3 case C [derived])', () => {
  it('when a tip tapers 0.4 → 0.1 mm over 12.7 mm at 5 µL/s and 1 Pa·s, then ΔP = 176 860.9 Pa', () => {
    expectRel(taperedPressureDrop(0.4e-3, 0.1e-3, 12.7e-3, 1, 5e-9), 176860.9, PHYSICS);
  });

  it('when the taper has equal ends of 0.205 mm, then it reduces to case B: 91 558.44 Pa', () => {
    expectRel(taperedPressureDrop(0.205e-3, 0.205e-3, 12.7e-3, 1, 5e-9), 91558.44, PHYSICS);
    expectRel(hagenPoiseuillePressureDrop(0.205e-3, 12.7e-3, 1, 5e-9), 91558.44, PHYSICS);
  });

  it('when a needle is split into two sections in series, then the pressure drops add', () => {
    const whole = hagenPoiseuillePressureDrop(0.205e-3, 12.7e-3, 1, 5e-9);
    const split = seriesPressureDrop(
      [
        { radius: 0.205e-3, length: 5e-3 },
        { radius: 0.205e-3, length: 7.7e-3 },
      ],
      1,
      5e-9,
    );
    expectRel(split, whole, 1e-12);
  });
});

describe('nozzle-flow: water edge case (calculators.md §3 [derived])', () => {
  it('when water (1.0016 mPa·s, 998.2 kg/m³) runs through the needle at 2 bar, then v̄ = 82.59 m/s, Re = 33 749 and the result is flagged not valid', () => {
    const r = runCalculator('nozzle-flow', {
      inputs: { ...needleB, viscosity: q(1.0016, 'mPa.s'), pressureDrop: q(2, 'bar'), density: q(998.2, 'kg/m3') },
      outputUnits: { meanVelocity: 'm/s' },
    });
    expectPrinted(out(r, 'meanVelocity'), '82.59');
    expectPrinted(out(r, 'reynolds'), '33749');
    expect(codes(r)).toEqual(expect.arrayContaining(['turbulent', 'entrance-length']));
    const turbulent = r.warnings.find((w) => w.code === 'turbulent');
    expect(turbulent?.message).toMatch(/not valid/);
    // Entrance length about 2 025 D against L/D = 31.
    const entrance = r.warnings.find((w) => w.code === 'entrance-length');
    expect(entrance?.message).toMatch(/2,025 diameters/);
    expect(entrance?.message).toMatch(/30\.98 diameters/);
  });
});

describe('nozzle-flow: Hagen–Poiseuille scaling (properties, derived)', () => {
  const positive = (min: number, max: number) => fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

  it('when the radius doubles, then the flow is 16 times larger', () => {
    fc.assert(
      fc.property(positive(1e-5, 1e-2), positive(1e-3, 1), positive(1e-4, 1e3), positive(1, 1e7), (r, l, mu, dp) => {
        const ratio = hagenPoiseuilleFlow(2 * r, l, mu, dp) / hagenPoiseuilleFlow(r, l, mu, dp);
        return Math.abs(ratio - 16) <= 16 * 1e-12;
      }),
    );
  });

  it('when the pressure drop doubles, then the flow doubles', () => {
    fc.assert(
      fc.property(positive(1e-5, 1e-2), positive(1e-3, 1), positive(1e-4, 1e3), positive(1, 1e7), (r, l, mu, dp) => {
        const ratio = hagenPoiseuilleFlow(r, l, mu, 2 * dp) / hagenPoiseuilleFlow(r, l, mu, dp);
        return Math.abs(ratio - 2) <= 2 * 1e-12;
      }),
    );
  });

  it('when flow is computed from pressure and back, then the same pressure returns', () => {
    fc.assert(
      fc.property(positive(1e-5, 1e-2), positive(1e-3, 1), positive(1e-4, 1e3), positive(1, 1e7), (r, l, mu, dp) => {
        const back = hagenPoiseuillePressureDrop(r, l, mu, hagenPoiseuilleFlow(r, l, mu, dp));
        return Math.abs(back - dp) <= 1e-12 * dp;
      }),
    );
  });
});

describe('nozzle-flow-power-law: main case (Bird, Stewart & Lightfoot §8.3 [memory]; Chhabra & Richardson Ch. 3 [memory]; values derived)', () => {
  const main = {
    innerDiameter: q(0.5, 'mm'),
    length: q(12.7, 'mm'),
    consistency: q(50, 'Pa.s^n'),
    flowIndex: q(0.5, '1'),
    pressureDrop: q(0.5, 'MPa'),
    density: q(1100, 'kg/m3'),
  };

  it('when R = 0.25 mm, K = 50 Pa·s^0.5, n = 0.5, ΔP = 0.5 MPa, then Q = 9.510700e-8 m³/s = 95.10700 µL/s, V̄ = 0.484376 m/s', () => {
    const r = runCalculator('nozzle-flow-power-law', { inputs: main, outputUnits: { flowRate: 'm3/s', meanVelocity: 'm/s' } });
    expectRel(out(r, 'flowRate', 'm3/s'), 9.5107e-8, PHYSICS);
    expectRel(out(r, 'meanVelocity', 'm/s'), 0.484376, PHYSICS);
    const inMicrolitres = runCalculator('nozzle-flow-power-law', { inputs: main, outputUnits: { flowRate: 'uL/s' } });
    expectRel(out(inMicrolitres, 'flowRate', 'uL/s'), 95.107, PHYSICS);
  });

  it('when the wall is examined, then 4Q/πR³ = 7750.016 1/s, γ̇w = 9687.519 1/s, τw = 4921.260 Pa, ηw = 0.5080 Pa·s', () => {
    const r = runCalculator('nozzle-flow-power-law', { inputs: main });
    const flow = out(r, 'flowRate') * 1e-6;
    expectRel((4 * flow) / (Math.PI * 0.25e-3 ** 3), 7750.016, PHYSICS);
    expectRel(out(r, 'wallShearRate', '1/s'), 9687.519, PHYSICS);
    expectRel(out(r, 'wallShearStress', 'Pa'), 4921.26, PHYSICS);
    expectPrinted(out(r, 'wallViscosity', 'Pa.s'), '0.5080');
    // ηw = K γ̇w^(n−1) [derived]
    expectRel(out(r, 'wallViscosity'), 50 * out(r, 'wallShearRate') ** -0.5, 1e-12);
  });

  it('when the Metzner–Reed Reynolds number is taken, then Re_MR = 0.41954 and no warnings', () => {
    // Metzner & Reed, AIChE J. 1 (1955) 434 [memory]; value derived
    const r = runCalculator('nozzle-flow-power-law', { inputs: main });
    expectPrinted(out(r, 'reynolds', '1'), '0.41954');
    expect(r.warnings).toEqual([]);
  });

  it('when the velocity profile is integrated numerically, then it gives the same Q', () => {
    // calculators.md §4: numerical integration of the velocity profile [derived]
    const R = 0.25e-3;
    const profile = (n: number, K: number, r: number) => (n / (n + 1)) * (0.5e6 / (2 * K * 12.7e-3)) ** (1 / n) * (R ** ((n + 1) / n) - r ** ((n + 1) / n));
    for (const [n, K] of [
      [0.5, 50],
      [0.3, 200],
      [1, 1],
    ]) {
      const steps = 2000;
      const h = R / steps;
      let sum = 0;
      for (let i = 0; i <= steps; i++) {
        const r = i * h;
        const weight = i === 0 || i === steps ? 1 : i % 2 === 1 ? 4 : 2;
        sum += weight * 2 * Math.PI * r * profile(n, K, r);
      }
      expectRel((sum * h) / 3, powerLawFlow(R, 12.7e-3, K, n, 0.5e6), PHYSICS);
    }
  });

  it('when the flow is fed back as a target, then the inverse returns exactly 0.5 MPa', () => {
    const { pressureDrop: _p, ...rest } = main;
    const r = runCalculator('nozzle-flow-power-law', { inputs: { ...rest, flowRate: q(9.5107e-8, 'm3/s') }, outputUnits: { pressureDrop: 'MPa' } });
    expectRel(out(r, 'pressureDrop', 'MPa'), 0.5, PHYSICS);
    expectRel(powerLawPressureDrop(0.25e-3, 12.7e-3, 50, 0.5, powerLawFlow(0.25e-3, 12.7e-3, 50, 0.5, 0.5e6)), 0.5e6, 1e-12);
  });

  it('when the pressure drop is doubled at n = 0.5, then the flow is 4.000 times larger', () => {
    const single = out(runCalculator('nozzle-flow-power-law', { inputs: main }), 'flowRate');
    const double = out(runCalculator('nozzle-flow-power-law', { inputs: { ...main, pressureDrop: q(1, 'MPa') } }), 'flowRate');
    expectRel(double / single, 4, PHYSICS);
  });

  it('when mathjs evaluates the flow with units (K in Pa·s^0.5), then it agrees', () => {
    // calculators.md §4 npm cross-check: mathjs evaluate with units
    const fromMath = math.evaluate('pi*0.5/2.5 * ((0.5 MPa)/(2*(50 Pa s^0.5)*(12.7 mm)))^2 * (0.25 mm)^5 to uL/s').toNumber('uL/s');
    expectRel(out(runCalculator('nozzle-flow-power-law', { inputs: main, outputUnits: { flowRate: 'uL/s' } }), 'flowRate'), fromMath, 1e-9);
  });
});

describe('nozzle-flow-power-law: reduction, edge cases and identities', () => {
  it('when n = 1 and K = 1 Pa·s on case B, then Q = 1.092199e-8 m³/s, identical to Hagen–Poiseuille', () => {
    // calculators.md §4 reduction check [derived]
    const r = runCalculator('nozzle-flow-power-law', {
      inputs: { ...needleB, consistency: q(1, 'Pa.s^n'), flowIndex: q(1, '1'), pressureDrop: q(0.2, 'MPa'), density: q(1100, 'kg/m3') },
      outputUnits: { flowRate: 'm3/s' },
    });
    expectRel(out(r, 'flowRate'), 1.092199e-8, PHYSICS);
    const newtonian = runCalculator('nozzle-flow', {
      inputs: { ...needleB, viscosity: q(1, 'Pa.s'), pressureDrop: q(0.2, 'MPa'), density: q(1100, 'kg/m3') },
      outputUnits: { flowRate: 'm3/s' },
    });
    for (const name of ['flowRate', 'meanVelocity', 'reynolds', 'wallShearRate', 'wallShearStress']) {
      expectRel(out(r, name), out(newtonian, name), 1e-12);
    }
  });

  it('when n = 1 for any needle, then the power-law flow equals Hagen–Poiseuille with μ = K (property)', () => {
    // calculators.md §4 reduction [derived]
    fc.assert(
      fc.property(
        fc.double({ min: 1e-5, max: 1e-2, noNaN: true }),
        fc.double({ min: 1e-3, max: 1, noNaN: true }),
        fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
        fc.double({ min: 1, max: 1e7, noNaN: true }),
        (r, l, k, dp) => Math.abs(powerLawFlow(r, l, k, 1, dp) / hagenPoiseuilleFlow(r, l, k, dp) - 1) <= 1e-12,
      ),
    );
  });

  it('when the pressure drop is scaled by s, then the flow scales by s^(1/n) (property)', () => {
    // calculators.md §4: Q ∝ ΔP^(1/n) [derived]
    fc.assert(
      fc.property(fc.double({ min: 0.2, max: 1.5, noNaN: true }), fc.double({ min: 0.5, max: 4, noNaN: true }), fc.double({ min: 1e3, max: 1e6, noNaN: true }), (n, s, dp) => {
        const ratio = powerLawFlow(0.25e-3, 12.7e-3, 50, n, s * dp) / powerLawFlow(0.25e-3, 12.7e-3, 50, n, dp);
        return Math.abs(ratio / s ** (1 / n) - 1) <= 1e-9;
      }),
    );
  });

  it('when the Fanning friction factor is formed, then f · Re_MR = 16 for any n (property)', () => {
    // calculators.md §4: f_Fanning · Re_MR = 16, verified numerically [derived]
    fc.assert(
      fc.property(fc.double({ min: 0.15, max: 1.5, noNaN: true }), fc.double({ min: 1e4, max: 1e6, noNaN: true }), (n, dp) => {
        const radius = 0.25e-3;
        const length = 12.7e-3;
        const density = 1100;
        const flow = powerLawFlow(radius, length, 50, n, dp);
        const velocity = flow / (Math.PI * radius * radius);
        const tau = (dp * radius) / (2 * length);
        const fanning = tau / (0.5 * density * velocity * velocity);
        return Math.abs(fanning * metznerReedReynolds(density, velocity, 2 * radius, 50, n) - 16) <= 16e-9;
      }),
    );
  });

  it('when n = 1, then the Rabinowitsch correction factor is 1', () => {
    // calculators.md §4: (3n+1)/(4n) becomes 1 [derived]
    expectRel(powerLawWallShearRate(0.205e-3, 1, 1e-8), (4 * 1e-8) / (Math.PI * 0.205e-3 ** 3), 1e-12);
  });

  it('when n = 0.3 and K = 200, then Q = 3.358602e-7 m³/s with a strongly shear-thinning warning', () => {
    // calculators.md §4 edge case [derived]
    const r = runCalculator('nozzle-flow-power-law', {
      inputs: {
        innerDiameter: q(0.5, 'mm'),
        length: q(12.7, 'mm'),
        consistency: q(200, 'Pa.s^n'),
        flowIndex: q(0.3, '1'),
        pressureDrop: q(0.5, 'MPa'),
        density: q(1100, 'kg/m3'),
      },
      outputUnits: { flowRate: 'm3/s' },
    });
    expectRel(out(r, 'flowRate'), 3.358602e-7, PHYSICS);
    expect(codes(r)).toContain('fit-range');
    expect(codes(r)).not.toContain('power-law-index');
  });

  it('when n is outside 0.1 to 1.5, then the power-law-index warning shows', () => {
    // calculators.md "Warnings" list: n outside 0.1 to 1.5 [common practice]
    const base = { innerDiameter: q(0.5, 'mm'), length: q(12.7, 'mm'), consistency: q(50, 'Pa.s^n'), pressureDrop: q(0.01, 'MPa') };
    expect(codes(runCalculator('nozzle-flow-power-law', { inputs: { ...base, flowIndex: q(1.6, '1') } }))).toContain('power-law-index');
    expect(codes(runCalculator('nozzle-flow-power-law', { inputs: { ...base, flowIndex: q(0.08, '1') } }))).toContain('power-law-index');
  });

  it('when n ≤ 0, then the flow index is refused', () => {
    // calculators.md §4: reject n ≤ 0 [derived]
    for (const n of [0, -0.5]) {
      const error = catchError(() =>
        runCalculator('nozzle-flow-power-law', {
          inputs: { innerDiameter: q(0.5, 'mm'), length: q(12.7, 'mm'), consistency: q(50, 'Pa.s^n'), flowIndex: q(n, '1'), pressureDrop: q(0.5, 'MPa') },
        }),
      );
      expect(error).toBeInstanceOf(CalculatorInputError);
      expect((error as CalculatorInputError).fields).toEqual({ 'inputs.flowIndex': 'Flow index n must be greater than 0' });
    }
  });

  it('when the flow is high enough, then the Metzner–Reed Reynolds number triggers the turbulent warning', () => {
    // calculators.md §4: laminar for Re_MR below about 2 100 [memory]
    const r = runCalculator('nozzle-flow-power-law', {
      inputs: { innerDiameter: q(2, 'mm'), length: q(50, 'mm'), consistency: q(0.01, 'Pa.s^n'), flowIndex: q(0.8, '1'), pressureDrop: q(5, 'bar'), density: q(1000, 'kg/m3') },
    });
    expect(out(r, 'reynolds')).toBeGreaterThan(2100);
    expect(codes(r)).toContain('turbulent');
  });
});
