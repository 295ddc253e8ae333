// Days until a valve wear part reaches its service interval, counted in cycles.
import { fmt, num, optNum, text, warning } from './helpers';
import type { Calculator, CalculatorWarning } from './types';

export type WearPart = 'seat' | 'needle' | 'seals';

/** Trade rules of thumb (carbide needle on a stainless seat); seals at about half the seat's interval. */
export const DEFAULT_THRESHOLDS: Record<WearPart, number> = {
  seat: 1e8,
  needle: 5e8,
  seals: 5e7,
};

export type ForecastStatus = 'ok' | 'overdue' | 'no-forecast';

export interface Forecast {
  cyclesPerDay: number;
  daysRemaining?: number;
  status: ForecastStatus;
}

/** Rate in cycles per second, running time per day in seconds, active fraction 0–1. */
export function serviceForecast(cycleRate: number, runSecondsPerDay: number, activeFraction: number, cyclesSoFar: number, threshold: number): Forecast {
  const cyclesPerDay = cycleRate * runSecondsPerDay * activeFraction;
  if (cyclesSoFar >= threshold) return { cyclesPerDay, daysRemaining: 0, status: 'overdue' };
  // With no cycles the date is not "infinitely far": there is simply nothing to forecast from.
  if (!(cyclesPerDay > 0)) return { cyclesPerDay, status: 'no-forecast' };
  return { cyclesPerDay, daysRemaining: (threshold - cyclesSoFar) / cyclesPerDay, status: 'ok' };
}

const DAY = 86400; // s

export const serviceForecastCalculator: Calculator = {
  id: 'service-forecast',
  title: 'Service forecast',
  summary: 'Works out how many days are left before a seat, needle or seal set reaches its service interval in cycles.',
  inputs: [
    {
      name: 'cycleRate',
      label: 'Cycle rate',
      kind: 'frequency',
      optional: false,
      defaultUnit: '1/min',
      min: 0,
      help: 'Valve cycles per minute (or per second for jetting) while the line runs.',
    },
    {
      name: 'hoursPerDay',
      label: 'Running hours per day',
      kind: 'time',
      optional: false,
      defaultUnit: 'h',
      min: 0,
      max: DAY,
      help: 'Hours the line runs each day.',
    },
    {
      name: 'activeFraction',
      label: 'Share of time dispensing',
      kind: 'dimensionless',
      optional: false,
      defaultUnit: '%',
      min: 0,
      max: 1,
      help: 'Part of the running time the valve is actually cycling.',
    },
    {
      name: 'cyclesSoFar',
      label: 'Cycles so far',
      kind: 'count',
      optional: false,
      defaultUnit: 'cycles',
      min: 0,
      help: 'Cycles counted since the part was last replaced.',
    },
    {
      name: 'part',
      label: 'Wear part',
      kind: 'choice',
      choices: [
        { value: 'seat', label: 'Seat' },
        { value: 'needle', label: 'Needle' },
        { value: 'seals', label: 'Seals (air-operated valve)' },
      ],
      optional: false,
      default: 'seat',
      help: 'Which part the forecast is for.',
    },
    {
      name: 'threshold',
      label: 'Service interval',
      kind: 'count',
      optional: true,
      defaultUnit: 'cycles',
      min: 0,
      minExclusive: true,
      help: 'Cycles between services. Left out: seat 100 million, needle 500 million, seals 50 million (rules of thumb).',
    },
  ],
  outputs: [
    { name: 'cyclesPerDay', label: 'Cycles per day', kind: 'count', unit: 'cycles' },
    { name: 'daysRemaining', label: 'Days remaining', kind: 'time', unit: 'd', optional: true },
    { name: 'status', label: 'Status', kind: 'verdict', values: ['ok', 'overdue', 'no-forecast'] },
  ],
  formula: [
    'Cycles per day N = cycle rate [per s] × 3600 × running hours per day × share of time dispensing',
    'Days remaining = (service interval − cycles so far) / N',
    'Overdue once cycles so far reach the interval; no forecast when N is 0.',
  ].join('\n'),
  limits: [
    'Default intervals are trade rules of thumb for a carbide-tipped needle on a stainless seat; abrasive fillers and reactive adhesives shorten life.',
    'Replace the defaults with your own fleet figures (Weibull calculator) once failure data exist.',
  ],
  references: [
    { text: 'Seat about 1×10⁸ cycles, needle about 5×10⁸; air-valve seals at about half the interval', tag: 'common practice' },
    { text: 'Cycle arithmetic', tag: 'derived' },
  ],
  compute(inputs) {
    const part = text(inputs, 'part') as WearPart;
    const given = optNum(inputs, 'threshold');
    const threshold = given ?? DEFAULT_THRESHOLDS[part];
    const forecast = serviceForecast(num(inputs, 'cycleRate'), num(inputs, 'hoursPerDay'), num(inputs, 'activeFraction'), num(inputs, 'cyclesSoFar'), threshold);
    const warnings: CalculatorWarning[] = [];
    if (given === undefined) {
      warnings.push(
        warning(
          'rule-of-thumb',
          `The service interval of ${fmt(threshold / 1e6, 3)} million cycles for the ${part} is a trade rule of thumb, not a maker's figure. Use your own figure when you have one.`,
        ),
      );
    }
    return {
      outputs: {
        cyclesPerDay: forecast.cyclesPerDay,
        daysRemaining: forecast.daysRemaining === undefined ? undefined : forecast.daysRemaining * DAY,
        status: forecast.status,
      },
      warnings,
    };
  },
};
