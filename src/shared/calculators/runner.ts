// Turns an API request into SI inputs for one calculator, checks every field, runs it and puts the
// outputs back into the units asked for. All field problems are collected before anything throws.
import { z } from 'zod';
import { KIND_LABELS, UNITS, absoluteZeroMessage, formatNumber, fromSI, isUnitOf, kindOfUnit, kindsOfUnit, toSI, unitLabel, type QuantityKind } from '../units';
import { CalculatorInputError, type Calculator, type CalculatorResponse, type ComputeContext, type ComputeInputs, type InputDeclaration, type OutputDeclaration, type QuantityValue } from './types';

export const QuantityInput = z.object({ value: z.number(), unit: z.string() });
export const ListInput = z.object({ values: z.array(z.number()), unit: z.string() });
export const InputValue = z.union([QuantityInput, z.string(), ListInput]);

/** Body of POST /api/calculators/:id. */
export const CalculatorRequest = z.object({
  inputs: z.record(z.string(), InputValue),
  outputUnits: z.record(z.string(), z.string()).optional(),
});
export type CalculatorRequestBody = z.infer<typeof CalculatorRequest>;

// Checked first on its own so that one bad input does not hide the problems of the others.
const RequestShell = z.object({
  inputs: z.record(z.string(), z.unknown()),
  outputUnits: z.record(z.string(), z.string()).optional(),
});

type Errors = Record<string, string>;

function lowerFirst(label: string): string {
  return label.charAt(0).toLowerCase() + label.slice(1);
}

function orList(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} or ${items[items.length - 1]}`;
}

function acceptedKinds(decl: InputDeclaration): QuantityKind[] {
  const main = decl.kind === 'list' ? decl.listKind : decl.kind;
  const kinds = main && main !== 'choice' && main !== 'any' && main !== 'unit' ? [main] : [];
  return [...kinds, ...(decl.otherKinds ?? [])];
}

function unitChoices(kinds: QuantityKind[]): string {
  return orList(kinds.flatMap((kind) => UNITS[kind].map((spec) => spec.unit)));
}

/** The kind a unit is read as for this input, or a message saying why it cannot be. */
function resolveKind(decl: InputDeclaration, unit: string): { kind: QuantityKind } | { error: string } {
  const name = lowerFirst(decl.label);
  if (decl.kind === 'any') {
    const kind = kindOfUnit(unit);
    return kind ? { kind } : { error: `Unknown unit '${unit}' for ${name}` };
  }
  const kinds = acceptedKinds(decl);
  const match = kinds.find((kind) => isUnitOf(unit, kind));
  if (match) return { kind: match };
  const elsewhere = kindOfUnit(unit);
  if (!elsewhere) return { error: `Unknown unit '${unit}' for ${name}: use ${unitChoices(kinds)}` };
  const wanted = orList(kinds.map((kind) => KIND_LABELS[kind]));
  return { error: `Unit '${unit}' is a ${KIND_LABELS[elsewhere]} unit; ${name} needs a ${wanted} unit: use ${unitChoices(kinds)}` };
}

function shown(si: number, unit: string, kind: QuantityKind): string {
  return `${formatNumber(fromSI(si, unit, kind))} ${unitLabel(unit, kind)}`.trim();
}

/** Range message for one SI value, worded in the unit the user typed. */
function rangeMessage(decl: InputDeclaration, si: number, unit: string, kind: QuantityKind, subject: string): string | undefined {
  if (kind === 'temperature') {
    const belowZero = absoluteZeroMessage(si, subject, unit);
    if (belowZero) return belowZero;
  }
  if (decl.min !== undefined) {
    if (decl.minExclusive ? si <= decl.min : si < decl.min) {
      return `${subject} must be ${decl.minExclusive ? 'greater than' : 'at least'} ${shown(decl.min, unit, kind)}`;
    }
  }
  if (decl.max !== undefined) {
    if (decl.maxExclusive ? si >= decl.max : si > decl.max) {
      return `${subject} must be ${decl.maxExclusive ? 'less than' : 'at most'} ${shown(decl.max, unit, kind)}`;
    }
  }
  return undefined;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

interface ReadState {
  si: ComputeInputs;
  context: ComputeContext;
  errors: Errors;
}

function readQuantity(decl: InputDeclaration, raw: unknown, state: ReadState): void {
  const key = `inputs.${decl.name}`;
  const parsed = QuantityInput.safeParse(raw);
  if (!parsed.success) {
    if (isRecord(raw) && typeof raw.value === 'number' && typeof raw.unit === 'string') {
      state.errors[key] = `${decl.label} must be a finite number`;
    } else {
      state.errors[key] = `${decl.label} must be given as a number and a unit, e.g. { "value": 1, "unit": "${decl.defaultUnit ?? 'mm'}" }`;
    }
    return;
  }
  const { value, unit } = parsed.data;
  const resolved = resolveKind(decl, unit);
  if ('error' in resolved) {
    state.errors[key] = resolved.error;
    return;
  }
  const { kind } = resolved;
  const si = toSI(value, unit, kind);
  const problem = rangeMessage(decl, si, unit, kind, decl.label);
  if (problem) {
    state.errors[key] = problem;
    return;
  }
  state.si[decl.name] = si;
  state.context.units[decl.name] = unit;
  state.context.kinds[decl.name] = kind;
}

function readList(decl: InputDeclaration, raw: unknown, state: ReadState): void {
  const key = `inputs.${decl.name}`;
  const parsed = ListInput.safeParse(raw);
  if (!parsed.success) {
    if (isRecord(raw) && Array.isArray(raw.values) && typeof raw.unit === 'string') {
      state.errors[key] = `${decl.label} must be a list of finite numbers`;
    } else {
      state.errors[key] = `${decl.label} must be given as a list of numbers and a unit, e.g. { "values": [120, 340], "unit": "${decl.defaultUnit ?? 'h'}" }`;
    }
    return;
  }
  const { values, unit } = parsed.data;
  const resolved = resolveKind(decl, unit);
  if ('error' in resolved) {
    state.errors[key] = resolved.error;
    return;
  }
  const { kind } = resolved;
  const siValues: number[] = [];
  for (const [index, value] of values.entries()) {
    const si = toSI(value, unit, kind);
    const problem = rangeMessage(decl, si, unit, kind, `${decl.label}: value ${index + 1} (${formatNumber(value)})`);
    if (problem) {
      state.errors[key] = problem;
      return;
    }
    siValues.push(si);
  }
  state.si[decl.name] = siValues;
  state.context.units[decl.name] = unit;
  state.context.kinds[decl.name] = kind;
}

function readChoice(decl: InputDeclaration, raw: unknown, state: ReadState): void {
  const values = (decl.choices ?? []).map((choice) => choice.value);
  if (typeof raw !== 'string' || !values.includes(raw)) {
    state.errors[`inputs.${decl.name}`] = `${decl.label} must be one of: ${values.join(', ')}`;
    return;
  }
  state.si[decl.name] = raw;
}

function readUnitName(decl: InputDeclaration, raw: unknown, state: ReadState): void {
  const kind = typeof raw === 'string' ? kindOfUnit(raw) : undefined;
  if (typeof raw !== 'string' || !kind) {
    state.errors[`inputs.${decl.name}`] = typeof raw === 'string' ? `Unknown unit '${raw}' for ${lowerFirst(decl.label)}` : `${decl.label} must be a unit spelling such as "mm"`;
    return;
  }
  state.si[decl.name] = raw;
  state.context.units[decl.name] = raw;
  state.context.kinds[decl.name] = kind;
}

function applyDefault(decl: InputDeclaration, state: ReadState): void {
  if (decl.default === undefined) return;
  if (typeof decl.default === 'string') {
    state.si[decl.name] = decl.default;
    return;
  }
  const kind = acceptedKinds(decl)[0];
  const unit = decl.defaultUnit ?? (kind ? UNITS[kind][0].unit : undefined);
  if (!kind || !unit) return;
  state.si[decl.name] = toSI(decl.default, unit, kind);
  state.context.units[decl.name] = unit;
  state.context.kinds[decl.name] = kind;
}

/** Kind and default unit of an output, following its input when it has unitFrom. */
function outputKindAndUnit(decl: OutputDeclaration, context: ComputeContext): { kind: QuantityKind; unit: string } | undefined {
  if (decl.kind === 'verdict') return undefined;
  if (decl.unitFrom && context.kinds[decl.unitFrom]) {
    return { kind: context.kinds[decl.unitFrom], unit: context.units[decl.unitFrom] };
  }
  if (decl.kind === 'any') return undefined;
  return { kind: decl.kind, unit: decl.unit ?? UNITS[decl.kind][0].unit };
}

/** Runs one calculator on an untrusted request body. Throws CalculatorInputError on bad input. */
export function runCalculatorRequest(calculator: Calculator, request: unknown): CalculatorResponse {
  const shell = RequestShell.safeParse(request);
  if (!shell.success) {
    const errors: Errors = {};
    for (const issue of shell.error.issues) {
      const [top, name] = issue.path.map(String);
      if (top === 'outputUnits' && name !== undefined) errors[`outputUnits.${name}`] = `The unit asked for output '${name}' must be a unit spelling`;
      else if (top === 'outputUnits') errors.outputUnits = 'Output units must map output names to unit spellings';
      else errors.inputs = 'The request needs "inputs": an object of named values';
    }
    throw new CalculatorInputError(errors);
  }
  const { inputs, outputUnits = {} } = shell.data;
  const state: ReadState = { si: {}, context: { units: {}, kinds: {}, given: Object.keys(inputs) }, errors: {} };
  const declared = new Map(calculator.inputs.map((decl) => [decl.name, decl]));

  for (const name of Object.keys(inputs)) {
    if (!declared.has(name)) {
      state.errors[`inputs.${name}`] = `Unknown input '${name}': this calculator takes ${orList(calculator.inputs.map((d) => d.name))}`;
    }
  }

  for (const decl of calculator.inputs) {
    const raw = inputs[decl.name];
    if (raw === undefined || raw === null) {
      if (!decl.optional) state.errors[`inputs.${decl.name}`] = `${decl.label} is required`;
      else applyDefault(decl, state);
      continue;
    }
    if (decl.kind === 'choice') readChoice(decl, raw, state);
    else if (decl.kind === 'list') readList(decl, raw, state);
    else if (decl.kind === 'unit') readUnitName(decl, raw, state);
    else readQuantity(decl, raw, state);
  }

  const outputs = new Map(calculator.outputs.map((decl) => [decl.name, decl]));
  for (const [name, unit] of Object.entries(outputUnits)) {
    const decl = outputs.get(name);
    const key = `outputUnits.${name}`;
    if (!decl) {
      state.errors[key] = `Unknown output '${name}': this calculator gives ${orList(calculator.outputs.map((d) => d.name))}`;
      continue;
    }
    if (decl.kind === 'verdict') {
      state.errors[key] = `${decl.label} is a verdict and has no unit`;
      continue;
    }
    const target = outputKindAndUnit(decl, state.context);
    // An output that follows a bad input is reported on that input already.
    if (!target) continue;
    if (!isUnitOf(unit, target.kind)) {
      const known = kindsOfUnit(unit).length > 0;
      const name = lowerFirst(decl.label);
      state.errors[key] = known
        ? `Unit '${unit}' cannot be used for ${name}, which is a ${KIND_LABELS[target.kind]}: use ${unitChoices([target.kind])}`
        : `Unknown unit '${unit}' for ${name}: use ${unitChoices([target.kind])}`;
    }
  }

  if (calculator.check) {
    const crossField = calculator.check(state.si, state.context);
    for (const [name, message] of Object.entries(crossField)) {
      const key = `inputs.${name}`;
      // The field's own problem is the more useful one to show.
      if (!(key in state.errors)) state.errors[key] = message;
    }
  }

  if (Object.keys(state.errors).length > 0) throw new CalculatorInputError(state.errors);

  const result = calculator.compute(state.si, state.context);
  const response: CalculatorResponse = { outputs: {}, warnings: result.warnings };
  for (const decl of calculator.outputs) {
    const value = result.outputs[decl.name];
    if (value === undefined || value === null) continue;
    if (typeof value === 'string') {
      response.outputs[decl.name] = value;
      continue;
    }
    if (!Number.isFinite(value)) continue;
    const target = outputKindAndUnit(decl, state.context);
    if (!target) continue;
    const unit = outputUnits[decl.name] ?? target.unit;
    const out: QuantityValue = { value: fromSI(value, unit, target.kind), unit };
    response.outputs[decl.name] = out;
  }
  return response;
}
