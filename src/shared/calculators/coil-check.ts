// Checks a solenoid coil's resistance against its nominal value, corrected to 20 °C, and gives the
// current and power to expect cold and at operating temperature.
import { num, optNum, warning } from './helpers';
import type { Calculator } from './types';

/** Temperature coefficient of annealed copper at 20 °C (IEC 60028, 100 % IACS). */
export const COPPER_ALPHA_20 = 0.00393; // 1/K
const KELVIN_AT_20C = 293.15;

/** R_T = R20 [1 + α20 (T − 20 °C)]; temperatures in kelvin. */
export function resistanceAt(r20: number, kelvin: number, alpha = COPPER_ALPHA_20): number {
  return r20 * (1 + alpha * (kelvin - KELVIN_AT_20C));
}

/** R20 = R_T / [1 + α20 (T − 20 °C)]; temperatures in kelvin. */
export function resistanceAt20(measured: number, kelvin: number, alpha = COPPER_ALPHA_20): number {
  return measured / (1 + alpha * (kelvin - KELVIN_AT_20C));
}

export type CoilVerdict = 'ok' | 'low' | 'high' | 'open';

// A reading far above nominal is a broken winding or lead, not a tolerance problem.
export const OPEN_FACTOR = 10;

export function coilVerdict(nominal: number, measured: number, r20: number, tolerance: number): CoilVerdict {
  if (measured > OPEN_FACTOR * nominal) return 'open';
  const deviation = (r20 - nominal) / nominal;
  if (deviation < -tolerance) return 'low';
  if (deviation > tolerance) return 'high';
  return 'ok';
}

// The linear copper law turns negative resistance below about −234 °C; stay well clear of it.
const LOWEST_COIL_TEMPERATURE = 73.15; // K, −200 °C

export const coilCheck: Calculator = {
  id: 'coil-check',
  title: 'Coil check',
  summary: 'Compares a measured coil resistance with its nominal value at 20 °C and gives the current and power to expect.',
  inputs: [
    {
      name: 'supplyVoltage',
      label: 'Supply voltage',
      kind: 'voltage',
      optional: false,
      defaultUnit: 'V',
      min: 0,
      minExclusive: true,
      help: 'DC voltage the driver puts on the coil (the hold voltage for spike-and-hold drivers).',
    },
    {
      name: 'nominalResistance',
      label: 'Nominal resistance',
      kind: 'resistance',
      optional: false,
      defaultUnit: 'ohm',
      min: 0,
      minExclusive: true,
      help: 'Coil resistance at 20 °C from the label or data sheet.',
    },
    {
      name: 'measuredResistance',
      label: 'Measured resistance',
      kind: 'resistance',
      optional: false,
      defaultUnit: 'ohm',
      min: 0,
      help: 'Meter reading across the disconnected coil.',
    },
    {
      name: 'measuredAt',
      label: 'Coil temperature at measurement',
      kind: 'temperature',
      optional: false,
      defaultUnit: 'degC',
      min: LOWEST_COIL_TEMPERATURE,
      help: 'Temperature of the coil itself when measured; let a hot coil cool first.',
    },
    {
      name: 'operatingTemperature',
      label: 'Operating temperature',
      kind: 'temperature',
      optional: true,
      defaultUnit: 'degC',
      min: LOWEST_COIL_TEMPERATURE,
      help: 'Coil temperature in service, for the hot current and power. Left out: the measurement temperature.',
    },
    {
      name: 'tolerance',
      label: 'Tolerance',
      kind: 'dimensionless',
      optional: true,
      defaultUnit: '%',
      default: 10,
      min: 0,
      max: 1,
      help: 'Allowed deviation from nominal; 10 % is common practice when the coil maker gives none.',
    },
  ],
  outputs: [
    { name: 'expectedCurrent', label: 'Expected current at 20 °C', kind: 'current', unit: 'A' },
    { name: 'expectedPower', label: 'Expected power at 20 °C', kind: 'power', unit: 'W' },
    { name: 'resistanceAt20', label: 'Measured resistance at 20 °C', kind: 'resistance', unit: 'ohm' },
    { name: 'deviation', label: 'Deviation from nominal', kind: 'dimensionless', unit: '%' },
    { name: 'hotResistance', label: 'Resistance at operating temperature', kind: 'resistance', unit: 'ohm' },
    { name: 'hotCurrent', label: 'Current at operating temperature', kind: 'current', unit: 'A' },
    { name: 'hotPower', label: 'Power at operating temperature', kind: 'power', unit: 'W' },
    { name: 'verdict', label: 'Verdict', kind: 'verdict', values: ['ok', 'low', 'high', 'open'] },
  ],
  formula: [
    'Expected at 20 °C from nominal: I = V / R20;  P = V² / R20',
    'Measured reading corrected to 20 °C: R20 = R_T / [1 + α20 (T − 20)], α20 = 0.00393 per K (copper)',
    'Deviation = (R20 measured − R20 nominal) / R20 nominal',
    'At operating temperature from the corrected reading: R_hot = R20 [1 + α20 (T_op − 20)];  I = V / R_hot;  P = V² / R_hot',
    'Verdict: open above 10 × nominal; low below nominal by more than the tolerance (shorted turns); high above it by more than the tolerance; otherwise ok',
  ].join('\n'),
  limits: [
    'I = V/R and P = V²/R hold for steady DC only: AC coils are limited by impedance, and PWM or spike-and-hold drivers do not give V/R.',
    'Measure a cold, disconnected coil at a known temperature.',
    'DC resistance hardly changes with a few shorted turns, so a normal reading does not prove the coil healthy; an inductance or surge test is better.',
    "Do not mix this α with IEC 60228's simplified correction table, which works out to about 0.004 per K.",
  ],
  references: [
    { text: 'IEC 60028, annealed copper (100 % IACS): α20 = 0.00393 per K, confirmed via a secondary summary', tag: 'checked' },
    { text: 'Open above about 10 × nominal; short below nominal by more than the tolerance, default −10 %', tag: 'common practice' },
    { text: 'Inductance or surge testing finds shorted turns that DC resistance misses', tag: 'memory' },
  ],
  compute(inputs) {
    const voltage = num(inputs, 'supplyVoltage');
    const nominal = num(inputs, 'nominalResistance');
    const measured = num(inputs, 'measuredResistance');
    const measuredAt = num(inputs, 'measuredAt');
    const operating = optNum(inputs, 'operatingTemperature') ?? measuredAt;
    const tolerance = optNum(inputs, 'tolerance') ?? 0.1;
    const r20 = resistanceAt20(measured, measuredAt);
    const hotResistance = resistanceAt(r20, operating);
    const verdict = coilVerdict(nominal, measured, r20, tolerance);
    const warnings = [warning('ac-or-pwm', 'Current and power here assume steady DC. For AC coils current is set by impedance, and with PWM or spike-and-hold drivers it is not V/R.')];
    const deviation = (r20 - nominal) / nominal;
    return {
      outputs: {
        expectedCurrent: voltage / nominal,
        expectedPower: (voltage * voltage) / nominal,
        resistanceAt20: r20,
        deviation,
        hotResistance,
        // A dead short has no finite current; the runner leaves the outputs out.
        hotCurrent: hotResistance > 0 ? voltage / hotResistance : undefined,
        hotPower: hotResistance > 0 ? (voltage * voltage) / hotResistance : undefined,
        verdict,
      },
      warnings,
    };
  },
};

export const coilVerdictMessages: Record<CoilVerdict, string> = {
  ok: 'Within tolerance of nominal.',
  low: 'Below nominal by more than the tolerance: possible shorted turns or the wrong coil.',
  high: 'Above nominal by more than the tolerance: poor connection, damaged winding or the wrong coil.',
  open: 'More than ten times nominal: open winding or broken lead.',
};
