// Average winding temperature of a copper coil from its cold and hot resistance (resistance method).
import { num } from './helpers';
import type { Calculator } from './types';

/** Inferred zero-resistance temperature of copper, °C: 1/(234.5 + 20) = 0.003929 per K. */
export const COPPER_K = 234.5;
const KELVIN_OFFSET = 273.15;

/** T2 = (R2/R1)(k + T1) − k, temperatures in °C. */
export function hotTemperatureCelsius(coldResistance: number, coldCelsius: number, hotResistance: number, k = COPPER_K): number {
  return (hotResistance / coldResistance) * (k + coldCelsius) - k;
}

export const coilTemperature: Calculator = {
  id: 'coil-temperature',
  title: 'Coil temperature from resistance',
  summary: 'Works out how hot a copper coil winding runs from its resistance cold and hot.',
  inputs: [
    {
      name: 'coldResistance',
      label: 'Cold resistance',
      kind: 'resistance',
      optional: false,
      defaultUnit: 'ohm',
      min: 0,
      minExclusive: true,
      help: 'Resistance of the coil at a known temperature before running.',
    },
    {
      name: 'coldTemperature',
      label: 'Cold temperature',
      kind: 'temperature',
      optional: false,
      defaultUnit: 'degC',
      // k + T1 must stay positive: −234.5 °C is where the copper line reaches zero resistance.
      min: KELVIN_OFFSET - COPPER_K,
      minExclusive: true,
      help: 'Coil temperature when the cold resistance was read.',
    },
    {
      name: 'hotResistance',
      label: 'Hot resistance',
      kind: 'resistance',
      optional: false,
      defaultUnit: 'ohm',
      min: 0,
      minExclusive: true,
      help: 'Resistance read straight after switching off a coil that has reached running temperature.',
    },
  ],
  outputs: [
    { name: 'hotTemperature', label: 'Winding temperature', kind: 'temperature', unit: 'degC' },
    { name: 'temperatureRise', label: 'Temperature rise', kind: 'temperatureDifference', unit: 'degC' },
  ],
  formula: ['T2 = (R2 / R1)(k + T1) − k, temperatures in °C, k = 234.5 for copper', 'Rise = T2 − T1'].join('\n'),
  limits: [
    'Copper windings only (aluminium uses k = 225.0).',
    'Gives the average winding temperature; hot spots run hotter.',
    'Read the hot resistance quickly after switching off: the coil starts cooling at once.',
    'IEC 60034-1 writes k = 235, which differs by about 0.1 K at typical rises.',
  ],
  references: [
    { text: 'A safety standard temperature-test clause: k = 234.5 (Cu), 225.0 (EC Al)', tag: 'checked' },
    { text: 'IEEE Std 112 uses 234.5; IEC 60034-1 writes 235', tag: 'memory' },
    { text: '234.5 is consistent with α20 = 1/(234.5 + 20) = 0.003929 per K', tag: 'derived' },
  ],
  compute(inputs) {
    const coldCelsius = num(inputs, 'coldTemperature') - KELVIN_OFFSET;
    const hotCelsius = hotTemperatureCelsius(num(inputs, 'coldResistance'), coldCelsius, num(inputs, 'hotResistance'));
    return {
      outputs: { hotTemperature: hotCelsius + KELVIN_OFFSET, temperatureRise: hotCelsius - coldCelsius },
      warnings: [],
    };
  },
};
