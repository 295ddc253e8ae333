// Weibull shape and scale from valve failure data (ages in hours or cycles, with units still running),
// by maximum likelihood or median-rank regression, then B10 life and reliability at an age.
import { list, optNum, text, warning } from './helpers';
import { CalculatorInputError, type Calculator, type CalculatorWarning } from './types';

export interface WeibullFit {
  shape: number;
  scale: number;
}

export function weibullReliability(age: number, shape: number, scale: number): number {
  return Math.exp(-((age / scale) ** shape));
}

/** Reliability over a further stretch for a unit that has already survived to `survived`. */
export function conditionalReliability(age: number, survived: number, shape: number, scale: number): number {
  return weibullReliability(age, shape, scale) / weibullReliability(survived, shape, scale);
}

/** B_p life: the age by which a fraction p has failed, η [−ln(1 − p)]^(1/β). */
export function weibullQuantile(p: number, shape: number, scale: number): number {
  return scale * (-Math.log(1 - p)) ** (1 / shape);
}

export function weibullLogLikelihood(failures: number[], suspensions: number[], shape: number, scale: number): number {
  let sum = 0;
  for (const t of failures) {
    const z = t / scale;
    sum += Math.log(shape / scale) + (shape - 1) * Math.log(z) - z ** shape;
  }
  for (const t of suspensions) sum -= (t / scale) ** shape;
  return sum;
}

// Lanczos approximation (g = 7, n = 9), good to about 1e-15 for the arguments used here.
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

export function gammaFunction(x: number): number {
  if (x < 0.5) return Math.PI / (Math.sin(Math.PI * x) * gammaFunction(1 - x));
  const z = x - 1;
  let a = LANCZOS[0];
  const t = z + 7.5;
  for (let i = 1; i < LANCZOS.length; i++) a += LANCZOS[i] / (z + i);
  return Math.sqrt(2 * Math.PI) * t ** (z + 0.5) * Math.exp(-t) * a;
}

export function weibullMean(shape: number, scale: number): number {
  return scale * gammaFunction(1 + 1 / shape);
}

export function weibullStdDev(shape: number, scale: number): number {
  const g1 = gammaFunction(1 + 1 / shape);
  return scale * Math.sqrt(gammaFunction(1 + 2 / shape) - g1 * g1);
}

export function benardMedianRank(rank: number, n: number): number {
  return (rank - 0.3) / (n + 0.4);
}

/**
 * Johnson adjusted ranks of the failures, in age order. n counts every unit; ties put failures
 * before suspensions, the usual convention.
 */
export function johnsonAdjustedRanks(failures: number[], suspensions: number[] = []): { age: number; rank: number }[] {
  const units = [...failures.map((age) => ({ age, failed: true })), ...suspensions.map((age) => ({ age, failed: false }))];
  units.sort((a, b) => a.age - b.age || Number(b.failed) - Number(a.failed));
  const n = units.length;
  const ranks: { age: number; rank: number }[] = [];
  let previous = 0;
  units.forEach((unit, index) => {
    if (!unit.failed) return;
    const reverseRank = n - index;
    previous = (reverseRank * previous + (n + 1)) / (reverseRank + 1);
    ranks.push({ age: unit.age, rank: previous });
  });
  return ranks;
}

export type MrrRegression = 'x-on-y' | 'y-on-x';

/** Median-rank regression on x = ln t, y = ln(−ln(1 − F)); the calculator uses x on y. */
export function weibullMrr(failures: number[], suspensions: number[] = [], regression: MrrRegression = 'x-on-y'): WeibullFit & { rSquared: number } {
  if (failures.length < 2) throw new Error('Median-rank regression needs at least two failures');
  const n = failures.length + suspensions.length;
  const points = johnsonAdjustedRanks(failures, suspensions).map(({ age, rank }) => ({
    x: Math.log(age),
    y: Math.log(-Math.log(1 - benardMedianRank(rank, n))),
  }));
  const meanX = points.reduce((s, p) => s + p.x, 0) / points.length;
  const meanY = points.reduce((s, p) => s + p.y, 0) / points.length;
  let sxx = 0;
  let syy = 0;
  let sxy = 0;
  for (const p of points) {
    sxx += (p.x - meanX) ** 2;
    syy += (p.y - meanY) ** 2;
    sxy += (p.x - meanX) * (p.y - meanY);
  }
  if (sxx === 0) throw new Error('All failures are at the same age');
  const rSquared = (sxy * sxy) / (sxx * syy);
  if (regression === 'x-on-y') {
    const slope = sxy / syy;
    return { shape: 1 / slope, scale: Math.exp(meanX - slope * meanY), rSquared };
  }
  const shape = sxy / sxx;
  const intercept = meanY - shape * meanX;
  return { shape, scale: Math.exp(-intercept / shape), rSquared };
}

/**
 * Maximum likelihood with right-censoring. Solves the profile equation
 * Σtᵝ ln t / Σtᵝ − 1/β − (1/r) Σ_fail ln t = 0 by bisection; its left side rises with β, so one
 * bracketed root is the estimate. Ages are divided by the largest so tᵝ cannot overflow.
 */
export function weibullMle(failures: number[], suspensions: number[] = []): WeibullFit {
  if (failures.length < 1) throw new Error('Maximum likelihood needs at least one failure');
  const all = [...failures, ...suspensions];
  const largest = Math.max(...all);
  const logAll = all.map((t) => Math.log(t / largest));
  const meanLogFailures = failures.reduce((s, t) => s + Math.log(t / largest), 0) / failures.length;
  const profile = (beta: number): number => {
    let weights = 0;
    let weighted = 0;
    for (const l of logAll) {
      const w = Math.exp(beta * l);
      weights += w;
      weighted += w * l;
    }
    return weighted / weights - 1 / beta - meanLogFailures;
  };
  let lo = 1;
  while (profile(lo) > 0 && lo > 1e-6) lo /= 2;
  let hi = 1;
  while (profile(hi) < 0 && hi < 1e6) hi *= 2;
  if (profile(lo) > 0 || profile(hi) < 0) throw new Error('No finite maximum-likelihood estimate for these ages');
  for (let i = 0; i < 200 && hi - lo > 1e-14 * hi; i++) {
    const mid = (lo + hi) / 2;
    if (profile(mid) < 0) lo = mid;
    else hi = mid;
  }
  const shape = (lo + hi) / 2;
  const sum = logAll.reduce((s, l) => s + Math.exp(shape * l), 0);
  return { shape, scale: largest * (sum / failures.length) ** (1 / shape) };
}

const ageKinds = { kind: 'list' as const, listKind: 'time' as const, otherKinds: ['count' as const], defaultUnit: 'h', min: 0, minExclusive: true };

export const weibull: Calculator = {
  id: 'weibull',
  title: 'Failure data (Weibull)',
  summary: 'Fits a Weibull life model to the ages at which valves or parts failed, and gives the B10 life and the reliability at an age.',
  inputs: [
    {
      name: 'failures',
      label: 'Failure ages',
      ...ageKinds,
      optional: false,
      help: 'Age of each failed unit, in hours or cycles. At least two are needed.',
    },
    {
      name: 'suspensions',
      label: 'Still running',
      ...ageKinds,
      optional: true,
      help: 'Age of each unit that has not failed yet (or was removed for another reason), in the same kind of unit.',
    },
    {
      name: 'age',
      label: 'Age for reliability',
      kind: 'time',
      otherKinds: ['count'],
      optional: true,
      defaultUnit: 'h',
      min: 0,
      help: 'Age at which to give the share of units still working.',
    },
    {
      name: 'method',
      label: 'Method',
      kind: 'choice',
      choices: [
        { value: 'mle', label: 'Maximum likelihood' },
        { value: 'mrr', label: 'Median-rank regression (ages on ranks)' },
      ],
      optional: true,
      default: 'mle',
      help: 'Maximum likelihood uses the running units fully; median-rank regression matches a probability plot.',
    },
  ],
  outputs: [
    { name: 'shape', label: 'Shape β', kind: 'dimensionless', unit: '1' },
    { name: 'scale', label: 'Scale η', kind: 'time', unit: 'h', unitFrom: 'failures' },
    { name: 'b10', label: 'B10 life', kind: 'time', unit: 'h', unitFrom: 'failures' },
    { name: 'reliabilityAtAge', label: 'Reliability at the age', kind: 'dimensionless', unit: '1', optional: true },
    { name: 'failureCount', label: 'Failures used', kind: 'dimensionless', unit: '1' },
  ],
  formula: [
    'R(t) = exp[−(t/η)^β];  F(t) = 1 − R(t);  B10 = η (−ln 0.9)^(1/β)',
    'Maximum likelihood with running units: solve Σtᵝ ln t / Σtᵝ − 1/β − (1/r) Σ_fail ln t = 0 for β (sums over all units, r failures) by bisection; η = (Σtᵝ / r)^(1/β)',
    "Median-rank regression: Johnson adjusted ranks, Benard's median ranks F = (rank − 0.3)/(n + 0.4), n counting all units;",
    'x = ln t, y = ln(−ln(1 − F)); regress x on y: β = 1/slope, η = e^intercept',
  ].join('\n'),
  limits: [
    'At least two failures are needed; results from fewer than about six are rough.',
    'Maximum likelihood overstates β for small samples.',
    'A bent probability plot suggests mixed failure modes: split the data by cause.',
    'Running units must genuinely still be running (or removed for another reason).',
    'Do not extrapolate far below the first failure.',
  ],
  references: [
    { text: 'NIST/SEMATECH e-Handbook of Statistical Methods, §8.4.1.3, Weibull maximum likelihood example', tag: 'checked' },
    { text: 'NIST/SEMATECH e-Handbook of Statistical Methods, §8.1.6.2, Weibull formulas', tag: 'memory' },
    { text: 'Benard & Bos-Levenbach, Statistica Neerlandica 7 (1953): median ranks', tag: 'memory' },
    { text: 'L.G. Johnson, The Statistical Treatment of Fatigue Experiments (1964): adjusted ranks', tag: 'memory' },
    { text: 'R.B. Abernethy, The New Weibull Handbook, 5th ed.', tag: 'memory' },
  ],
  check(inputs, context) {
    const errors: Record<string, string> = {};
    const failures = inputs.failures;
    if (Array.isArray(failures)) {
      if (failures.length < 2) {
        errors.failures =
          failures.length === 0
            ? 'Failure ages needs at least two failures: with none, there is nothing to estimate from'
            : 'Failure ages needs at least two failures: one failure cannot show how spread out the failures are';
      } else if (new Set(failures).size === 1) {
        // Maximum likelihood can still find a spread from units running past the common age.
        const runningLonger = list(inputs, 'suspensions').some((t) => t > failures[0]);
        if (inputs.method !== 'mle' || !runningLonger) {
          errors.failures = 'Failure ages are all the same, so their spread (the shape) cannot be estimated';
        }
      }
    }
    const kind = context.kinds.failures;
    for (const name of ['suspensions', 'age']) {
      if (kind && context.kinds[name] && context.kinds[name] !== kind) {
        errors[name] = `${name === 'age' ? 'Age for reliability' : 'Still running'} must be in ${kind === 'count' ? 'cycles' : 'time'}, like the failure ages`;
      }
    }
    return errors;
  },
  compute(inputs) {
    const failures = list(inputs, 'failures');
    const suspensions = list(inputs, 'suspensions');
    const method = text(inputs, 'method');
    let fit: WeibullFit;
    try {
      fit = method === 'mrr' ? weibullMrr(failures, suspensions) : weibullMle(failures, suspensions);
    } catch {
      throw new CalculatorInputError({ 'inputs.failures': 'These ages give no finite Weibull estimate: check the failure and running ages' });
    }
    const warnings: CalculatorWarning[] = [];
    if (failures.length < 5) {
      warnings.push(
        warning(
          'few-failures',
          `Only ${failures.length} failures: the estimate is rough${method === 'mle' ? ', and maximum likelihood tends to overstate the shape with so few' : ''}. Add failures as they happen.`,
        ),
      );
    }
    const age = optNum(inputs, 'age');
    if (age !== undefined && age < Math.min(...failures)) {
      warnings.push(warning('extrapolation', 'The age is below the first failure, so the reliability there is an extrapolation of the fitted model.'));
    }
    return {
      outputs: {
        shape: fit.shape,
        scale: fit.scale,
        b10: weibullQuantile(0.1, fit.shape, fit.scale),
        reliabilityAtAge: age === undefined ? undefined : weibullReliability(age, fit.shape, fit.scale),
        failureCount: failures.length,
      },
      warnings,
    };
  },
};
