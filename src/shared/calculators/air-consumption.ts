// Free air an air-operated valve uses per cycle and per minute, including the tubing it fills.
import { num, optNum, text } from './helpers';
import { annulusArea, checkRod, circleArea, pistonInputs } from './air-piston-force';
import type { Calculator } from './types';

/** Standard atmosphere, 101.325 kPa, the basis used here. */
export const STANDARD_ATMOSPHERE = 101325; // Pa
/** ISO 8778 standard reference atmosphere pressure, for comparison with catalogue figures. */
export const ISO_8778_ATMOSPHERE = 100000; // Pa

/**
 * Isothermal ideal gas: swept volume fills from atmosphere to p_abs; dead volume only swings between
 * p_atm and p_abs, hence its p_g/p_atm.
 */
export function freeAirPerCycle(sweptVolume: number, deadVolume: number, gaugePressure: number, atmosphere = STANDARD_ATMOSPHERE): number {
  return (sweptVolume * (gaugePressure + atmosphere)) / atmosphere + (deadVolume * gaugePressure) / atmosphere;
}

export const airConsumption: Calculator = {
  id: 'air-consumption',
  title: 'Air valve air use',
  summary: 'Works out the free air an air-operated valve uses per cycle and per minute.',
  inputs: [
    pistonInputs.boreDiameter,
    pistonInputs.rodDiameter,
    {
      name: 'stroke',
      label: 'Piston stroke',
      kind: 'length',
      optional: false,
      defaultUnit: 'mm',
      min: 0,
      help: 'Travel of the piston per cycle.',
    },
    pistonInputs.airPressure,
    {
      name: 'cycleRate',
      label: 'Cycle rate',
      kind: 'frequency',
      optional: false,
      defaultUnit: '1/min',
      min: 0,
      help: 'Valve openings per minute.',
    },
    {
      name: 'doubleActing',
      label: 'Double-acting',
      kind: 'choice',
      choices: [
        { value: 'no', label: 'No: spring return' },
        { value: 'yes', label: 'Yes: air opens and closes' },
      ],
      optional: true,
      default: 'no',
      help: 'Whether air also drives the closing stroke on the rod side.',
    },
    {
      name: 'deadVolume',
      label: 'Dead volume',
      kind: 'volume',
      optional: true,
      defaultUnit: 'cm3',
      default: 0,
      min: 0,
      help: 'Volume of ports and tubing between the air valve and the cylinder that fills each cycle (both lines if double-acting).',
    },
  ],
  outputs: [
    { name: 'freeAirPerCycle', label: 'Free air per cycle', kind: 'volume', unit: 'cm3' },
    { name: 'freeAirPerMinute', label: 'Free air per minute', kind: 'flowRate', unit: 'L/min' },
  ],
  formula: [
    'Swept volume: Ap × stroke for spring return; add Aann × stroke for double-acting',
    'Free air per cycle = V_swept (p_g + p_atm) / p_atm + V_dead p_g / p_atm',
    'Per minute = free air per cycle × cycles per minute',
    'p_atm = 101.325 kPa (standard atmosphere). ISO 8778 uses 100 kPa, which gives about 1.3 % more free air; catalogues may use either.',
  ].join('\n'),
  limits: [
    'Consumption uses absolute pressure; the air pressure input is gauge.',
    'Isothermal ideal gas: adiabatic effects and leaks are ignored.',
    'The regulator pressure is an upper bound; pressure at the valve sags at high cycle rates.',
    'Tubing often dominates: 1 m of 4 mm tube can use over 30 times the air of a small piston.',
  ],
  references: [
    { text: 'Fluid-power textbooks, e.g. Parr, Hydraulics and Pneumatics, 3rd ed. (2011)', tag: 'memory' },
    { text: 'ISO 8778:2003, Pneumatic fluid power — Standard reference atmosphere (title)', tag: 'checked' },
    { text: 'ISO 8778 reference values (100 kPa, 20 °C, 65 % RH)', tag: 'memory' },
    { text: 'Free air per cycle from the isothermal ideal gas law', tag: 'derived' },
  ],
  check: (inputs) => checkRod(inputs),
  compute(inputs) {
    const bore = num(inputs, 'boreDiameter');
    const rod = optNum(inputs, 'rodDiameter') ?? 0;
    const stroke = num(inputs, 'stroke');
    const doubleActing = text(inputs, 'doubleActing') === 'yes';
    const swept = (circleArea(bore) + (doubleActing ? annulusArea(bore, rod) : 0)) * stroke;
    const perCycle = freeAirPerCycle(swept, optNum(inputs, 'deadVolume') ?? 0, num(inputs, 'airPressure'));
    return {
      outputs: { freeAirPerCycle: perCycle, freeAirPerMinute: perCycle * num(inputs, 'cycleRate') },
      warnings: [],
    };
  },
};
