// Calculator form state: what the user typed, turned into an API-shaped request, and back to and
// from a shareable query string ("width=3 mm&profile=round").
import type { CalculatorDeclaration, InputDeclaration } from '@/shared/calculators/types';
import { UNITS, kindOfUnit, unitsFor, type QuantityKind, type UnitSystem } from '@/shared/units';

export interface FieldState {
  text: string;
  unit: string;
}

export type FormState = Record<string, FieldState>;

export function inputKind(decl: InputDeclaration): QuantityKind | null {
  const k = decl.kind === 'list' ? decl.listKind : decl.kind;
  return k && k !== 'choice' && k !== 'unit' && k !== 'any' ? (k as QuantityKind) : null;
}

export function unitChoices(decl: InputDeclaration, system: UnitSystem): string[] {
  const kind = inputKind(decl);
  if (!kind) return [];
  const main = unitsFor(kind, system);
  const others = (decl.otherKinds ?? []).flatMap((k) => unitsFor(k, system));
  return [...main, ...others.filter((u) => !main.includes(u))];
}

function isImperial(unit: string, kind: QuantityKind) {
  return UNITS[kind].find((s) => s.unit === unit)?.imperial ?? false;
}

function startingUnit(decl: InputDeclaration, system: UnitSystem): string {
  const kind = inputKind(decl);
  if (!kind) return '';
  const units = unitChoices(decl, system);
  const declared = decl.defaultUnit;
  // The declared unit where it fits the user's system (or the kind has no unit of that system).
  if (declared && units.includes(declared)) {
    const hasSystemUnit = UNITS[kind].some((s) => s.imperial === (system === 'imperial'));
    if (!hasSystemUnit || isImperial(declared, kind) === (system === 'imperial')) return declared;
  }
  return units[0];
}

export function initialState(calc: CalculatorDeclaration, system: UnitSystem): FormState {
  const state: FormState = {};
  for (const d of calc.inputs) {
    if (d.kind === 'choice') state[d.name] = { text: String(d.default ?? d.choices?.[0]?.value ?? ''), unit: '' };
    else if (d.kind === 'unit') state[d.name] = { text: system === 'imperial' ? 'bar' : 'psi', unit: '' };
    else if (d.kind === 'any') state[d.name] = { text: '', unit: system === 'imperial' ? 'psi' : 'bar' };
    else state[d.name] = { text: '', unit: startingUnit(d, system) };
  }
  return state;
}

/** Parses "1,5" as 1.5 for people whose keyboards use a decimal comma. */
export function parseNumber(text: string): number {
  const t = text.trim();
  if (t === '') return NaN;
  return Number(/^-?\d+,\d+$/.test(t) ? t.replace(',', '.') : t);
}

export function parseList(text: string): number[] {
  return text
    .split(/[\s,;]+/)
    .filter(Boolean)
    .map((t) => Number(t));
}

export type RequestInputs = Record<string, { value: number; unit: string } | { values: number[]; unit: string } | string>;

/** Only filled-in fields go into the request; empty required ones are listed as missing. */
export function toRequest(calc: CalculatorDeclaration, state: FormState): { inputs: RequestInputs; missing: string[] } {
  const inputs: RequestInputs = {};
  const missing: string[] = [];
  for (const d of calc.inputs) {
    const f = state[d.name];
    if (!f || f.text.trim() === '') {
      if (!d.optional) missing.push(d.label);
      continue;
    }
    if (d.kind === 'choice' || d.kind === 'unit') inputs[d.name] = f.text;
    else if (d.kind === 'list') inputs[d.name] = { values: parseList(f.text), unit: f.unit };
    else inputs[d.name] = { value: parseNumber(f.text), unit: f.unit };
  }
  return { inputs, missing };
}

export function toSearch(calc: CalculatorDeclaration, state: FormState, outputUnits: Record<string, string>): URLSearchParams {
  const p = new URLSearchParams();
  for (const d of calc.inputs) {
    const f = state[d.name];
    if (!f || f.text.trim() === '') continue;
    p.set(d.name, d.kind === 'choice' || d.kind === 'unit' ? f.text : `${f.text.trim()} ${f.unit}`);
  }
  for (const [name, unit] of Object.entries(outputUnits)) p.set(`out.${name}`, unit);
  return p;
}

export function fromSearch(calc: CalculatorDeclaration, params: URLSearchParams, base: FormState): { state: FormState; outputUnits: Record<string, string> } {
  const state: FormState = { ...base };
  for (const d of calc.inputs) {
    const raw = params.get(d.name);
    if (raw === null) continue;
    if (d.kind === 'choice' || d.kind === 'unit') {
      state[d.name] = { text: raw, unit: '' };
      continue;
    }
    const cut = raw.lastIndexOf(' ');
    const unit = cut > 0 ? raw.slice(cut + 1) : '';
    const known = Boolean(unit) && (d.kind === 'any' ? Boolean(kindOfUnit(unit)) : unitChoices(d, 'metric').includes(unit));
    state[d.name] = known ? { text: raw.slice(0, cut), unit } : { text: raw, unit: base[d.name]?.unit ?? '' };
  }
  const outputUnits: Record<string, string> = {};
  for (const [k, v] of params) if (k.startsWith('out.')) outputUnits[k.slice(4)] = v;
  return { state, outputUnits };
}
