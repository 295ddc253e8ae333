// Registry of Beadpath's calculators: what the API lists and runs, in the order the UI shows them.
// The list itself is in registry.ts (no validation library), the request runner in runner.ts.
import { byId } from './registry';
import { runCalculatorRequest, type CalculatorRequestBody } from './runner';
import { UnknownCalculatorError, type CalculatorResponse } from './types';

export * from './types';
export { calculators, getCalculator, listCalculators } from './registry';
export { CalculatorRequest, InputValue, ListInput, QuantityInput, type CalculatorRequestBody } from './runner';

/**
 * Runs a calculator on a request body. Throws UnknownCalculatorError for an unknown id and
 * CalculatorInputError (with every field problem) for bad input.
 */
export function runCalculator(id: string, request: CalculatorRequestBody | unknown): CalculatorResponse {
  const calculator = byId.get(id);
  if (!calculator) throw new UnknownCalculatorError(id);
  return runCalculatorRequest(calculator, request);
}
