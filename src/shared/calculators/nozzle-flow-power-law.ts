// Laminar flow of a shear-thinning (power-law) adhesive through a needle, with the true wall shear
// rate and the Metzner–Reed Reynolds number used to judge whether the model holds.
import { fmt, num, optNum, warning } from './helpers';
import { checkPressureOrFlow, laminarWarnings, needleInputs, noDensityWarning } from './nozzle-flow';
import type { Calculator, CalculatorWarning } from './types';

/** Q = (π n / (3n+1)) (ΔP / (2 K L))^(1/n) R^((3n+1)/n) */
export function powerLawFlow(radius: number, length: number, consistency: number, flowIndex: number, pressureDrop: number): number {
  const n = flowIndex;
  return ((Math.PI * n) / (3 * n + 1)) * (pressureDrop / (2 * consistency * length)) ** (1 / n) * radius ** ((3 * n + 1) / n);
}

/** ΔP = 2 K L [Q (3n+1) / (π n R^((3n+1)/n))]ⁿ */
export function powerLawPressureDrop(radius: number, length: number, consistency: number, flowIndex: number, flowRate: number): number {
  const n = flowIndex;
  return 2 * consistency * length * ((flowRate * (3 * n + 1)) / (Math.PI * n * radius ** ((3 * n + 1) / n))) ** n;
}

/** Re_MR = ρ V^(2−n) Dⁿ / [K 8^(n−1) ((3n+1)/(4n))ⁿ] */
export function metznerReedReynolds(density: number, meanVelocity: number, diameter: number, consistency: number, flowIndex: number): number {
  const n = flowIndex;
  return (density * meanVelocity ** (2 - n) * diameter ** n) / (consistency * 8 ** (n - 1) * ((3 * n + 1) / (4 * n)) ** n);
}

/** Rabinowitsch–Mooney: true wall shear rate = ((3n+1)/(4n)) × apparent 4Q/(πR³). */
export function powerLawWallShearRate(radius: number, flowIndex: number, flowRate: number): number {
  const n = flowIndex;
  return ((3 * n + 1) / (4 * n)) * ((4 * flowRate) / (Math.PI * radius ** 3));
}

// Below this index the flow swings hard with pressure, so K and n fitted elsewhere mislead quickly.
const STRONGLY_SHEAR_THINNING = 0.4;

export const nozzleFlowPowerLaw: Calculator = {
  id: 'nozzle-flow-power-law',
  title: 'Needle flow (shear-thinning fluid)',
  summary: 'Works out the flow of a shear-thinning adhesive through a needle from the pressure drop, or the pressure drop a target flow needs.',
  inputs: [
    needleInputs.innerDiameter,
    needleInputs.length,
    {
      name: 'consistency',
      label: 'Consistency K',
      kind: 'consistency',
      optional: false,
      defaultUnit: 'Pa.s^n',
      min: 0,
      minExclusive: true,
      help: 'Power-law consistency from the fluid data sheet or a rheometer fit; its units depend on n.',
    },
    {
      name: 'flowIndex',
      label: 'Flow index n',
      kind: 'dimensionless',
      optional: false,
      defaultUnit: '1',
      min: 0,
      minExclusive: true,
      help: 'Power-law index: 1 for a Newtonian fluid, below 1 for shear-thinning.',
    },
    needleInputs.density,
    needleInputs.pressureDrop,
    needleInputs.flowRate,
  ],
  outputs: [
    { name: 'flowRate', label: 'Flow rate', kind: 'flowRate', unit: 'mL/s' },
    { name: 'pressureDrop', label: 'Pressure drop', kind: 'pressure', unit: 'Pa' },
    { name: 'meanVelocity', label: 'Mean velocity', kind: 'speed', unit: 'mm/s' },
    { name: 'wallShearRate', label: 'Wall shear rate', kind: 'shearRate', unit: '1/s' },
    { name: 'wallShearStress', label: 'Wall shear stress', kind: 'pressure', unit: 'Pa' },
    { name: 'wallViscosity', label: 'Viscosity at the wall', kind: 'viscosity', unit: 'Pa.s', optional: true },
    { name: 'reynolds', label: 'Reynolds number (Metzner–Reed)', kind: 'dimensionless', unit: '1', optional: true },
  ],
  formula: [
    'Fluid: τ = K γ̇ⁿ.  R = inner diameter / 2',
    'Q = (π n / (3n+1)) (ΔP / (2 K L))^(1/n) R^((3n+1)/n)',
    'ΔP = 2 K L [Q (3n+1) / (π n R^((3n+1)/n))]ⁿ',
    'True wall shear rate (Rabinowitsch–Mooney) γ̇w = ((3n+1)/(4n)) 4Q / (π R³)',
    'Wall shear stress τw = ΔP R / (2L);  wall viscosity ηw = τw / γ̇w = K γ̇wⁿ⁻¹',
    'Metzner–Reed Re = ρ V̄^(2−n) Dⁿ / [K 8^(n−1) ((3n+1)/(4n))ⁿ]',
    'With n = 1 and K = μ this is Hagen–Poiseuille.',
  ].join('\n'),
  limits: [
    'K and n hold only over the shear-rate range they were fitted on: compare the wall shear rate with it.',
    'Q goes with ΔP^(1/n): at n = 0.5, doubling the pressure gives four times the flow.',
    'No zero-shear plateau; not for yield-stress materials (Bingham or Herschel–Bulkley sealants and pastes).',
    'Thixotropy and wall slip are not modelled.',
    'Laminar flow only: Metzner–Reed Re below about 2,100.',
  ],
  references: [
    { text: 'Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed., §8.3, Example 8.3-1', tag: 'memory' },
    { text: 'Chhabra & Richardson, Non-Newtonian Flow and Applied Rheology, 2nd ed. (2008), Ch. 3', tag: 'memory' },
    { text: 'Metzner & Reed, AIChE J. 1 (1955) 434', tag: 'memory' },
    { text: 'Reduction to Hagen–Poiseuille at n = 1 and f·Re_MR = 16, verified numerically', tag: 'derived' },
  ],
  check: (_inputs, context) => checkPressureOrFlow(context),
  compute(inputs) {
    const diameter = num(inputs, 'innerDiameter');
    const radius = diameter / 2;
    const length = num(inputs, 'length');
    const consistency = num(inputs, 'consistency');
    const n = num(inputs, 'flowIndex');
    const density = optNum(inputs, 'density');
    const givenPressure = optNum(inputs, 'pressureDrop');
    const flowRate = givenPressure !== undefined ? powerLawFlow(radius, length, consistency, n, givenPressure) : num(inputs, 'flowRate');
    const pressureDrop = givenPressure ?? powerLawPressureDrop(radius, length, consistency, n, flowRate);
    const meanVelocity = flowRate / (Math.PI * radius * radius);
    const wallShearRate = powerLawWallShearRate(radius, n, flowRate);
    const wallShearStress = (pressureDrop * radius) / (2 * length);
    const warnings: CalculatorWarning[] = [];
    if (n < 0.1 || n > 1.5) {
      warnings.push(warning('power-law-index', `Flow index n = ${fmt(n, 3)} is outside the usual 0.1 to 1.5; check the fit, as the power law is unlikely to describe this fluid.`));
    }
    if (n < STRONGLY_SHEAR_THINNING) {
      warnings.push(
        warning(
          'fit-range',
          `Strongly shear-thinning (n = ${fmt(n, 3)}): flow changes very steeply with pressure. Check that the wall shear rate of ` +
            `${fmt(wallShearRate)} 1/s lies inside the shear-rate range K and n were fitted on.`,
        ),
      );
    }
    let reynolds: number | undefined;
    if (density === undefined) {
      warnings.push(noDensityWarning);
    } else {
      reynolds = metznerReedReynolds(density, meanVelocity, diameter, consistency, n);
      warnings.push(...laminarWarnings({ reynolds, diameter, length, density, meanVelocity, pressureDrop, model: 'power-law' }));
    }
    return {
      outputs: {
        flowRate,
        pressureDrop,
        meanVelocity,
        wallShearRate,
        wallShearStress,
        // η = τ/γ̇ is 0/0 at zero flow; leave it out rather than report NaN.
        wallViscosity: wallShearRate > 0 ? wallShearStress / wallShearRate : undefined,
        reynolds,
      },
      warnings,
    };
  },
};
