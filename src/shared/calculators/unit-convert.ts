// Converts one value between trade units, keeping gauge/absolute and temperature steps explicit.
import { KIND_LABELS, absoluteZeroMessage, isUnitOf, unitList } from '../units';
import { num } from './helpers';
import type { Calculator } from './types';

export const unitConvert: Calculator = {
  id: 'unit-convert',
  title: 'Unit converter',
  summary: 'Converts a pressure, viscosity, length, volume or other reading into another unit of the same kind.',
  inputs: [
    {
      name: 'value',
      label: 'Value',
      kind: 'any',
      optional: false,
      defaultUnit: 'psi',
      help: 'The reading and the unit it is in.',
    },
    {
      name: 'to',
      label: 'Convert to',
      kind: 'unit',
      optional: false,
      help: 'A unit of the same kind, e.g. bar for a psi reading.',
    },
  ],
  outputs: [{ name: 'value', label: 'Converted value', kind: 'any', unitFrom: 'to' }],
  formula: [
    'SI value = (value + offset) × factor, then back out with the target unit.',
    'Exact factors: 1 psi = 0.45359237 kg × 9.80665 m/s² ÷ (0.0254 m)² = 6894.757293168361 Pa; 1 bar = 100 kPa;',
    '1 P = 0.1 Pa·s; 1 cP = 1 mPa·s; 1 in = 25.4 mm; 1 thou = 0.0254 mm; 1 in³ = 16.387064 mL;',
    '1 US fl oz = 231 in³ ÷ 128 = 29.5735295625 mL; 1 lb = 453.59237 g; 1 oz = 28.349523125 g.',
    'Temperature: K = °C + 273.15; °F = 1.8 × °C + 32.',
  ].join('\n'),
  limits: [
    'Gauge and absolute pressure are not converted into each other: p_abs = p_gauge + p_atm.',
    'A temperature reading converts with its offset; a temperature difference does not (1 K = 1 °C = 1.8 °F).',
    'Temperatures below absolute zero are refused.',
    'Kinematic viscosity (cSt) is not dynamic viscosity (cP): converting needs the density, μ = ρν.',
    '"mil" is shown as thou (0.001 in) because on the shop floor it can also mean millimetre.',
  ],
  references: [
    { text: 'NIST SP 811 (2008), Guide for the Use of the SI, App. B.8 and B.9 (the guide itself)', tag: 'checked' },
    { text: 'NIST SP 811 individual factor entries', tag: 'memory' },
    { text: 'psi, in³ and US fl oz from the exact definitions of lb, g_n, inch and US gallon (231 in³)', tag: 'derived' },
  ],
  check(inputs, context) {
    const errors: Record<string, string> = {};
    const kind = context.kinds.value;
    const to = inputs.to;
    if (kind && typeof to === 'string' && !isUnitOf(to, kind)) {
      errors.to = `'${to}' is not a ${KIND_LABELS[kind]} unit: use ${unitList(kind)}`;
    }
    const value = inputs.value;
    if (kind === 'temperature' && typeof value === 'number') {
      const belowZero = absoluteZeroMessage(value, 'Value', context.units.value);
      if (belowZero) errors.value = belowZero;
    }
    return errors;
  },
  compute(inputs) {
    // The runner writes the SI value out in the 'to' unit, which check() has tied to the value's kind.
    return { outputs: { value: num(inputs, 'value') }, warnings: [] };
  },
};
