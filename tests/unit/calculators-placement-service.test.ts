// Placement drift (calculators.md §8) and cycle-count service forecast (§9).
import { describe, expect, it } from 'vitest';
import { all, create } from 'mathjs';
import { runCalculator } from '@/shared/calculators';
import { distanceCompensationError } from '@/shared/calculators/placement-drift';
import { DEFAULT_THRESHOLDS, serviceForecast } from '@/shared/calculators/service-forecast';
import { CalculatorInputError } from '@/shared/calculators/types';
import { expectRel, expectPrinted, q, out, catchError } from '../helpers/calc';

const PHYSICS = 1e-6;
const math = create(all, {});

describe('placement-drift (constant-speed kinematics [derived])', () => {
  const line = { lineSpeed: q(500, 'mm/s'), openDelay: q(8, 'ms'), closeDelay: q(12, 'ms') };

  it('when the line runs at 500 mm/s with 8 ms to open and 12 ms to close, then the start is 4.000 mm late and the tail 6.000 mm', () => {
    const r = runCalculator('placement-drift', { inputs: line });
    expectRel(out(r, 'startOffset', 'mm'), 4, PHYSICS);
    expectRel(out(r, 'tailLength', 'mm'), 6, PHYSICS);
    expectRel(out(r, 'advanceDistance', 'mm'), 4, PHYSICS);
    expect(r.outputs.placedLength).toBeUndefined();
  });

  it('when 30 m/min is entered instead of 500 mm/s, then the same offsets come out', () => {
    // derived: 30 m/min = 500 mm/s
    const r = runCalculator('placement-drift', { inputs: { ...line, lineSpeed: q(30, 'm/min') } });
    expectRel(out(r, 'startOffset'), 4, PHYSICS);
  });

  it('when a 100 mm bead is commanded, then it lands from 4.0 to 106.0 mm and is 102.0 mm long', () => {
    const r = runCalculator('placement-drift', { inputs: { ...line, commandedLength: q(100, 'mm') } });
    expectRel(out(r, 'placedLength', 'mm'), 102, PHYSICS);
    expectRel(out(r, 'startOffset') + out(r, 'placedLength'), 106, PHYSICS);
  });

  it('when the closing delay rises to 15 ms, then the tail becomes 7.500 mm, a shift of +1.500 mm', () => {
    const shifted = runCalculator('placement-drift', { inputs: { ...line, newCloseDelay: q(15, 'ms'), newOpenDelay: q(8, 'ms') } });
    expectRel(out(shifted, 'tailShift', 'mm'), 1.5, PHYSICS);
    expect(out(shifted, 'startShift')).toBe(0);
    const tired = runCalculator('placement-drift', { inputs: { ...line, closeDelay: q(15, 'ms') } });
    expectRel(out(tired, 'tailLength'), 7.5, PHYSICS);
  });

  it('when distance compensation is set at 500 mm/s and the line runs at 1000 mm/s, then the start is 4.000 mm off', () => {
    expectRel(distanceCompensationError(1, 0.5, 0.008) * 1000, 4, PHYSICS);
  });

  it('when the line is stopped, then there is no drift', () => {
    // calculators.md §8 edge case [derived]
    const r = runCalculator('placement-drift', { inputs: { ...line, lineSpeed: q(0, 'mm/s'), commandedLength: q(100, 'mm') } });
    expect(out(r, 'startOffset')).toBe(0);
    expect(out(r, 'tailLength')).toBe(0);
    expectRel(out(r, 'placedLength'), 100, PHYSICS);
  });

  it('when mathjs evaluates (0.5 m/s)·(8 ms), then 4 mm', () => {
    // calculators.md §8 npm cross-check: mathjs (verified)
    const fromMath = math.evaluate('(0.5 m/s)*(8 ms) to mm').toNumber('mm');
    expectRel(out(runCalculator('placement-drift', { inputs: line }), 'startOffset'), fromMath, 1e-12);
  });

  it('when a delay is negative, then it is refused', () => {
    // calculators.md §8: reject negative times [derived]
    const error = catchError(() => runCalculator('placement-drift', { inputs: { ...line, openDelay: q(-1, 'ms') } }));
    expect((error as CalculatorInputError).fields).toEqual({ 'inputs.openDelay': 'Opening delay must be at least 0 ms' });
  });
});

describe('service-forecast (rules of thumb [common practice]; arithmetic derived)', () => {
  const shift = { cycleRate: q(2, 'Hz'), hoursPerDay: q(16, 'h'), activeFraction: q(70, '%'), cyclesSoFar: q(0, 'cycles') };

  it('when a valve cycles at 2 Hz, 16 h a day, 70 % active, then 80 640 cycles a day and 1 240.079 days to the seat interval', () => {
    const r = runCalculator('service-forecast', { inputs: { ...shift, part: 'seat' } });
    expectRel(out(r, 'cyclesPerDay', 'cycles'), 80640, PHYSICS);
    expectRel(out(r, 'daysRemaining', 'd'), 1240.079, PHYSICS);
    expect(r.outputs.status).toBe('ok');
    // 3.397 years of 365 days.
    expectPrinted(out(r, 'daysRemaining') / 365, '3.397');
  });

  it('when the default interval is used, then the rule-of-thumb warning shows; with an interval entered, then not', () => {
    // calculators.md §9: default thresholds are [common practice]
    const r = runCalculator('service-forecast', { inputs: { ...shift, part: 'seat' } });
    expect(r.warnings.map((w) => w.code)).toEqual(['rule-of-thumb']);
    const own = runCalculator('service-forecast', { inputs: { ...shift, part: 'seat', threshold: q(1e8, 'cycles') } });
    expect(own.warnings).toEqual([]);
    expectRel(out(own, 'daysRemaining'), 1240.079, PHYSICS);
  });

  it('when the needle is forecast, then 6 200.397 days to 5e8 cycles', () => {
    const r = runCalculator('service-forecast', { inputs: { ...shift, part: 'needle' } });
    expectRel(out(r, 'daysRemaining'), 6200.397, PHYSICS);
  });

  it("when seals of an air valve are forecast, then their default interval is half the seat's", () => {
    // domain primer: seal service at roughly half the electric valve's seat interval [common practice]
    expect(DEFAULT_THRESHOLDS.seals).toBe(DEFAULT_THRESHOLDS.seat / 2);
    const r = runCalculator('service-forecast', { inputs: { ...shift, part: 'seals' } });
    expectRel(out(r, 'daysRemaining'), 1240.079 / 2, PHYSICS);
  });

  it('when 4e7 cycles are already used, then 744.048 days to the seat interval', () => {
    const r = runCalculator('service-forecast', { inputs: { ...shift, part: 'seat', cyclesSoFar: q(4e7, 'cycles') } });
    expectRel(out(r, 'daysRemaining'), 744.048, PHYSICS);
  });

  it('when jetting at 50 Hz, 24 h, 100 %, then 4 320 000 cycles a day and 23.148 days to 1e8', () => {
    const r = runCalculator('service-forecast', {
      inputs: { cycleRate: q(3000, '1/min'), hoursPerDay: q(24, 'h'), activeFraction: q(1, '1'), cyclesSoFar: q(0, 'cycles'), part: 'seat' },
    });
    expectRel(out(r, 'cyclesPerDay'), 4.32e6, PHYSICS);
    expectPrinted(out(r, 'daysRemaining'), '23.148');
  });

  it('when the valve is active 0 % of the time or 0 hours a day, then "no forecast" and no days figure (not Infinity or NaN)', () => {
    // calculators.md §9 edge case [derived]
    for (const inputs of [
      { ...shift, activeFraction: q(0, '%'), part: 'seat' },
      { ...shift, hoursPerDay: q(0, 'h'), part: 'seat' },
    ]) {
      const r = runCalculator('service-forecast', { inputs });
      expect(r.outputs.status).toBe('no-forecast');
      expect(r.outputs.daysRemaining).toBeUndefined();
      expect(out(r, 'cyclesPerDay')).toBe(0);
      expect(JSON.stringify(r)).not.toMatch(/Infinity|NaN|null/);
    }
  });

  it('when the cycles used reach the interval, then "overdue"', () => {
    // calculators.md §9 edge case [derived]
    const r = runCalculator('service-forecast', { inputs: { ...shift, part: 'seat', cyclesSoFar: q(1e8, 'cycles') } });
    expect(r.outputs.status).toBe('overdue');
    expect(serviceForecast(0, 0, 0, 2e8, 1e8).status).toBe('overdue');
  });

  it('when more than 24 running hours a day or more than 100 % active are entered, then they are refused', () => {
    // derived: a day has 24 hours
    const error = catchError(() => runCalculator('service-forecast', { inputs: { ...shift, hoursPerDay: q(25, 'h'), activeFraction: q(120, '%'), part: 'seat' } }));
    expect((error as CalculatorInputError).fields).toEqual({
      'inputs.hoursPerDay': 'Running hours per day must be at most 24 h',
      'inputs.activeFraction': 'Share of time dispensing must be at most 100 %',
    });
  });
});
