// Laminar Newtonian flow through a dispensing needle (Hagen–Poiseuille): flow from pressure or the
// pressure a target flow needs, with the checks that tell when the model stops holding.
import { fmt, num, optNum, warning } from './helpers';
import type { Calculator, CalculatorWarning, ComputeContext, InputDeclaration } from './types';

/** Q = π r⁴ ΔP / (8 μ L) */
export function hagenPoiseuilleFlow(radius: number, length: number, viscosity: number, pressureDrop: number): number {
  return (Math.PI * radius ** 4 * pressureDrop) / (8 * viscosity * length);
}

/** ΔP = 8 μ L Q / (π r⁴) */
export function hagenPoiseuillePressureDrop(radius: number, length: number, viscosity: number, flowRate: number): number {
  return (8 * viscosity * length * flowRate) / (Math.PI * radius ** 4);
}

/** Sections in series add their resistances 8 μ L / (π r⁴). */
export function seriesPressureDrop(sections: { radius: number; length: number }[], viscosity: number, flowRate: number): number {
  return sections.reduce((sum, s) => sum + hagenPoiseuillePressureDrop(s.radius, s.length, viscosity, flowRate), 0);
}

/**
 * Linearly tapered tip from r1 to r2 over L, lubrication approximation (small taper):
 * ΔP = (8 μ Q L / 3π) (r1² + r1 r2 + r2²) / (r1³ r2³).
 */
export function taperedPressureDrop(r1: number, r2: number, length: number, viscosity: number, flowRate: number): number {
  return ((8 * viscosity * flowRate * length) / (3 * Math.PI)) * ((r1 * r1 + r1 * r2 + r2 * r2) / (r1 ** 3 * r2 ** 3));
}

export const LAMINAR_LIMIT = 2100;
// Below the laminar limit but close enough that disturbances at the needle entry may not die out.
export const NEAR_TRANSITION = 1500;

/** Laminar-flow validity warnings shared by the Newtonian and power-law needle calculators. */
export function laminarWarnings(args: { reynolds: number; diameter: number; length: number; density: number; meanVelocity: number; pressureDrop: number; model: string }): CalculatorWarning[] {
  const { reynolds, diameter, length, density, meanVelocity, pressureDrop, model } = args;
  const warnings: CalculatorWarning[] = [];
  if (reynolds > LAMINAR_LIMIT) {
    warnings.push(
      warning(
        'turbulent',
        `Reynolds number ${fmt(reynolds)} is above about 2,100, so the flow is not laminar (transitional up to about 4,000, turbulent beyond). ` +
          `The ${model} result is not valid here: the real flow is lower than shown.`,
      ),
    );
  } else if (reynolds >= NEAR_TRANSITION) {
    warnings.push(warning('transitional', `Reynolds number ${fmt(reynolds)} is close to the laminar limit of about 2,100; treat the result with care.`));
  }
  const entrance = 0.06 * reynolds * diameter;
  // The developing-flow region has a higher pressure gradient; once it is a tenth of the needle it shows.
  if (entrance > 0.1 * length) {
    warnings.push(
      warning(
        'entrance-length',
        `The flow needs about ${fmt(entrance * 1000)} mm (${fmt(entrance / diameter)} diameters) to settle, against a needle length of ` +
          `${fmt(length * 1000)} mm (${fmt(length / diameter)} diameters). The formula assumes settled flow along the whole needle, so the result is not valid.`,
      ),
    );
  }
  const kinetic = pressureDrop > 0 ? (density * meanVelocity * meanVelocity) / pressureDrop : 0;
  if (kinetic > 0.1) {
    warnings.push(warning('entry-loss', `Entry and exit losses are not small: ρv̄²/ΔP is ${fmt(kinetic, 3)}, where the formula needs it much less than 1. Expect less flow than shown.`));
  }
  return warnings;
}

export const noDensityWarning = warning('no-density', 'No density given, so the Reynolds number and the laminar-flow check are left out.');

/** "Give exactly one of pressure drop or flow rate", shared by both needle calculators. */
export function checkPressureOrFlow(context: ComputeContext): Record<string, string> {
  const hasPressure = context.given.includes('pressureDrop');
  const hasFlow = context.given.includes('flowRate');
  if (hasPressure && hasFlow) {
    const message = 'Give either the pressure drop or the flow rate, not both';
    return { pressureDrop: message, flowRate: message };
  }
  if (!hasPressure && !hasFlow) {
    const message = 'Give the pressure drop or the flow rate';
    return { pressureDrop: message, flowRate: message };
  }
  return {};
}

/** Inputs the two needle calculators share, in form order. */
export const needleInputs: Record<'innerDiameter' | 'length' | 'density' | 'pressureDrop' | 'flowRate', InputDeclaration> = {
  innerDiameter: {
    name: 'innerDiameter',
    label: 'Inner diameter',
    kind: 'length',
    optional: false,
    defaultUnit: 'mm',
    min: 0,
    minExclusive: true,
    help: 'Measured inside diameter of the needle; flow goes with its fourth power.',
  },
  length: {
    name: 'length',
    label: 'Needle length',
    kind: 'length',
    optional: false,
    defaultUnit: 'mm',
    min: 0,
    minExclusive: true,
    help: 'Length of the narrow bore.',
  },
  density: {
    name: 'density',
    label: 'Density',
    kind: 'density',
    optional: true,
    defaultUnit: 'g/cm3',
    min: 0,
    minExclusive: true,
    help: 'Needed for the Reynolds number and the laminar-flow check.',
  },
  pressureDrop: {
    name: 'pressureDrop',
    label: 'Pressure drop',
    kind: 'pressure',
    optional: true,
    defaultUnit: 'bar',
    min: 0,
    help: 'Drop across the needle alone, not the reservoir gauge pressure. Give this or the flow rate.',
  },
  flowRate: {
    name: 'flowRate',
    label: 'Flow rate',
    kind: 'flowRate',
    optional: true,
    defaultUnit: 'uL/s',
    min: 0,
    help: 'Target flow; the pressure drop it needs is worked out. Give this or the pressure drop.',
  },
};

export const nozzleFlow: Calculator = {
  id: 'nozzle-flow',
  title: 'Needle flow (Newtonian fluid)',
  summary: 'Works out the flow through a needle from the pressure drop, or the pressure drop a target flow needs, for a fluid of constant viscosity.',
  inputs: [
    needleInputs.innerDiameter,
    needleInputs.length,
    {
      name: 'viscosity',
      label: 'Viscosity',
      kind: 'viscosity',
      optional: false,
      defaultUnit: 'cP',
      min: 0,
      minExclusive: true,
      help: 'Dynamic viscosity at the dispensing temperature (cP, not cSt).',
    },
    needleInputs.density,
    needleInputs.pressureDrop,
    needleInputs.flowRate,
  ],
  outputs: [
    { name: 'flowRate', label: 'Flow rate', kind: 'flowRate', unit: 'mL/s' },
    { name: 'pressureDrop', label: 'Pressure drop', kind: 'pressure', unit: 'Pa' },
    { name: 'meanVelocity', label: 'Mean velocity', kind: 'speed', unit: 'mm/s' },
    { name: 'reynolds', label: 'Reynolds number', kind: 'dimensionless', unit: '1', optional: true },
    { name: 'wallShearRate', label: 'Wall shear rate', kind: 'shearRate', unit: '1/s' },
    { name: 'wallShearStress', label: 'Wall shear stress', kind: 'pressure', unit: 'Pa' },
  ],
  formula: [
    'r = inner diameter / 2',
    'Q = π r⁴ ΔP / (8 μ L);  ΔP = 8 μ L Q / (π r⁴)',
    'Mean velocity v̄ = Q / (π r²);  Reynolds number Re = ρ v̄ (2r) / μ',
    'Wall shear rate γ̇w = 4Q / (π r³);  wall shear stress τw = ΔP r / (2L) = μ γ̇w',
    'Entrance length Le ≈ 0.06 Re D',
  ].join('\n'),
  limits: [
    'Laminar flow only: Re below about 2,100 (2,100 to 4,000 is transitional).',
    'Settled flow: the entrance length 0.06 Re D must be small against the needle length.',
    'Newtonian fluids only; shear-thinning fluids need the power-law calculator, and yield-stress pastes fit neither.',
    'Isothermal, incompressible, rigid walls, no slip; entry and exit losses ignored (ρv̄²/ΔP much less than 1).',
    'ΔP is the drop across the needle only.',
    'Q goes with r⁴: a 5 % error in the inner diameter gives about 20 % in flow. Use the measured ID.',
  ],
  references: [
    { text: 'Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. (2002), §2.3 (section number from memory)', tag: 'memory' },
    { text: 'OpenStax University Physics Vol. 1, §14.7, example "Using Flow Rate: Air Conditioning Systems"', tag: 'checked' },
    { text: 'Laminar limit about 2,100 and entrance length 0.06 Re D', tag: 'memory' },
    { text: 'Tapered-tip pressure drop (lubrication approximation), matched by numerical integration', tag: 'derived' },
  ],
  check: (_inputs, context) => checkPressureOrFlow(context),
  compute(inputs) {
    const diameter = num(inputs, 'innerDiameter');
    const radius = diameter / 2;
    const length = num(inputs, 'length');
    const viscosity = num(inputs, 'viscosity');
    const density = optNum(inputs, 'density');
    const givenPressure = optNum(inputs, 'pressureDrop');
    const flowRate = givenPressure !== undefined ? hagenPoiseuilleFlow(radius, length, viscosity, givenPressure) : num(inputs, 'flowRate');
    const pressureDrop = givenPressure ?? hagenPoiseuillePressureDrop(radius, length, viscosity, flowRate);
    const meanVelocity = flowRate / (Math.PI * radius * radius);
    const wallShearRate = (4 * flowRate) / (Math.PI * radius ** 3);
    const warnings: CalculatorWarning[] = [];
    let reynolds: number | undefined;
    if (density === undefined) {
      warnings.push(noDensityWarning);
    } else {
      reynolds = (density * meanVelocity * diameter) / viscosity;
      warnings.push(...laminarWarnings({ reynolds, diameter, length, density, meanVelocity, pressureDrop, model: 'Hagen–Poiseuille' }));
    }
    return {
      outputs: {
        flowRate,
        pressureDrop,
        meanVelocity,
        reynolds,
        wallShearRate,
        wallShearStress: (pressureDrop * radius) / (2 * length),
      },
      warnings,
    };
  },
};
