// Flow area past a conical needle on a sharp-edged seat, and the lift beyond which the seat opening
// rather than the needle gap limits flow.
import { num, warning } from './helpers';
import type { Calculator, CalculatorWarning } from './types';

/** Exact frustum ("curtain") area A = π h sinθ (d − h sinθ cosθ); θ is the half-angle from the axis. */
export function curtainArea(seatDiameter: number, halfAngle: number, lift: number): number {
  const s = Math.sin(halfAngle);
  return Math.PI * lift * s * (seatDiameter - lift * s * Math.cos(halfAngle));
}

/** Small-lift approximation A ≈ π d h sinθ. */
export function curtainAreaApprox(seatDiameter: number, halfAngle: number, lift: number): number {
  return Math.PI * seatDiameter * lift * Math.sin(halfAngle);
}

/**
 * Exact crossover lift d [1 − √(1 − cosθ)] / (2 sinθ cosθ), written as d / (2 sinθ (1 + √(1 − cosθ)))
 * so that it stays exact at a flat poppet (θ = 90°, h* = d/4) instead of 0/0.
 */
export function crossoverLift(seatDiameter: number, halfAngle: number): number {
  return seatDiameter / (2 * Math.sin(halfAngle) * (1 + Math.sqrt(1 - Math.cos(halfAngle))));
}

export function crossoverLiftApprox(seatDiameter: number, halfAngle: number): number {
  return seatDiameter / (4 * Math.sin(halfAngle));
}

/** Lift at which the exact formula stops describing a real gap: d / (2 sinθ cosθ); infinite when flat. */
export function geometryLimit(seatDiameter: number, halfAngle: number): number {
  const c = Math.cos(halfAngle);
  // cos(π/2) is 6e-17 in floating point, not 0; a flat poppet has no limit.
  return c < 1e-12 ? Infinity : seatDiameter / (2 * Math.sin(halfAngle) * c);
}

export const needleLift: Calculator = {
  id: 'needle-lift',
  title: 'Needle lift and flow area',
  summary: 'Works out the flow area a conical needle opens at a given lift and the lift beyond which more stroke adds no flow area.',
  inputs: [
    {
      name: 'seatDiameter',
      label: 'Seat diameter',
      kind: 'length',
      optional: false,
      defaultUnit: 'mm',
      min: 0,
      minExclusive: true,
      help: 'Diameter of the sharp seat edge the needle closes on.',
    },
    {
      name: 'coneIncludedAngle',
      label: 'Cone included angle',
      kind: 'angle',
      optional: false,
      defaultUnit: 'deg',
      default: 90,
      min: 0,
      minExclusive: true,
      max: Math.PI,
      help: 'Full angle of the needle cone tip; 180° is a flat poppet.',
    },
    {
      name: 'lift',
      label: 'Needle lift',
      kind: 'length',
      optional: false,
      defaultUnit: 'mm',
      min: 0,
      help: 'Stroke of the needle off the seat.',
    },
  ],
  outputs: [
    { name: 'curtainArea', label: 'Flow area at this lift', kind: 'area', unit: 'mm2' },
    { name: 'curtainAreaApprox', label: 'Flow area, small-lift formula', kind: 'area', unit: 'mm2' },
    { name: 'orificeArea', label: 'Seat opening area', kind: 'area', unit: 'mm2' },
    { name: 'crossoverLift', label: 'Crossover lift', kind: 'length', unit: 'mm' },
    { name: 'crossoverLiftApprox', label: 'Crossover lift, small-lift formula', kind: 'length', unit: 'mm' },
    { name: 'areaRatio', label: 'Flow area / seat area', kind: 'dimensionless', unit: '1' },
  ],
  formula: [
    'θ = included angle / 2 (from the needle axis); d = seat diameter; h = lift',
    'Flow area (frustum) A = π h sinθ (d − h sinθ cosθ), gap s = h sinθ;  small lift: A ≈ π d h sinθ',
    'Seat area Ao = π d² / 4',
    'Crossover lift (A = Ao): exact h* = d [1 − √(1 − cosθ)] / (2 sinθ cosθ);  approximate h* ≈ d / (4 sinθ)',
    'Flat poppet (θ = 90°): h* = d/4',
  ].join('\n'),
  limits: [
    'Valid while h < d / (2 sinθ cosθ).',
    'Geometric area only: real flow needs a discharge coefficient (about 0.6 to 0.8).',
    'For viscous adhesives the gap is a laminar channel where flow goes with gap³ / μ: equal area is not equal flow.',
    'The nozzle downstream is usually the real restriction.',
    'Conical needle on a sharp seat only: ball needles and chamfered seats need other formulas. Wear changes d.',
  ],
  references: [
    { text: 'Frustum area of the annular gap, same construction as low-lift poppet-valve area in Heywood, Internal Combustion Engine Fundamentals (1988) §6.3', tag: 'derived' },
    { text: 'Heywood, Internal Combustion Engine Fundamentals (1988) §6.3', tag: 'memory' },
    { text: 'Discharge coefficient about 0.6 to 0.8', tag: 'memory' },
  ],
  compute(inputs) {
    const d = num(inputs, 'seatDiameter');
    const theta = num(inputs, 'coneIncludedAngle') / 2;
    const h = num(inputs, 'lift');
    const exact = curtainArea(d, theta, h);
    const orifice = (Math.PI * d * d) / 4;
    const warnings: CalculatorWarning[] = [];
    if (h >= geometryLimit(d, theta)) {
      warnings.push(
        warning('outside-geometry', 'The lift is past the range of the flow-area formula (d / (2 sinθ cosθ)); the area shown is not meaningful. Flow is limited by the seat opening long before this.'),
      );
    }
    return {
      outputs: {
        curtainArea: exact,
        curtainAreaApprox: curtainAreaApprox(d, theta, h),
        orificeArea: orifice,
        crossoverLift: crossoverLift(d, theta),
        crossoverLiftApprox: crossoverLiftApprox(d, theta),
        areaRatio: exact / orifice,
      },
      warnings,
    };
  },
};
