// Predicts viscosity at another temperature from two measured points (Andrade / Arrhenius form).
import { fmt, num, warning } from './helpers';
import type { Calculator, CalculatorWarning } from './types';

/** Molar gas constant, exact in the 2019 SI: N_A × k. */
export const GAS_CONSTANT = 8.314462618; // J/(mol·K)

export interface AndradeFit {
  /** Pre-factor A in the viscosity's units. */
  a: number;
  /** B in kelvin. */
  b: number;
}

/** μ = A exp(B/T) through two points; T in kelvin. */
export function andradeFit(t1: number, mu1: number, t2: number, mu2: number): AndradeFit {
  const b = Math.log(mu1 / mu2) / (1 / t1 - 1 / t2);
  return { a: mu1 * Math.exp(-b / t1), b };
}

export function andradeViscosity(fit: AndradeFit, t: number): number {
  return fit.a * Math.exp(fit.b / t);
}

/** Least-squares fit of ln μ against 1/T for three or more points. */
export function andradeFitLeastSquares(points: { t: number; mu: number }[]): AndradeFit {
  if (points.length < 2) throw new Error('An Andrade fit needs at least two points');
  const xs = points.map((p) => 1 / p.t);
  const ys = points.map((p) => Math.log(p.mu));
  const meanX = xs.reduce((s, x) => s + x, 0) / xs.length;
  const meanY = ys.reduce((s, y) => s + y, 0) / ys.length;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < xs.length; i++) {
    sxy += (xs[i] - meanX) * (ys[i] - meanY);
    sxx += (xs[i] - meanX) ** 2;
  }
  if (sxx === 0) throw new Error('An Andrade fit needs at least two different temperatures');
  const b = sxy / sxx;
  return { a: Math.exp(meanY - b * meanX), b };
}

const temperatureInput = (name: string, label: string, help: string) => ({
  name,
  label,
  kind: 'temperature' as const,
  optional: false,
  defaultUnit: 'degC',
  // 0 K itself would divide by zero in B/T.
  min: 0,
  minExclusive: true,
  help,
});

const viscosityInput = (name: string, label: string, help: string) => ({
  name,
  label,
  kind: 'viscosity' as const,
  optional: false,
  defaultUnit: 'cP',
  min: 0,
  minExclusive: true,
  help,
});

export const viscosityTemperature: Calculator = {
  id: 'viscosity-temperature',
  title: 'Viscosity at another temperature',
  summary: 'Fits viscosity against temperature through two measured points and predicts the viscosity at a third temperature.',
  inputs: [
    temperatureInput('temperature1', 'Temperature 1', 'Temperature of the first measurement.'),
    viscosityInput('viscosity1', 'Viscosity 1', 'Viscosity measured at temperature 1.'),
    temperatureInput('temperature2', 'Temperature 2', 'Temperature of the second measurement.'),
    viscosityInput('viscosity2', 'Viscosity 2', 'Viscosity measured at temperature 2, at the same shear rate.'),
    temperatureInput('temperature', 'Temperature wanted', 'Temperature to predict the viscosity at; best between the two points.'),
  ],
  outputs: [
    { name: 'viscosity', label: 'Predicted viscosity', kind: 'viscosity', unit: 'Pa.s' },
    { name: 'andradeB', label: 'Andrade B', kind: 'temperatureDifference', unit: 'K' },
    { name: 'activationEnergy', label: 'Apparent activation energy', kind: 'energyPerMole', unit: 'kJ/mol' },
  ],
  formula: [
    'μ = A exp(B / T), T in kelvin (the tool converts °C and °F first)',
    'B = ln(μ1 / μ2) / (1/T1 − 1/T2);  A = μ1 exp(−B / T1)',
    'μ = μ1 exp[B (1/T − 1/T1)]',
    'Apparent activation energy Ea = B R, R = 8.314462618 J/(mol·K)',
  ].join('\n'),
  limits: [
    'Results are good to several percent between the two points; extrapolation is poor.',
    'Fitting in °C instead of kelvin gives plausible-looking nonsense; the tool always fits in kelvin.',
    'Hot melts near their softening range follow WLF/VFT better.',
    'Compare viscosities measured at the same shear rate.',
    'With three or more points, use a least-squares fit of ln μ against 1/T.',
  ],
  references: [
    { text: "Perry's Chemical Engineers' Handbook, 9th ed., Table 2-135, water, saturated liquid", tag: 'checked' },
    { text: 'IAPWS R12-08 (Huber et al., J. Phys. Chem. Ref. Data 38 (2009) 101), the formulation behind the table (existence checked)', tag: 'checked' },
    { text: 'Two-point Andrade fit and its error against the water table', tag: 'derived' },
  ],
  check(inputs): Record<string, string> {
    const t1 = inputs.temperature1;
    const t2 = inputs.temperature2;
    if (typeof t1 === 'number' && typeof t2 === 'number' && t1 === t2) {
      return { temperature2: 'Temperature 2 must differ from temperature 1: two points at one temperature cannot give a slope' };
    }
    return {};
  },
  compute(inputs) {
    const t1 = num(inputs, 'temperature1');
    const mu1 = num(inputs, 'viscosity1');
    const t2 = num(inputs, 'temperature2');
    const mu2 = num(inputs, 'viscosity2');
    const t = num(inputs, 'temperature');
    const fit = andradeFit(t1, mu1, t2, mu2);
    const warnings: CalculatorWarning[] = [];
    if (t < Math.min(t1, t2) || t > Math.max(t1, t2)) {
      warnings.push(warning('extrapolation', 'The temperature wanted is outside the two measured temperatures, so this is an extrapolation: expect errors of several percent or more.'));
    }
    if (fit.b < 0) {
      warnings.push(
        warning(
          'viscosity-rises',
          `These points have viscosity rising with temperature (B = ${fmt(fit.b)} K). Check the readings: the material may be curing, or the two were measured at different shear rates.`,
        ),
      );
    }
    return {
      outputs: {
        viscosity: mu1 * Math.exp(fit.b * (1 / t - 1 / t1)),
        andradeB: fit.b,
        activationEnergy: fit.b * GAS_CONSTANT,
      },
      warnings,
    };
  },
};
