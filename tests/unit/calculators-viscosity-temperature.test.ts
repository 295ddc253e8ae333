// Viscosity against temperature (calculators.md §5): two-point Andrade fits checked against Perry's
// water table, the kelvin-only trap, and a least-squares fit cross-checked with simple-statistics.
import { describe, expect, it } from 'vitest';
import { linearRegression } from 'simple-statistics';
import { runCalculator } from '@/shared/calculators';
import { GAS_CONSTANT, andradeFit, andradeFitLeastSquares, andradeViscosity } from '@/shared/calculators/viscosity-temperature';
import { CalculatorInputError } from '@/shared/calculators/types';
import { expectRel, expectPrinted, q, out, catchError } from '../helpers/calc';

const PHYSICS = 1e-6;
const FITTED = 1e-4;

// Perry's Chemical Engineers' Handbook, 9th ed., Table 2-135, water, saturated liquid, µPa·s [checked]
const WATER: Record<number, number> = {
  280: 1433.7,
  290: 1084.0,
  300: 853.84,
  310: 693.54,
  320: 577.02,
  330: 489.49,
  340: 421.97,
  350: 368.77,
  360: 326.1,
  370: 291.36,
};

function predict(t1: number, t2: number, t: number) {
  return runCalculator('viscosity-temperature', {
    inputs: {
      temperature1: q(t1, 'K'),
      viscosity1: q(WATER[t1] / 1000, 'mPa.s'),
      temperature2: q(t2, 'K'),
      viscosity2: q(WATER[t2] / 1000, 'mPa.s'),
      temperature: q(t, 'K'),
    },
    outputUnits: { viscosity: 'mPa.s' },
  });
}

describe("viscosity-temperature: two-point fits on water (Perry's Table 2-135 [checked]; fits derived)", () => {
  const cases = [
    { t1: 300, t2: 340, t: 320, b: 1797.265, a: 2.135845, predicted: 587.17, error: '1.76' },
    { t1: 290, t2: 310, t: 300, b: 2007.486, a: 1.068277, predicted: 860.633, error: '0.80' },
    { t1: 280, t2: 360, t: 320, b: 1865.82, a: 1.830099, predicted: 623.319, error: '8.02' },
    { t1: 300, t2: 340, t: 370, b: 1797.265, a: 2.135845, predicted: 274.88, error: '-5.66' },
  ];

  it.each(cases)('when fitted at $t1 K and $t2 K and asked for $t K, then B = $b K, A = $a µPa·s, μ = $predicted µPa·s ($error % against the table)', ({ t1, t2, t, b, a, predicted, error }) => {
    const r = predict(t1, t2, t);
    expectRel(out(r, 'andradeB', 'K'), b, PHYSICS);
    expectRel(out(r, 'viscosity', 'mPa.s') * 1000, predicted, PHYSICS);
    expectRel(andradeFit(t1, WATER[t1], t2, WATER[t2]).a, a, PHYSICS);
    expectPrinted(((out(r, 'viscosity') * 1000) / WATER[t] - 1) * 100, error);
    expectRel(out(r, 'activationEnergy', 'kJ/mol'), (b * GAS_CONSTANT) / 1000, PHYSICS);
  });

  it('when the wanted temperature is inside the fit points, then no extrapolation warning; when outside, then one', () => {
    // calculators.md §5: interpolation acceptable, extrapolation poor [derived]
    expect(predict(300, 340, 320).warnings).toEqual([]);
    expect(predict(300, 340, 370).warnings.map((w) => w.code)).toEqual(['extrapolation']);
  });

  it('when the temperatures are given in °C, then the tool still fits in kelvin and matches the kelvin answer', () => {
    // calculators.md §5: kelvin only [derived]
    const r = runCalculator('viscosity-temperature', {
      inputs: {
        temperature1: q(26.85, 'degC'),
        viscosity1: q(0.85384, 'cP'),
        temperature2: q(66.85, 'degC'),
        viscosity2: q(0.42197, 'cP'),
        temperature: q(46.85, 'degC'),
      },
      outputUnits: { viscosity: 'cP' },
    });
    expectRel(out(r, 'viscosity') * 1000, 587.17, PHYSICS);
  });

  it('when the same points are wrongly fitted in °C, then the prediction is 516.4 instead of 587.2 µPa·s', () => {
    // calculators.md §5 warning: fitting in °C gives plausible-looking nonsense [derived]
    const wrong = andradeFit(26.85, 853.84, 66.85, 421.97);
    expectPrinted(andradeViscosity(wrong, 46.85), '516.4');
    expectPrinted(andradeViscosity(andradeFit(300, 853.84, 340, 421.97), 320), '587.2');
  });

  it('when both temperatures are equal, then temperature 2 is refused', () => {
    // calculators.md §5 edge case: T1 = T2 is undefined [derived]
    const error = catchError(() =>
      runCalculator('viscosity-temperature', {
        inputs: { temperature1: q(300, 'K'), viscosity1: q(1, 'cP'), temperature2: q(26.85, 'degC'), viscosity2: q(0.5, 'cP'), temperature: q(310, 'K') },
      }),
    );
    expect(error).toBeInstanceOf(CalculatorInputError);
    expect(Object.keys((error as CalculatorInputError).fields)).toEqual(['inputs.temperature2']);
  });

  it('when viscosity rises with temperature, then B < 0 and a warning shows', () => {
    // calculators.md §5: warn if B < 0 [derived]
    const r = runCalculator('viscosity-temperature', {
      inputs: { temperature1: q(20, 'degC'), viscosity1: q(1000, 'cP'), temperature2: q(40, 'degC'), viscosity2: q(1500, 'cP'), temperature: q(30, 'degC') },
    });
    expect(out(r, 'andradeB')).toBeLessThan(0);
    expect(r.warnings.map((w) => w.code)).toEqual(['viscosity-rises']);
  });

  it('when a temperature below absolute zero is entered, then it is refused', () => {
    // calculators.md §1: reject any temperature below 0 K [derived]
    const error = catchError(() =>
      runCalculator('viscosity-temperature', {
        inputs: { temperature1: q(-300, 'degC'), viscosity1: q(1, 'cP'), temperature2: q(40, 'degC'), viscosity2: q(0.5, 'cP'), temperature: q(30, 'degC') },
      }),
    );
    expect((error as CalculatorInputError).fields).toEqual({ 'inputs.temperature1': 'Temperature 1 is below absolute zero (-273.15 °C)' });
  });
});

describe('viscosity-temperature: least-squares fit for three or more points', () => {
  it('when five table points are fitted, then B and A match simple-statistics linearRegression on (1/T, ln μ)', () => {
    // calculators.md §5 npm cross-check: simple-statistics linearRegression (verified)
    const temps = [300, 310, 320, 330, 340];
    const fit = andradeFitLeastSquares(temps.map((t) => ({ t, mu: WATER[t] })));
    const line = linearRegression(temps.map((t) => [1 / t, Math.log(WATER[t])]));
    expectRel(fit.b, line.m, FITTED);
    expectRel(fit.a, Math.exp(line.b), FITTED);
  });

  it('when only two points are given, then the least-squares fit equals the two-point fit', () => {
    // derived: a line through two points is their least-squares line
    const two = andradeFit(300, WATER[300], 340, WATER[340]);
    const ls = andradeFitLeastSquares([
      { t: 300, mu: WATER[300] },
      { t: 340, mu: WATER[340] },
    ]);
    expectRel(ls.b, two.b, 1e-9);
    expectRel(ls.a, two.a, 1e-9);
  });
});
