// Runs a calculator in the browser as the user types (the same code the server runs), and sorts
// its problems into "still missing", "wrong in this field" and "about the form as a whole".
import { useMemo } from 'react';
import { runCalculator } from '@/shared/calculators';
import { CalculatorInputError, type CalculatorDeclaration, type CalculatorResponse } from '@/shared/calculators/types';
import { toRequest, type FormState } from './form-state';

export interface Calculation {
  result: CalculatorResponse | null;
  missing: string[];
  fieldErrors: Record<string, string>;
  formErrors: string[];
  request: ReturnType<typeof toRequest>['inputs'];
}

export function useCalculation(calc: CalculatorDeclaration, state: FormState, outputUnits: Record<string, string>): Calculation {
  return useMemo(() => {
    const { inputs, missing } = toRequest(calc, state);
    const fieldErrors: Record<string, string> = {};
    const formErrors: string[] = [];
    let result: CalculatorResponse | null = null;
    try {
      result = runCalculator(calc.id, { inputs, outputUnits });
    } catch (err) {
      if (!(err instanceof CalculatorInputError)) throw err;
      for (const [path, message] of Object.entries(err.fields)) {
        const [head, name] = path.split('.');
        if (head === 'outputUnits') fieldErrors[`out.${name}`] ??= message;
        else if (name && name in inputs) fieldErrors[name] ??= message;
        // A required field left empty is listed once as missing; other cross-field notes go above.
        else if (!(name && calc.inputs.some((d) => d.name === name && !d.optional))) formErrors.push(message);
      }
    }
    return { result, missing, fieldErrors, formErrors, request: inputs };
  }, [calc, state, outputUnits]);
}
