// Opening force and margin of an air-operated valve: air on the piston against the spring, the fluid
// pressure on the seat and friction.
import { fmt, num, optNum, warning } from './helpers';
import type { Calculator, CalculatorWarning, InputDeclaration } from './types';

export function circleArea(diameter: number): number {
  return (Math.PI * diameter * diameter) / 4;
}

/** Rod-side (annulus) area π (D² − d²) / 4. */
export function annulusArea(boreDiameter: number, rodDiameter: number): number {
  return (Math.PI * (boreDiameter * boreDiameter - rodDiameter * rodDiameter)) / 4;
}

/** Inputs the force and consumption calculators share. */
export const pistonInputs: Record<'boreDiameter' | 'rodDiameter' | 'airPressure', InputDeclaration> = {
  boreDiameter: {
    name: 'boreDiameter',
    label: 'Piston bore',
    kind: 'length',
    optional: false,
    defaultUnit: 'mm',
    min: 0,
    minExclusive: true,
    help: 'Inside diameter of the air cylinder.',
  },
  rodDiameter: {
    name: 'rodDiameter',
    label: 'Rod diameter',
    kind: 'length',
    optional: true,
    defaultUnit: 'mm',
    default: 0,
    min: 0,
    help: 'Diameter of the piston rod or needle shaft on the rod side.',
  },
  airPressure: {
    name: 'airPressure',
    label: 'Air pressure (gauge)',
    kind: 'pressure',
    optional: false,
    defaultUnit: 'bar',
    min: 0,
    help: 'Gauge pressure at the valve; the regulator reading is an upper bound.',
  },
};

/** Rod must be thinner than the bore; shared by the two air-valve calculators. */
export function checkRod(inputs: Record<string, unknown>): Record<string, string> {
  const bore = inputs.boreDiameter;
  const rod = inputs.rodDiameter;
  if (typeof bore === 'number' && typeof rod === 'number' && rod >= bore) {
    return { rodDiameter: 'Rod diameter must be smaller than the piston bore' };
  }
  return {};
}

// Below a fifth of the air force, seal drag and pressure sag at the valve can stop it opening.
const LOW_MARGIN_FRACTION = 0.2;

export const airPistonForce: Calculator = {
  id: 'air-piston-force',
  title: 'Air valve opening force',
  summary: 'Checks whether the air piston can lift the needle against the spring, the fluid pressure on the seat and friction, and by how much.',
  inputs: [
    pistonInputs.boreDiameter,
    pistonInputs.rodDiameter,
    pistonInputs.airPressure,
    {
      name: 'springPreload',
      label: 'Spring preload',
      kind: 'force',
      optional: false,
      defaultUnit: 'N',
      min: 0,
      help: 'Spring force with the valve closed.',
    },
    {
      name: 'springRate',
      label: 'Spring rate',
      kind: 'springRate',
      optional: true,
      defaultUnit: 'N/mm',
      default: 0,
      min: 0,
      help: 'Extra spring force per unit of lift.',
    },
    {
      name: 'lift',
      label: 'Needle lift',
      kind: 'length',
      optional: true,
      defaultUnit: 'mm',
      default: 0,
      min: 0,
      help: 'Stroke from closed to fully open.',
    },
    {
      name: 'fluidPressure',
      label: 'Fluid pressure (gauge)',
      kind: 'pressure',
      optional: false,
      defaultUnit: 'bar',
      min: 0,
      help: 'Fluid supply pressure acting on the closed needle.',
    },
    {
      name: 'seatDiameter',
      label: 'Seat diameter',
      kind: 'length',
      optional: false,
      defaultUnit: 'mm',
      min: 0,
      help: 'Diameter of the seat opening the fluid pressure acts over.',
    },
    {
      name: 'friction',
      label: 'Seal friction',
      kind: 'force',
      optional: true,
      defaultUnit: 'N',
      default: 0,
      min: 0,
      help: 'Drag of the piston and shaft seals, if known.',
    },
  ],
  outputs: [
    { name: 'pistonForce', label: 'Piston force', kind: 'force', unit: 'N' },
    { name: 'returnForce', label: 'Rod-side force', kind: 'force', unit: 'N' },
    { name: 'fluidForce', label: 'Fluid force on the seat', kind: 'force', unit: 'N' },
    { name: 'marginAtCrack', label: 'Margin at crack open', kind: 'force', unit: 'N' },
    { name: 'marginAtFullLift', label: 'Margin at full lift', kind: 'force', unit: 'N' },
    { name: 'minAirPressureToCrack', label: 'Least air pressure to crack open', kind: 'pressure', unit: 'Pa' },
    { name: 'minAirPressureFullLift', label: 'Least air pressure for full lift', kind: 'pressure', unit: 'Pa' },
  ],
  formula: [
    'Piston area Ap = π D² / 4;  piston force F = p_g Ap (gauge pressure)',
    'Rod-side area Aann = π (D² − d_rod²) / 4;  rod-side force = p_g Aann',
    'Spring force Fs(x) = F0 + k x;  seat area As = π d_seat² / 4;  fluid force = p_f As',
    'Margin M(x) = p_g Ap − Fs(x) − p_f As − F_friction (crack: x = 0; full lift: x = lift)',
    'Least air pressure p_min = (Fs(x) + p_f As + F_friction) / Ap',
    'Here the fluid pressure pushes the needle closed; where it helps opening, the fluid term changes sign.',
  ].join('\n'),
  limits: [
    'Forces use gauge pressure.',
    'The regulator pressure is an upper bound; pressure at the valve sags at high cycle rates.',
    'Seal friction is only what you enter; dynamic effects are ignored.',
    'A negative margin means the valve will not open.',
  ],
  references: [
    { text: 'Fluid-power textbooks, e.g. Parr, Hydraulics and Pneumatics, 3rd ed. (2011)', tag: 'memory' },
    { text: 'Force balance on needle, piston and spring', tag: 'derived' },
  ],
  check: (inputs) => checkRod(inputs),
  compute(inputs) {
    const bore = num(inputs, 'boreDiameter');
    const rod = optNum(inputs, 'rodDiameter') ?? 0;
    const air = num(inputs, 'airPressure');
    const preload = num(inputs, 'springPreload');
    const rate = optNum(inputs, 'springRate') ?? 0;
    const lift = optNum(inputs, 'lift') ?? 0;
    const friction = optNum(inputs, 'friction') ?? 0;
    const pistonArea = circleArea(bore);
    const pistonForce = air * pistonArea;
    const fluidForce = num(inputs, 'fluidPressure') * circleArea(num(inputs, 'seatDiameter'));
    const closingAtCrack = preload + fluidForce + friction;
    const closingAtFullLift = closingAtCrack + rate * lift;
    const marginAtCrack = pistonForce - closingAtCrack;
    const marginAtFullLift = pistonForce - closingAtFullLift;
    const warnings: CalculatorWarning[] = [];
    if (marginAtCrack < 0) {
      warnings.push(warning('cannot-open', `The valve cannot open: the closing forces exceed the air force by ${fmt(-marginAtCrack)} N. Raise the air pressure or lower the fluid pressure.`));
    } else if (marginAtFullLift < 0) {
      warnings.push(warning('cannot-open', `The valve cracks open but cannot reach full lift: it falls ${fmt(-marginAtFullLift)} N short at full lift.`));
    } else if (Math.min(marginAtCrack, marginAtFullLift) < LOW_MARGIN_FRACTION * pistonForce) {
      warnings.push(warning('low-margin', 'The opening margin is under 20 % of the piston force: air pressure sag, seal drag or a thicker fluid may stop the valve opening fully.'));
    }
    return {
      outputs: {
        pistonForce,
        returnForce: air * annulusArea(bore, rod),
        fluidForce,
        marginAtCrack,
        marginAtFullLift,
        minAirPressureToCrack: closingAtCrack / pistonArea,
        minAirPressureFullLift: closingAtFullLift / pistonArea,
      },
      warnings,
    };
  },
};
