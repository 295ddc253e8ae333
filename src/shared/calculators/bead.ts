// Nominal bead cross-section, and from it adhesive volume and mass per metre, per part and per hour.
import { num, optNum, text } from './helpers';
import type { Calculator } from './types';

export type BeadProfile = 'round' | 'half-round' | 'fillet';

/** Cross-section in m². Half-round is a half-ellipse (height defaults to width/2); fillet legs a, b. */
export function beadArea(profile: BeadProfile, width: number, height?: number): number {
  switch (profile) {
    case 'round':
      return (Math.PI * width * width) / 4;
    case 'half-round':
      return (Math.PI * width * (height ?? width / 2)) / 4;
    case 'fillet':
      return (width * (height ?? width)) / 2;
  }
}

/** Concave tooled fillet of radius r: the square r² less a quarter circle. */
export function concaveFilletArea(radius: number): number {
  return radius * radius * (1 - Math.PI / 4);
}

export const bead: Calculator = {
  id: 'bead',
  title: 'Bead size and adhesive use',
  summary: 'Works out the cross-section of a bead and the adhesive it takes per metre, per part and per hour.',
  inputs: [
    {
      name: 'profile',
      label: 'Bead shape',
      kind: 'choice',
      choices: [
        { value: 'round', label: 'Round' },
        { value: 'half-round', label: 'Half-round' },
        { value: 'fillet', label: 'Triangular fillet' },
      ],
      optional: false,
      default: 'round',
      help: 'Round: a full cylinder of material; half-round: laid flat on the part; fillet: in a corner.',
    },
    {
      name: 'width',
      label: 'Width',
      kind: 'length',
      optional: false,
      defaultUnit: 'mm',
      min: 0,
      minExclusive: true,
      help: 'Round: bead diameter. Half-round: width on the part. Fillet: first leg.',
    },
    {
      name: 'height',
      label: 'Height',
      kind: 'length',
      optional: true,
      defaultUnit: 'mm',
      min: 0,
      minExclusive: true,
      help: 'Half-round: height (default half the width). Fillet: second leg (default equal to the first). Not used for round.',
    },
    {
      name: 'length',
      label: 'Bead length per part',
      kind: 'length',
      optional: false,
      defaultUnit: 'mm',
      min: 0,
      help: 'Total length of bead laid on one part.',
    },
    {
      name: 'density',
      label: 'Density',
      kind: 'density',
      optional: false,
      defaultUnit: 'g/cm3',
      min: 0,
      minExclusive: true,
      help: 'Density of the adhesive as applied; hot melt is lighter at application temperature.',
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
    { name: 'area', label: 'Cross-section', kind: 'area', unit: 'mm2' },
    { name: 'massPerLength', label: 'Mass per metre', kind: 'massPerLength', unit: 'g/m' },
    { name: 'volume', label: 'Volume per part', kind: 'volume', unit: 'mL' },
    { name: 'mass', label: 'Mass per part', kind: 'mass', unit: 'g' },
    { name: 'massPerHour', label: 'Consumption per hour', kind: 'massRate', unit: 'g/h', optional: true },
  ],
  formula: [
    'Round, diameter d: A = π d² / 4',
    'Half-round, width w and height h (half-ellipse): A = π w h / 4; with h = w/2, A = π w² / 8',
    'Fillet with legs a and b: A = a b / 2',
    'Mass per metre = ρ A (A in mm² × ρ in g/cm³ = grams per metre)',
    'Per part: V = A × bead length; m = ρ V',
    'Per hour: m × parts per minute × 60',
  ].join('\n'),
  limits: [
    'Nominal shapes: real beads slump and change with nozzle height and speed, so calibrate with a weighed length of bead.',
    'Hot-melt density at application temperature is lower than at room temperature.',
  ],
  references: [{ text: 'Plane geometry of circle, ellipse and triangle areas', tag: 'derived' }],
  compute(inputs) {
    const profile = text(inputs, 'profile') as BeadProfile;
    const area = beadArea(profile, num(inputs, 'width'), profile === 'round' ? undefined : optNum(inputs, 'height'));
    const density = num(inputs, 'density');
    const volume = area * num(inputs, 'length');
    const mass = density * volume;
    const partsPerSecond = optNum(inputs, 'partsPerMinute');
    return {
      outputs: {
        area,
        massPerLength: density * area,
        volume,
        mass,
        // SI mass rate is kg/s, so parts per second is all that is needed.
        massPerHour: partsPerSecond === undefined ? undefined : mass * partsPerSecond,
      },
      warnings: [],
    };
  },
};
