// Solenoid coil checks (calculators.md §7): current and power, copper temperature correction,
// winding temperature by the resistance method and the open/short verdicts.
import { describe, expect, it } from 'vitest';
import { all, create } from 'mathjs';
import { runCalculator } from '@/shared/calculators';
import { COPPER_ALPHA_20, resistanceAt } from '@/shared/calculators/coil-check';
import { hotTemperatureCelsius } from '@/shared/calculators/coil-temperature';
import { CalculatorInputError } from '@/shared/calculators/types';
import { expectRel, expectPrinted, q, out, catchError } from '../helpers/calc';

const PHYSICS = 1e-6;
const math = create(all, {});

const coil = { supplyVoltage: q(24, 'V'), nominalResistance: q(28.8, 'ohm') };
const check = (measured: number, at: number, extra: Record<string, { value: number; unit: string }> = {}) =>
  runCalculator('coil-check', { inputs: { ...coil, measuredResistance: q(measured, 'ohm'), measuredAt: q(at, 'degC'), ...extra } });

describe('coil-check (IEC 60028 copper α20 = 0.00393/K, via a secondary summary [checked])', () => {
  it('when a 28.8 Ω coil runs on 24 V at 20 °C, then I = 0.833333 A and P = 20.000 W', () => {
    const r = check(28.8, 20);
    expectRel(out(r, 'expectedCurrent', 'A'), 0.833333, PHYSICS);
    expectRel(out(r, 'expectedPower', 'W'), 20, PHYSICS);
    expect(r.outputs.verdict).toBe('ok');
    expectRel(out(r, 'deviation', '%'), 0, 1e-12);
  });

  it('when mathjs evaluates (24 V)/(28.8 Ω) and (24 V)²/(28.8 Ω), then 0.8333 A and 20 W', () => {
    // calculators.md §7 npm cross-check: mathjs (verified)
    const r = check(28.8, 20);
    expectRel(out(r, 'expectedCurrent'), math.evaluate('(24 V)/(28.8 ohm) to A').toNumber('A'), 1e-12);
    expectRel(out(r, 'expectedPower'), math.evaluate('(24 V)^2/(28.8 ohm) to W').toNumber('W'), 1e-12);
  });

  it('when the coil runs at 80 °C, then R = 35.59104 Ω, I = 0.674327 A and P = 16.18385 W', () => {
    const r = check(28.8, 20, { operatingTemperature: q(80, 'degC') });
    expectRel(out(r, 'hotResistance', 'ohm'), 35.59104, PHYSICS);
    expectRel(out(r, 'hotCurrent', 'A'), 0.674327, PHYSICS);
    expectRel(out(r, 'hotPower', 'W'), 16.18385, PHYSICS);
  });

  it('when 25.0 Ω is measured at 35 °C, then R20 = 23.60829 Ω (−18.03 %) and the coil is flagged low (short)', () => {
    // Short flag: R20 below nominal by more than the −10 % default [common practice]
    const r = check(25, 35);
    expectRel(out(r, 'resistanceAt20', 'ohm'), 23.60829, PHYSICS);
    expectPrinted(out(r, 'deviation', '%'), '-18.03');
    expect(r.outputs.verdict).toBe('low');
  });

  it('when 20.0 Ω is measured at 20 °C, then −30.56 %, I = 1.2 A, P = 28.8 W and the coil is flagged', () => {
    // calculators.md §7 edge case [derived]; flag threshold [common practice]
    const r = check(20, 20);
    expectPrinted(out(r, 'deviation'), '-30.56');
    expectRel(out(r, 'hotCurrent'), 1.2, PHYSICS);
    expectRel(out(r, 'hotPower'), 28.8, PHYSICS);
    expect(r.outputs.verdict).toBe('low');
  });

  it('when 1 GΩ is measured, then I = 2.4e-8 A and the coil is open', () => {
    // Open coil: R above about 10 × nominal [common practice]
    const r = check(1e9, 20);
    expectRel(out(r, 'hotCurrent'), 2.4e-8, PHYSICS);
    expect(r.outputs.verdict).toBe('open');
  });

  it('when the reading is above nominal by more than the tolerance, then high; within it, ok', () => {
    // derived from the verdict rules
    expect(check(33, 20).outputs.verdict).toBe('high');
    expect(check(31, 20).outputs.verdict).toBe('ok');
    expect(check(31, 20, { tolerance: q(5, '%') }).outputs.verdict).toBe('high');
    expect(check(288, 20).outputs.verdict).toBe('high');
    expect(check(289, 20).outputs.verdict).toBe('open');
  });

  it('when any coil is checked, then the steady-DC reminder is always there', () => {
    // calculators.md §7: I = V/R holds for DC steady state only [derived]
    for (const r of [check(28.8, 20), check(1e9, 20), check(20, 20)]) {
      expect(r.warnings.map((w) => w.code)).toEqual(['ac-or-pwm']);
    }
  });

  it('when the α form and the 234.5 form are compared, then 1/(234.5 + 20) = 0.003929 per K', () => {
    // calculators.md §7: 234.5 consistent with α20 [derived]
    expectPrinted(1 / (234.5 + 20), '0.003929');
    expectRel(resistanceAt(28.8, 353.15), 28.8 * (1 + COPPER_ALPHA_20 * 60), 1e-12);
  });

  it("when IEC 60228's simplified correction table is compared, then it fits 250/(230 + t), about 0.004 per K, not this α", () => {
    // IEC 60228 table values from a secondary copy; the 250/(230 + t) fit is an inference [derived]
    expectPrinted(250 / (230 + 5), '1.064');
    expectPrinted(250 / (230 + 40), '0.926');
    expectPrinted(250 / (230 + 80), '0.806');
    // With α20 = 0.00393 the factor to 20 °C at 80 °C is 0.8092 instead.
    expectPrinted(1 / resistanceAt(1, 353.15), '0.8092');
  });

  it('when the measurement temperature is below absolute zero, then it is refused', () => {
    // calculators.md §1: reject temperatures below 0 K
    const error = catchError(() => check(28.8, -300));
    expect(error).toBeInstanceOf(CalculatorInputError);
    expect((error as CalculatorInputError).fields['inputs.measuredAt']).toMatch(/below absolute zero/);
  });
});

describe('coil-temperature (safety-standard temperature-test clause, k = 234.5 for copper [checked])', () => {
  it('when 28.8 Ω at 20 °C becomes 34.5 Ω, then the winding is at 70.36979 °C, a rise of 50.36979 K', () => {
    const r = runCalculator('coil-temperature', { inputs: { coldResistance: q(28.8, 'ohm'), coldTemperature: q(20, 'degC'), hotResistance: q(34.5, 'ohm') } });
    expectRel(out(r, 'hotTemperature', 'degC'), 70.36979, PHYSICS);
    expectRel(out(r, 'temperatureRise', 'degC'), 50.36979, PHYSICS);
  });

  it('when the rise is asked for in °F, then it converts as a difference (× 1.8, no offset)', () => {
    // calculators.md §1: a temperature difference converts without the offset [derived]
    const r = runCalculator('coil-temperature', {
      inputs: { coldResistance: q(28.8, 'ohm'), coldTemperature: q(68, 'degF'), hotResistance: q(34.5, 'ohm') },
      outputUnits: { temperatureRise: 'degF', hotTemperature: 'K' },
    });
    expectRel(out(r, 'temperatureRise', 'degF'), 50.36979 * 1.8, PHYSICS);
    expectRel(out(r, 'hotTemperature', 'K'), 70.36979 + 273.15, PHYSICS);
  });

  it("when IEC 60034-1's k = 235 is used instead, then 70.46875 °C; the α form gives 70.36047 °C", () => {
    // IEC 60034-1 k = 235 [memory]; α form derived
    expectRel(hotTemperatureCelsius(28.8, 20, 34.5, 235), 70.46875, PHYSICS);
    expectRel(20 + (34.5 / 28.8 - 1) / COPPER_ALPHA_20, 70.36047, PHYSICS);
  });
});
