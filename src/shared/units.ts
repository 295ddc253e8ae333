// Quantity kinds and unit spellings shared by the calculators, the API and the UI, with exact
// SI factors (NIST SP 811 definitions) so a value converts the same way everywhere.
import { CalculatorInputError } from './calculators/types';

export type QuantityKind =
  | 'pressure'
  | 'viscosity'
  | 'consistency'
  | 'length'
  | 'area'
  | 'volume'
  | 'flowRate'
  | 'mass'
  | 'massPerLength'
  | 'massRate'
  | 'density'
  | 'temperature'
  | 'temperatureDifference'
  | 'force'
  | 'springRate'
  | 'time'
  | 'speed'
  | 'frequency'
  | 'shearRate'
  | 'energyPerMole'
  | 'resistance'
  | 'voltage'
  | 'current'
  | 'power'
  | 'angle'
  | 'count'
  | 'dimensionless';

export type UnitSystem = 'metric' | 'imperial';

/**
 * One spelling of a unit. SI value = (value + offset) × factor; the offset is in the unit itself
 * so that Fahrenheit stays exact: K = (°F + 459.67) × 5/9.
 */
export interface UnitSpec {
  unit: string;
  label: string;
  factor: number;
  offset: number;
  imperial: boolean;
}

// Exact definitions: the international pound and inch (1959) and standard gravity.
const POUND = 0.45359237; // kg
const STANDARD_GRAVITY = 9.80665; // m/s²
const INCH = 0.0254; // m
const POUND_FORCE = POUND * STANDARD_GRAVITY; // N
const PSI = POUND_FORCE / (INCH * INCH); // Pa, 6894.757293168361
const CUBIC_INCH = INCH * INCH * INCH; // m³
const US_FLUID_OUNCE = (231 * CUBIC_INCH) / 128; // m³ (US gallon = 231 in³)

function u(unit: string, label: string, factor: number, extra: { offset?: number; imperial?: boolean } = {}): UnitSpec {
  return { unit, label, factor, offset: extra.offset ?? 0, imperial: extra.imperial ?? false };
}
const imp = { imperial: true };

const TEMPERATURE_UNITS: readonly UnitSpec[] = [u('degC', '°C', 1, { offset: 273.15 }), u('degF', '°F', 5 / 9, { offset: 459.67, imperial: true }), u('K', 'K', 1)];

// A temperature step has no zero point to shift, so only the degree size matters.
const TEMPERATURE_DIFFERENCE_UNITS: readonly UnitSpec[] = [u('degC', '°C', 1), u('degF', '°F', 5 / 9, imp), u('K', 'K', 1)];

/** Units per kind; the first spelling is the default output unit of that kind. */
export const UNITS: Readonly<Record<QuantityKind, readonly UnitSpec[]>> = {
  pressure: [u('Pa', 'Pa', 1), u('kPa', 'kPa', 1e3), u('MPa', 'MPa', 1e6), u('bar', 'bar', 1e5), u('psi', 'psi', PSI, imp)],
  viscosity: [u('Pa.s', 'Pa·s', 1), u('mPa.s', 'mPa·s', 1e-3), u('cP', 'cP', 1e-3), u('P', 'P (poise)', 0.1)],
  consistency: [u('Pa.s^n', 'Pa·sⁿ', 1)],
  length: [
    u('mm', 'mm', 1e-3),
    u('m', 'm', 1),
    u('um', 'µm', 1e-6),
    u('in', 'in', INCH, imp),
    // "mil" can mean thou or millimetre on the shop floor, so the label spells it out.
    u('thou', 'thou (0.001 in)', INCH / 1000, imp),
  ],
  area: [u('mm2', 'mm²', 1e-6), u('m2', 'm²', 1), u('in2', 'in²', INCH * INCH, imp)],
  volume: [
    u('mL', 'mL', 1e-6),
    u('m3', 'm³', 1),
    u('L', 'L', 1e-3),
    u('uL', 'µL', 1e-9),
    u('mm3', 'mm³', 1e-9),
    u('cm3', 'cm³', 1e-6),
    u('in3', 'in³', CUBIC_INCH, imp),
    u('floz', 'US fl oz', US_FLUID_OUNCE, imp),
  ],
  flowRate: [u('mL/s', 'mL/s', 1e-6), u('m3/s', 'm³/s', 1), u('uL/s', 'µL/s', 1e-9), u('mL/min', 'mL/min', 1e-6 / 60), u('L/min', 'L/min', 1e-3 / 60)],
  mass: [u('g', 'g', 1e-3), u('kg', 'kg', 1), u('mg', 'mg', 1e-6), u('lb', 'lb', POUND, imp), u('oz', 'oz', POUND / 16, imp)],
  massPerLength: [u('g/m', 'g/m', 1e-3), u('kg/m', 'kg/m', 1)],
  massRate: [u('g/h', 'g/h', 1e-3 / 3600), u('kg/h', 'kg/h', 1 / 3600), u('lb/h', 'lb/h', POUND / 3600, imp)],
  density: [u('g/cm3', 'g/cm³', 1000), u('kg/m3', 'kg/m³', 1)],
  temperature: TEMPERATURE_UNITS,
  temperatureDifference: TEMPERATURE_DIFFERENCE_UNITS,
  force: [u('N', 'N', 1), u('lbf', 'lbf', POUND_FORCE, imp)],
  springRate: [u('N/mm', 'N/mm', 1000), u('lbf/in', 'lbf/in', POUND_FORCE / INCH, imp)],
  time: [u('s', 's', 1), u('ms', 'ms', 1e-3), u('min', 'min', 60), u('h', 'h', 3600), u('d', 'd', 86400)],
  speed: [u('mm/s', 'mm/s', 1e-3), u('m/s', 'm/s', 1), u('m/min', 'm/min', 1 / 60), u('ft/min', 'ft/min', (12 * INCH) / 60, imp)],
  frequency: [u('1/min', 'per min', 1 / 60), u('1/s', 'per s', 1), u('Hz', 'Hz', 1)],
  shearRate: [u('1/s', 's⁻¹', 1)],
  energyPerMole: [u('kJ/mol', 'kJ/mol', 1e3), u('J/mol', 'J/mol', 1)],
  resistance: [u('ohm', 'Ω', 1)],
  voltage: [u('V', 'V', 1)],
  current: [u('A', 'A', 1)],
  power: [u('W', 'W', 1)],
  angle: [u('deg', '°', Math.PI / 180), u('rad', 'rad', 1)],
  count: [u('cycles', 'cycles', 1)],
  // A pure number has no unit to show next to it.
  dimensionless: [u('1', '', 1), u('%', '%', 0.01)],
};

/** Plain words for each kind, used in messages and form headings. */
export const KIND_LABELS: Readonly<Record<QuantityKind, string>> = {
  pressure: 'pressure',
  viscosity: 'viscosity',
  consistency: 'consistency',
  length: 'length',
  area: 'area',
  volume: 'volume',
  flowRate: 'flow rate',
  mass: 'mass',
  massPerLength: 'mass per length',
  massRate: 'mass rate',
  density: 'density',
  temperature: 'temperature',
  temperatureDifference: 'temperature difference',
  force: 'force',
  springRate: 'spring rate',
  time: 'time',
  speed: 'speed',
  frequency: 'rate',
  shearRate: 'shear rate',
  energyPerMole: 'energy per mole',
  resistance: 'resistance',
  voltage: 'voltage',
  current: 'current',
  power: 'power',
  angle: 'angle',
  count: 'count',
  dimensionless: 'plain number',
};

export const QUANTITY_KINDS = Object.keys(UNITS) as QuantityKind[];

export function isQuantityKind(kind: string): kind is QuantityKind {
  return Object.prototype.hasOwnProperty.call(UNITS, kind);
}

/** Raised for a unit spelling that does not exist, or does not belong to the kind asked for. */
export class UnitError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UnitError';
  }
}

function findSpec(unit: string, kind: QuantityKind): UnitSpec | undefined {
  return UNITS[kind]?.find((spec) => spec.unit === unit);
}

function specOrThrow(unit: string, kind: QuantityKind): UnitSpec {
  const spec = findSpec(unit, kind);
  if (!spec) {
    if (!isQuantityKind(kind)) throw new UnitError(`Unknown quantity kind '${kind}'`);
    throw new UnitError(`'${unit}' is not a ${KIND_LABELS[kind]} unit: use ${unitList(kind)}`);
  }
  return spec;
}

/** Every kind a spelling belongs to, in table order (e.g. '1/s' is a rate and a shear rate). */
export function kindsOfUnit(unit: string): QuantityKind[] {
  return QUANTITY_KINDS.filter((kind) => findSpec(unit, kind) !== undefined);
}

/** The first kind a spelling belongs to; shared spellings resolve to the earlier kind in the table. */
export function kindOfUnit(unit: string): QuantityKind | undefined {
  return kindsOfUnit(unit)[0];
}

export function isUnitOf(unit: string, kind: QuantityKind): boolean {
  return findSpec(unit, kind) !== undefined;
}

/** Pure arithmetic: does not check the physical range (see assertAboveAbsoluteZero). */
export function toSI(value: number, unit: string, kind: QuantityKind): number {
  const spec = specOrThrow(unit, kind);
  return (value + spec.offset) * spec.factor;
}

export function fromSI(value: number, unit: string, kind: QuantityKind): number {
  const spec = specOrThrow(unit, kind);
  return value / spec.factor - spec.offset;
}

/** Converts between two spellings of one kind; a temperature below 0 K is refused. */
export function convert(value: number, from: string, to: string, kind: QuantityKind): number {
  const si = toSI(value, from, kind);
  if (kind === 'temperature') assertAboveAbsoluteZero(si, 'value', 'Value', from);
  return fromSI(si, to, kind);
}

/** Display label; pass the kind for spellings shared between kinds ('1/s' reads "per s" or "s⁻¹"). */
export function unitLabel(unit: string, kind?: QuantityKind): string {
  const k = kind && isUnitOf(unit, kind) ? kind : kindOfUnit(unit);
  return k ? specOrThrow(unit, k).label : unit;
}

/** Spellings of a kind with the user's system first; the relative table order is kept otherwise. */
export function unitsFor(kind: QuantityKind, system: UnitSystem): string[] {
  const specs = specOrKind(kind);
  const wantImperial = system === 'imperial';
  const first = specs.filter((spec) => spec.imperial === wantImperial);
  const rest = specs.filter((spec) => spec.imperial !== wantImperial);
  return [...first, ...rest].map((spec) => spec.unit);
}

function specOrKind(kind: QuantityKind): readonly UnitSpec[] {
  const specs = UNITS[kind];
  if (!specs) throw new UnitError(`Unknown quantity kind '${kind}'`);
  return specs;
}

/** "mm, m, um, in or thou": the spellings a user may type for a kind. */
export function unitList(kind: QuantityKind): string {
  const names = UNITS[kind].map((spec) => spec.unit);
  if (names.length === 1) return names[0];
  return `${names.slice(0, -1).join(', ')} or ${names[names.length - 1]}`;
}

/** Short number for messages: six significant figures, no trailing zeros. */
export function formatNumber(value: number): string {
  if (value === 0) return '0';
  return String(Number(value.toPrecision(6)));
}

/** A message when a thermodynamic temperature (in K) is below absolute zero, else undefined. */
export function absoluteZeroMessage(kelvin: number, label: string, unit = 'K'): string | undefined {
  if (kelvin >= 0) return undefined;
  const zero = kindsOfUnit(unit).includes('temperature') ? fromSI(0, unit, 'temperature') : 0;
  const shown = kindsOfUnit(unit).includes('temperature') ? unit : 'K';
  return `${label} is below absolute zero (${formatNumber(zero)} ${unitLabel(shown)})`;
}

/** Throws the calculators' field error for a temperature below 0 K. */
export function assertAboveAbsoluteZero(kelvin: number, field: string, label: string, unit = 'K'): void {
  const message = absoluteZeroMessage(kelvin, label, unit);
  if (message) throw new CalculatorInputError({ [`inputs.${field}`]: message });
}
