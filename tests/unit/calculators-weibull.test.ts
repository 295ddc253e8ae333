// Weibull fits (calculators.md §10): NIST/SEMATECH maximum-likelihood example, median-rank regression
// with Johnson adjusted ranks, and cross-checks against @stdlib and simple-statistics.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { linearRegression } from 'simple-statistics';
import weibullQuantileStdlib from '@stdlib/stats-base-dists-weibull-quantile';
import weibullCdfStdlib from '@stdlib/stats-base-dists-weibull-cdf';
import { runCalculator } from '@/shared/calculators';
import {
  benardMedianRank,
  conditionalReliability,
  johnsonAdjustedRanks,
  weibullLogLikelihood,
  weibullMean,
  weibullMle,
  weibullMrr,
  weibullQuantile,
  weibullReliability,
  weibullStdDev,
} from '@/shared/calculators/weibull';
import { CalculatorInputError } from '@/shared/calculators/types';
import { expectRel, expectPrinted, out, catchError } from '../helpers/calc';

const PHYSICS = 1e-6;
const FITTED = 1e-4;

// NIST/SEMATECH e-Handbook §8.4.1.3: 20 units, 10 failures, 10 suspended at 500 h [checked]
const NIST_FAILURES = [54, 187, 216, 240, 244, 335, 361, 373, 375, 386];
const NIST_SUSPENSIONS = Array<number>(10).fill(500);
const NIST = { shape: 1.7208, scale: 606.528 };
// Kececioglu, Reliability Engineering Handbook vol. 1 (1991), seen in a secondary source [memory]
const COMPLETE = [16, 34, 53, 75, 93, 120];

describe('weibull: NIST/SEMATECH e-Handbook §8.4.1.3 maximum-likelihood example [checked]', () => {
  it('when the 10 failures and 10 suspensions are fitted by MLE, then β = 1.7208 and η = 606.5280 (scipy: 1.720797, 606.5276)', () => {
    const fit = weibullMle(NIST_FAILURES, NIST_SUSPENSIONS);
    expectRel(fit.shape, 1.7208, FITTED);
    expectRel(fit.scale, 606.528, FITTED);
    expectPrinted(fit.shape, '1.7208');
    // scipy weibull_min.fit with CensoredData [derived]: the bisection is far tighter than 1e-4.
    expectRel(fit.shape, 1.720797, PHYSICS);
    expectRel(fit.scale, 606.5276, PHYSICS);
  });

  it('when the fit is scored, then the log-likelihood is −75.135 (scipy −75.13462), mean 540.737 h, SD 323.806 h', () => {
    const fit = weibullMle(NIST_FAILURES, NIST_SUSPENSIONS);
    expectPrinted(weibullLogLikelihood(NIST_FAILURES, NIST_SUSPENSIONS, fit.shape, fit.scale), '-75.135');
    expectRel(weibullLogLikelihood(NIST_FAILURES, NIST_SUSPENSIONS, fit.shape, fit.scale), -75.13462, PHYSICS);
    expectPrinted(weibullMean(fit.shape, fit.scale), '540.737');
    expectPrinted(weibullStdDev(fit.shape, fit.scale), '323.806');
  });

  it('when the published parameters are used, then B10 = 164.023 h, B1 = 41.867 h and the median is 490.174 h', () => {
    // derived from the published parameters
    expectPrinted(weibullQuantile(0.1, NIST.shape, NIST.scale), '164.023');
    expectPrinted(weibullQuantile(0.01, NIST.shape, NIST.scale), '41.867');
    expectPrinted(weibullQuantile(0.5, NIST.shape, NIST.scale), '490.174');
  });

  it('when reliability is asked for, then R(100) = 0.956031, R(500) = 0.488103 and R(600 | survived 500) = 0.767726', () => {
    // derived from the published parameters
    expectPrinted(weibullReliability(100, NIST.shape, NIST.scale), '0.956031');
    expectPrinted(weibullReliability(500, NIST.shape, NIST.scale), '0.488103');
    expectPrinted(conditionalReliability(600, 500, NIST.shape, NIST.scale), '0.767726');
  });

  it('when @stdlib evaluates the quantile and cdf, then they match ours (164.02289963360573 and 0.9560313727438001)', () => {
    // calculators.md §10 npm cross-check: @stdlib/stats-base-dists-weibull-* (verified)
    expectRel(weibullQuantileStdlib(0.1, NIST.shape, NIST.scale), 164.02289963360573, 1e-12);
    expectRel(weibullQuantile(0.1, NIST.shape, NIST.scale), weibullQuantileStdlib(0.1, NIST.shape, NIST.scale), 1e-12);
    expectRel(1 - weibullCdfStdlib(100, NIST.shape, NIST.scale), 0.9560313727438001, 1e-12);
    expectRel(weibullReliability(100, NIST.shape, NIST.scale), 1 - weibullCdfStdlib(100, NIST.shape, NIST.scale), 1e-12);
  });

  it('when the example is run through the calculator with an age of 100 h, then hours in, hours out, and R ≈ 0.956', () => {
    const r = runCalculator('weibull', {
      inputs: { failures: { values: NIST_FAILURES, unit: 'h' }, suspensions: { values: NIST_SUSPENSIONS, unit: 'h' }, age: { value: 100, unit: 'h' } },
    });
    expectRel(out(r, 'shape', '1'), 1.720797, FITTED);
    expectRel(out(r, 'scale', 'h'), 606.5276, FITTED);
    expectRel(out(r, 'b10', 'h'), 164.023, FITTED);
    expectRel(out(r, 'reliabilityAtAge', '1'), 0.956031, FITTED);
    expect(out(r, 'failureCount')).toBe(10);
    expect(r.warnings).toEqual([]);
  });
});

describe('weibull: median-rank regression on the NIST data (Check 1b [derived])', () => {
  it('when all suspensions follow the last failure, then the adjusted ranks are 1…10 and F runs 0.034314 to 0.475490', () => {
    // Johnson (1964) [memory]; Benard & Bos-Levenbach (1953) [memory]
    const ranks = johnsonAdjustedRanks(NIST_FAILURES, NIST_SUSPENSIONS).map((p) => p.rank);
    ranks.forEach((rank, i) => expectRel(rank, i + 1, 1e-12));
    expectPrinted(benardMedianRank(1, 20), '0.034314');
    expectPrinted(benardMedianRank(10, 20), '0.475490');
  });

  it('when regressed x on y, then β = 1.625963, η = 601.9599 and B10 = 150.832', () => {
    const fit = weibullMrr(NIST_FAILURES, NIST_SUSPENSIONS);
    expectRel(fit.shape, 1.625963, FITTED);
    expectRel(fit.scale, 601.9599, FITTED);
    expectPrinted(weibullQuantile(0.1, fit.shape, fit.scale), '150.832');
    const r = runCalculator('weibull', {
      inputs: { failures: { values: NIST_FAILURES, unit: 'h' }, suspensions: { values: NIST_SUSPENSIONS, unit: 'h' }, method: 'mrr' },
    });
    expectRel(out(r, 'shape'), 1.625963, FITTED);
    expect(r.outputs.reliabilityAtAge).toBeUndefined();
  });

  it('when regressed y on x, then β = 1.457519, η = 667.3364 and r² = 0.8964', () => {
    const fit = weibullMrr(NIST_FAILURES, NIST_SUSPENSIONS, 'y-on-x');
    expectRel(fit.shape, 1.457519, FITTED);
    expectRel(fit.scale, 667.3364, FITTED);
    expectPrinted(fit.rSquared, '0.8964');
  });
});

describe('weibull: complete data, Kececioglu set (Check 2 [memory]; values derived)', () => {
  it('when six complete failures are ranked, then F = 0.109375 … 0.890625', () => {
    // These six happen to be exact in binary-friendly decimals, so a tight tolerance applies.
    const expected = [0.109375, 0.265625, 0.421875, 0.578125, 0.734375, 0.890625];
    johnsonAdjustedRanks(COMPLETE).forEach((p, i) => expectRel(benardMedianRank(p.rank, 6), expected[i], 1e-12));
  });

  it('when regressed x on y, then β = 1.439663, η = 76.10960 h, R(15 h) = 0.908008, B10 = 15.944 h', () => {
    const r = runCalculator('weibull', { inputs: { failures: { values: COMPLETE, unit: 'h' }, method: 'mrr', age: { value: 15, unit: 'h' } } });
    expectRel(out(r, 'shape'), 1.439663, FITTED);
    expectRel(out(r, 'scale', 'h'), 76.1096, FITTED);
    expectRel(out(r, 'reliabilityAtAge'), 0.908008, FITTED);
    expectPrinted(out(r, 'b10', 'h'), '15.944');
    // 15 h is below the first failure at 16 h.
    expect(r.warnings.map((w) => w.code)).toEqual(['extrapolation']);
  });

  it('when simple-statistics linearRegression fits ln t on y, then it gives β = 1.4396632767940565, η = 76.1095957909622', () => {
    // calculators.md §10 npm cross-check (verified)
    const points = COMPLETE.map((t, i) => [Math.log(-Math.log(1 - benardMedianRank(i + 1, 6))), Math.log(t)]);
    const line = linearRegression(points);
    expectRel(1 / line.m, 1.4396632767940565, 1e-12);
    expectRel(Math.exp(line.b), 76.1095957909622, 1e-12);
    const fit = weibullMrr(COMPLETE);
    expectRel(fit.shape, 1 / line.m, 1e-9);
    expectRel(fit.scale, Math.exp(line.b), 1e-9);
  });

  it('when regressed y on x, then β = 1.426967, η = 76.34542 h, r² = 0.99118', () => {
    const fit = weibullMrr(COMPLETE, [], 'y-on-x');
    expectRel(fit.shape, 1.426967, FITTED);
    expectRel(fit.scale, 76.34542, FITTED);
    expectPrinted(fit.rSquared, '0.99118');
  });

  it('when fitted by MLE, then β = 1.932678, η = 73.52604 h, R(15 h) = 0.954736, B10 = 22.949 h', () => {
    // scipy weibull_min.fit(d, floc=0) [derived]
    const r = runCalculator('weibull', { inputs: { failures: { values: COMPLETE, unit: 'h' }, age: { value: 15, unit: 'h' } } });
    expectRel(out(r, 'shape'), 1.932678, FITTED);
    expectRel(out(r, 'scale'), 73.52604, FITTED);
    expectRel(out(r, 'reliabilityAtAge'), 0.954736, FITTED);
    expectPrinted(out(r, 'b10'), '22.949');
  });

  it('when the graphical answer of the source is compared, then β ≈ 1.4 and η ≈ 76 h', () => {
    // Kececioglu, graphical answer [memory]
    const fit = weibullMrr(COMPLETE);
    expectPrinted(fit.shape, '1.4');
    expectPrinted(fit.scale, '76');
  });
});

describe('weibull: Johnson adjusted ranks with suspensions mixed in (Check 3 [derived])', () => {
  const failures = [150, 560, 800, 1720, 4210];
  const suspensions = [340, 1130, 2470];

  it('when 150F, 340S, 560F, 800F, 1130S, 1720F, 2470S, 4210F are ranked, then 1, 2.142857, 3.285714, 4.714286, 6.857143', () => {
    const ranks = johnsonAdjustedRanks(failures, suspensions).map((p) => p.rank);
    [1, 2.142857, 3.285714, 4.714286, 6.857143].forEach((expected, i) => expectRel(ranks[i], expected, PHYSICS));
    const F = ranks.map((rank) => benardMedianRank(rank, 8));
    ['0.083333', '0.219388', '0.355442', '0.525510', '0.780612'].forEach((printed, i) => expectPrinted(F[i], printed));
  });

  it('when every ordering consistent with the censoring is enumerated, then there are 56 and the mean order numbers equal the adjusted ranks', () => {
    // calculators.md §10 Check 3: brute-force enumeration [derived]
    const units = [...failures.map((t) => ({ t, failed: true })), ...suspensions.map((t) => ({ t, failed: false }))];
    const permutations = (items: number[]): number[][] =>
      items.length <= 1 ? [items] : items.flatMap((x, i) => permutations([...items.slice(0, i), ...items.slice(i + 1)]).map((rest) => [x, ...rest]));
    const consistent = permutations(units.map((_, i) => i)).filter((order) => {
      const position = new Map(order.map((unit, pos) => [unit, pos]));
      return units.every((a, i) =>
        units.every((b, j) => {
          // A failure before another failure keeps its order; a suspended unit fails after every earlier failure.
          if (a.failed && b.failed && a.t < b.t) return position.get(i)! < position.get(j)!;
          if (a.failed && !b.failed && a.t < b.t) return position.get(i)! < position.get(j)!;
          return true;
        }),
      );
    });
    expect(consistent.length).toBe(56);
    const expected = johnsonAdjustedRanks(failures, suspensions);
    failures.forEach((t, k) => {
      const index = units.findIndex((u) => u.failed && u.t === t);
      const meanOrder = consistent.reduce((s, order) => s + order.indexOf(index) + 1, 0) / consistent.length;
      expectRel(meanOrder, expected[k].rank, 1e-12);
    });
  });
});

describe('weibull: edge cases and warnings', () => {
  it('when only one failure is given, then both methods are refused on the failures field', () => {
    // calculators.md §10 edge case: one failure → refuse MRR, warn about MLE [derived]
    for (const method of ['mrr', 'mle']) {
      const error = catchError(() => runCalculator('weibull', { inputs: { failures: { values: [120], unit: 'h' }, suspensions: { values: [300, 300], unit: 'h' }, method } }));
      expect(error).toBeInstanceOf(CalculatorInputError);
      expect((error as CalculatorInputError).fields['inputs.failures']).toMatch(/at least two failures/);
    }
  });

  it('when all units are still running, then there is no estimate', () => {
    // calculators.md §10 edge case [derived]
    const error = catchError(() => runCalculator('weibull', { inputs: { failures: { values: [], unit: 'h' }, suspensions: { values: [300, 400], unit: 'h' } } }));
    expect((error as CalculatorInputError).fields['inputs.failures']).toMatch(/with none/);
  });

  it('when fewer than 5 failures are given, then the few-failures warning shows', () => {
    // calculators.md "Warnings" list: fewer than 5 failures [common practice]
    const r = runCalculator('weibull', { inputs: { failures: { values: [1.2e7, 3.4e7, 5.1e7], unit: 'cycles' } } });
    expect(r.warnings.map((w) => w.code)).toEqual(['few-failures']);
    expect(r.warnings[0].message).toMatch(/overstate/);
  });

  it('when ages are in cycles, then the scale and B10 come back in cycles', () => {
    // derived: the fit is unit-free
    const r = runCalculator('weibull', { inputs: { failures: { values: COMPLETE.map((t) => t * 1e6), unit: 'cycles' }, method: 'mrr' } });
    expectRel(out(r, 'scale', 'cycles'), 76.1096e6, FITTED);
    expectRel(out(r, 'b10', 'cycles'), 15.944e6, FITTED);
  });

  it('when ages and running units are in different kinds of unit, then the running units are refused', () => {
    // derived: hours and cycles cannot be mixed in one fit
    const error = catchError(() =>
      runCalculator('weibull', { inputs: { failures: { values: COMPLETE, unit: 'h' }, suspensions: { values: [1e6], unit: 'cycles' }, age: { value: 5, unit: 'cycles' } } }),
    );
    expect(Object.keys((error as CalculatorInputError).fields).sort()).toEqual(['inputs.age', 'inputs.suspensions']);
  });

  it('when all failures share one age and nothing runs longer, then the spread cannot be estimated', () => {
    // derived: the profile equation has no finite root
    const error = catchError(() => runCalculator('weibull', { inputs: { failures: { values: [100, 100, 100], unit: 'h' } } }));
    expect((error as CalculatorInputError).fields['inputs.failures']).toMatch(/all the same/);
  });

  it('when ages are rescaled, then β is unchanged and η scales with them (property)', () => {
    // derived: the Weibull model has no preferred time unit
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e9, noNaN: true }), (k) => {
        const base = weibullMle(NIST_FAILURES, NIST_SUSPENSIONS);
        const scaled = weibullMle(
          NIST_FAILURES.map((t) => t * k),
          NIST_SUSPENSIONS.map((t) => t * k),
        );
        return Math.abs(scaled.shape / base.shape - 1) < 1e-9 && Math.abs(scaled.scale / (base.scale * k) - 1) < 1e-9;
      }),
      { numRuns: 50 },
    );
  });

  it('when the MLE β is moved off the solution either way, then the log-likelihood drops', () => {
    // derived: the profile root is the likelihood maximum
    const fit = weibullMle(COMPLETE);
    const best = weibullLogLikelihood(COMPLETE, [], fit.shape, fit.scale);
    for (const [db, de] of [
      [0.01, 0],
      [-0.01, 0],
      [0, 0.5],
      [0, -0.5],
    ]) {
      expect(weibullLogLikelihood(COMPLETE, [], fit.shape + db, fit.scale + de)).toBeLessThan(best);
    }
  });
});
