// Small helpers the calculator modules share for reading SI inputs and wording warnings.
import { formatNumber } from '../units';
import type { CalculatorWarning, ComputeInputs, WarningCode } from './types';

export function num(inputs: ComputeInputs, name: string): number {
  const value = inputs[name];
  // The runner has already checked required inputs, so reaching this is a declaration bug.
  if (typeof value !== 'number') throw new Error(`Calculator input '${name}' is missing`);
  return value;
}

export function optNum(inputs: ComputeInputs, name: string): number | undefined {
  const value = inputs[name];
  return typeof value === 'number' ? value : undefined;
}

export function text(inputs: ComputeInputs, name: string): string {
  const value = inputs[name];
  if (typeof value !== 'string') throw new Error(`Calculator input '${name}' is missing`);
  return value;
}

export function list(inputs: ComputeInputs, name: string): number[] {
  const value = inputs[name];
  return Array.isArray(value) ? value : [];
}

export function warning(code: WarningCode, message: string): CalculatorWarning {
  return { code, message };
}

/** Numbers for warning text: large ones whole and grouped (33,749), small ones to a few significant figures. */
export function fmt(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return String(value);
  if (Math.abs(value) >= 1000) return Math.round(value).toLocaleString('en-US');
  return formatNumber(Number(value.toPrecision(digits)));
}
