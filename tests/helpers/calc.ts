// Small assertions shared by the calculator tests: relative tolerance, "as printed" comparison,
// reading one output of a response, and catching a thrown error.
import { expect } from 'vitest';
import type { CalculatorResponse } from '@/shared/calculators';

export function expectRel(actual: number, expected: number, rel: number) {
  const scale = Math.abs(expected) > 0 ? Math.abs(expected) : 1;
  expect(Math.abs(actual - expected) / scale).toBeLessThanOrEqual(rel);
}

/** Equal to a value printed in a reference to the digits it was printed with. */
export function expectPrinted(actual: number, printed: string) {
  const decimals = printed.includes('.') ? printed.split('.')[1].length : 0;
  expect(Math.abs(actual - Number(printed))).toBeLessThanOrEqual(0.5 * 10 ** -decimals + 1e-12 * Math.abs(actual));
}

export const q = (value: number, unit: string) => ({ value, unit });

export function out(response: CalculatorResponse, name: string, unit?: string): number {
  const o = response.outputs[name];
  if (typeof o !== 'object') throw new Error(`output ${name} missing`);
  if (unit) expect(o.unit).toBe(unit);
  return o.value;
}

export function catchError(fn: () => unknown): unknown {
  try {
    fn();
  } catch (error) {
    return error;
  }
  return undefined;
}
