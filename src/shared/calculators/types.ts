// Declaration types shared by every calculator, the request runner, the API and the forms,
// plus the two errors a calculator request can end in.
import type { QuantityKind } from '../units';

/** A quantity input, a fixed choice, a list of values, any quantity, or a unit spelling. */
export type InputKind = QuantityKind | 'choice' | 'list' | 'any' | 'unit';

/** A verdict is a string from a fixed set; 'any' takes its kind from the input named in unitFrom. */
export type OutputKind = QuantityKind | 'verdict' | 'any';

export interface Choice {
  value: string;
  label: string;
}

export interface InputDeclaration {
  name: string;
  label: string;
  kind: InputKind;
  /** Kind of each value of a 'list' input. */
  listKind?: QuantityKind;
  /** Further kinds whose units are accepted too (e.g. cycles as well as hours for ages). */
  otherKinds?: QuantityKind[];
  choices?: Choice[];
  optional: boolean;
  /** Unit a form should offer first; absent for choices. */
  defaultUnit?: string;
  /** Physical range in SI units (temperatures in K). */
  min?: number;
  max?: number;
  minExclusive?: boolean;
  maxExclusive?: boolean;
  /**
   * In defaultUnit (or a choice value). Used by the runner when an optional input is left out; for a
   * required input it is only a suggestion a form may prefill.
   */
  default?: number | string;
  help: string;
}

export interface OutputDeclaration {
  name: string;
  label: string;
  kind: OutputKind;
  /** Default unit of a quantity output; for unitFrom outputs, the unit used when that input is absent. */
  unit?: string;
  /** The output follows the kind and unit of this input (weibull ages, unit-convert's target). */
  unitFrom?: string;
  /** Possible strings of a verdict. */
  values?: string[];
  /** Left out of the response when it cannot be computed or needs an optional input. */
  optional?: boolean;
}

export type ReferenceTag = 'checked' | 'memory' | 'derived' | 'common practice';

export interface Reference {
  text: string;
  tag: ReferenceTag;
}

export type WarningCode =
  | 'turbulent'
  | 'transitional'
  | 'entrance-length'
  | 'entry-loss'
  | 'no-density'
  | 'power-law-index'
  | 'fit-range'
  | 'extrapolation'
  | 'viscosity-rises'
  | 'cannot-open'
  | 'low-margin'
  | 'few-failures'
  | 'outside-geometry'
  | 'ac-or-pwm'
  | 'rule-of-thumb';

export interface CalculatorWarning {
  code: WarningCode;
  message: string;
}

/** What GET /api/calculators lists: everything except the code. */
export interface CalculatorDeclaration {
  id: string;
  title: string;
  summary: string;
  inputs: InputDeclaration[];
  outputs: OutputDeclaration[];
  formula: string;
  limits: string[];
  references: Reference[];
}

/** Input values in SI as the runner hands them over: numbers, choice strings or lists. */
export type ComputeInputs = Record<string, number | string | number[] | undefined>;

export interface ComputeContext {
  /** The unit each quantity or list input was given in (or its default unit). */
  units: Record<string, string>;
  /** The kind each quantity or list input was read as. */
  kinds: Record<string, QuantityKind>;
  /** Names of the inputs present in the request, valid or not (defaults not included). */
  given: string[];
}

export interface ComputeResult {
  /** Outputs in SI (or verdict strings); undefined or null leaves the output out. */
  outputs: Record<string, number | string | null | undefined>;
  warnings: CalculatorWarning[];
}

export interface Calculator extends CalculatorDeclaration {
  /**
   * Cross-field checks run after each field passed its own checks. Receives only the fields that
   * passed; returns messages keyed by input name.
   */
  check?: (inputs: ComputeInputs, context: ComputeContext) => Record<string, string>;
  compute: (inputs: ComputeInputs, context: ComputeContext) => ComputeResult;
}

export interface QuantityValue {
  value: number;
  unit: string;
}

export interface CalculatorResponse {
  outputs: Record<string, QuantityValue | string>;
  warnings: CalculatorWarning[];
}

/** Bad input: every problem found, keyed by paths such as `inputs.innerDiameter`. */
export class CalculatorInputError extends Error {
  readonly fields: Record<string, string>;

  constructor(fields: Record<string, string>, message?: string) {
    super(message ?? (Object.values(fields).join('; ') || 'Invalid calculator input'));
    this.name = 'CalculatorInputError';
    this.fields = fields;
  }
}

export class UnknownCalculatorError extends Error {
  readonly id: string;

  constructor(id: string) {
    super(`Unknown calculator '${id}'`);
    this.name = 'UnknownCalculatorError';
    this.id = id;
  }
}
