// Volume and mass of a dispensed dot modelled as a spherical cap, from its height or contact angle.
import { num, optNum } from './helpers';
import type { Calculator } from './types';

/** Spherical cap of base radius a and height h: V = π h (3a² + h²) / 6. */
export function sphericalCapVolume(baseRadius: number, height: number): number {
  return (Math.PI * height * (3 * baseRadius * baseRadius + height * height)) / 6;
}

/** Cap height from the contact angle θc at the edge of the dot: h = a tan(θc / 2). */
export function capHeightFromContactAngle(baseRadius: number, contactAngle: number): number {
  return baseRadius * Math.tan(contactAngle / 2);
}

export const dot: Calculator = {
  id: 'dot',
  title: 'Dot size',
  summary: 'Works out the volume and mass of a dot from its base diameter and its height or contact angle.',
  inputs: [
    {
      name: 'baseDiameter',
      label: 'Base diameter',
      kind: 'length',
      optional: false,
      defaultUnit: 'mm',
      min: 0,
      minExclusive: true,
      help: 'Diameter of the dot where it meets the part.',
    },
    {
      name: 'height',
      label: 'Height',
      kind: 'length',
      optional: true,
      defaultUnit: 'mm',
      min: 0,
      help: 'Height of the dot above the part. Give this or the contact angle.',
    },
    {
      name: 'contactAngle',
      label: 'Contact angle',
      kind: 'angle',
      optional: true,
      defaultUnit: 'deg',
      min: 0,
      max: Math.PI,
      maxExclusive: true,
      help: 'Angle between the part and the dot surface at its edge. Give this or the height.',
    },
    {
      name: 'density',
      label: 'Density',
      kind: 'density',
      optional: false,
      defaultUnit: 'g/cm3',
      min: 0,
      minExclusive: true,
      help: 'Density of the fluid as dispensed.',
    },
    {
      name: 'dotsPerPart',
      label: 'Dots per part',
      kind: 'dimensionless',
      optional: true,
      defaultUnit: '1',
      default: 1,
      min: 0,
      help: 'Number of dots on each part, for the hourly consumption.',
    },
    {
      name: 'partsPerMinute',
      label: 'Parts per minute',
      kind: 'frequency',
      optional: true,
      defaultUnit: '1/min',
      min: 0,
      help: 'Line rate, for the hourly consumption.',
    },
  ],
  outputs: [
    { name: 'height', label: 'Dot height', kind: 'length', unit: 'mm' },
    { name: 'volume', label: 'Volume per dot', kind: 'volume', unit: 'uL' },
    { name: 'mass', label: 'Mass per dot', kind: 'mass', unit: 'mg' },
    { name: 'massPerHour', label: 'Consumption per hour', kind: 'massRate', unit: 'g/h', optional: true },
  ],
  formula: [
    'Spherical cap, base radius a = diameter / 2, height h: V = π h (3a² + h²) / 6',
    'From the contact angle θc: h = a tan(θc / 2)',
    'Mass m = ρ V; per hour = m × dots per part × parts per minute × 60',
  ].join('\n'),
  limits: ['The cap shape holds only while gravity is negligible (Bond number ρ g a² / σ much less than 1); large dots flatten.', 'Nominal shape: weigh a counted number of dots to calibrate.'],
  references: [
    { text: 'CRC Standard Mathematical Tables and Formulae (Zwillinger, ed., 33rd ed.), spherical segment/cap', tag: 'memory' },
    { text: 'Cap height from the contact angle, h = a tan(θc/2)', tag: 'derived' },
  ],
  check(_inputs, context): Record<string, string> {
    const hasHeight = context.given.includes('height');
    const hasAngle = context.given.includes('contactAngle');
    if (hasHeight && hasAngle) {
      const message = 'Give either the dot height or the contact angle, not both';
      return { height: message, contactAngle: message };
    }
    if (!hasHeight && !hasAngle) {
      const message = 'Give the dot height or the contact angle';
      return { height: message, contactAngle: message };
    }
    return {};
  },
  compute(inputs) {
    const radius = num(inputs, 'baseDiameter') / 2;
    const angle = optNum(inputs, 'contactAngle');
    const height = angle === undefined ? num(inputs, 'height') : capHeightFromContactAngle(radius, angle);
    const volume = sphericalCapVolume(radius, height);
    const mass = num(inputs, 'density') * volume;
    const partsPerSecond = optNum(inputs, 'partsPerMinute');
    const dotsPerPart = optNum(inputs, 'dotsPerPart') ?? 1;
    return {
      outputs: {
        height,
        volume,
        mass,
        massPerHour: partsPerSecond === undefined ? undefined : mass * dotsPerPart * partsPerSecond,
      },
      warnings: [],
    };
  },
};
