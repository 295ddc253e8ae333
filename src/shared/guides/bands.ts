// Numeric bands of a Measure step: which band a value falls in, and whether a set of bands covers
// every possible value exactly once. Shared by the validator, the editor and the walk runner.
import { formatNumber, unitLabel } from '../units';
import type { Band } from './schema';

/** The parts of a band that decide membership; labels and targets do not matter here. */
export type BandLimits = Pick<Band, 'id' | 'min' | 'max' | 'minInclusive' | 'maxInclusive'>;

export function bandContains(band: BandLimits, value: number): boolean {
  if (Number.isNaN(value)) return false;
  const aboveMin = band.min === null || value > band.min || (value === band.min && band.minInclusive);
  const belowMax = band.max === null || value < band.max || (value === band.max && band.maxInclusive);
  return aboveMin && belowMax;
}

/** The band a value (already in the band unit) falls in; the first match if bands overlap. */
export function bandFor<B extends BandLimits>(bands: readonly B[], valueInBandUnit: number): B | undefined {
  return bands.find((band) => bandContains(band, valueInBandUnit));
}

export interface BandProblem {
  code: 'band-empty' | 'bands-gap' | 'bands-overlap' | 'bands-open-below' | 'bands-open-above';
  message: string;
  /** Index of the band the problem is reported on, in the order given. */
  index: number;
  field?: 'min' | 'max';
}

// Values in messages carry the unit's label so the author sees them as typed in the form.
function show(value: number, unit: string): string {
  const label = unit ? unitLabel(unit) : '';
  return `${formatNumber(value)}${label ? ` ${label}` : ''}`;
}

function isEmpty(band: BandLimits): boolean {
  if (band.min === null || band.max === null) return false;
  if (band.min > band.max) return true;
  return band.min === band.max && !(band.minInclusive && band.maxInclusive);
}

interface Edge {
  value: number | null;
  inclusive: boolean;
  index: number;
}

// Of two upper ends, the one that reaches further (null is +∞; an included end beats an excluded one).
function further(a: Edge, b: Edge): Edge {
  if (a.value === null) return a;
  if (b.value === null) return b;
  if (b.value > a.value) return b;
  if (b.value === a.value && b.inclusive && !a.inclusive) return b;
  return a;
}

/**
 * Checks that the bands cover the whole real line with no gap and no overlap. Bands are swept in
 * order of their lower limit against the furthest upper limit seen so far, so a band hidden inside
 * another is caught as well as a neighbour that runs too far.
 */
export function bandProblems(bands: readonly BandLimits[], unit: string): BandProblem[] {
  const problems: BandProblem[] = [];
  const name = (index: number) => `'${bands[index].id}'`;
  const usable: number[] = [];
  bands.forEach((band, index) => {
    if (isEmpty(band)) {
      problems.push({
        code: 'band-empty',
        index,
        field: 'max',
        message: `Band ${name(index)} contains no value: its upper limit ${show(band.max as number, unit)} is not above its lower limit ${show(band.min as number, unit)}`,
      });
    } else {
      usable.push(index);
    }
  });
  if (usable.length === 0) return problems;

  const lowKey = (index: number) => bands[index].min ?? -Infinity;
  usable.sort((a, b) => {
    const diff = lowKey(a) - lowKey(b);
    if (diff !== 0 && !Number.isNaN(diff)) return diff;
    // Same lower limit: the band that includes it comes first, so the other one reads as the overlap.
    return Number(!bands[a].minInclusive) - Number(!bands[b].minInclusive) || a - b;
  });

  const first = bands[usable[0]];
  if (first.min !== null) {
    problems.push({
      code: 'bands-open-below',
      index: usable[0],
      field: 'min',
      message: `Readings ${first.minInclusive ? 'below' : 'up to and including'} ${show(first.min, unit)} fall in no band: the lowest band ${name(usable[0])} must have no lower limit`,
    });
  }

  let reach: Edge = { value: first.max, inclusive: first.maxInclusive, index: usable[0] };
  for (const index of usable.slice(1)) {
    const band = bands[index];
    const pair = `bands ${name(reach.index)} and ${name(index)}`;
    if (reach.value === null) {
      problems.push({
        code: 'bands-overlap',
        index,
        field: 'min',
        message: `Overlap between ${pair}: ${name(reach.index)} has no upper limit, so it already covers ${name(index)}`,
      });
    } else if (band.min === null) {
      problems.push({
        code: 'bands-overlap',
        index,
        field: 'min',
        message: `Overlap between ${pair}: both have no lower limit`,
      });
    } else if (band.min > reach.value) {
      problems.push({
        code: 'bands-gap',
        index,
        field: 'min',
        message: `Gap between ${pair}: readings between ${show(reach.value, unit)} and ${show(band.min, unit)} fall in no band`,
      });
    } else if (band.min === reach.value && !band.minInclusive && !reach.inclusive) {
      problems.push({
        code: 'bands-gap',
        index,
        field: 'min',
        message: `Gap between ${pair}: a reading of exactly ${show(band.min, unit)} falls in no band; include it in one of them`,
      });
    } else if (band.min === reach.value && band.minInclusive && reach.inclusive) {
      problems.push({
        code: 'bands-overlap',
        index,
        field: 'min',
        message: `Overlap between ${pair}: a reading of exactly ${show(band.min, unit)} falls in both; exclude it from one of them`,
      });
    } else if (band.min < reach.value) {
      const upTo = band.max === null ? reach.value : Math.min(reach.value, band.max);
      problems.push({
        code: 'bands-overlap',
        index,
        field: 'min',
        message: `Overlap between ${pair}: readings from ${show(band.min, unit)} to ${show(upTo, unit)} fall in both`,
      });
    }
    reach = further(reach, { value: band.max, inclusive: band.maxInclusive, index });
  }

  if (reach.value !== null) {
    problems.push({
      code: 'bands-open-above',
      index: reach.index,
      field: 'max',
      message: `Readings ${reach.inclusive ? 'above' : 'of'} ${show(reach.value, unit)}${reach.inclusive ? '' : ' and above'} fall in no band: the highest band ${name(reach.index)} must have no upper limit`,
    });
  }
  return problems;
}

/** "25.9 ≤ x < 31.7 Ω": how the editor and the runner print a band's range. */
export function describeBand(band: BandLimits, unit: string): string {
  const label = unit ? unitLabel(unit) : '';
  const suffix = label ? ` ${label}` : '';
  const low = band.min === null ? '' : `${formatNumber(band.min)} ${band.minInclusive ? '≤' : '<'} `;
  const high = band.max === null ? '' : ` ${band.maxInclusive ? '≤' : '<'} ${formatNumber(band.max)}`;
  if (band.min === null && band.max === null) return 'any value';
  return `${low}x${high}${suffix}`;
}
