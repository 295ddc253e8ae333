// Registry of Beadpath's calculators: what the API lists and runs, in the order the UI shows them.
import { airConsumption } from './air-consumption';
import { airPistonForce } from './air-piston-force';
import { bead } from './bead';
import { coilCheck } from './coil-check';
import { coilTemperature } from './coil-temperature';
import { dot } from './dot';
import { needleLift } from './needle-lift';
import { nozzleFlow } from './nozzle-flow';
import { nozzleFlowPowerLaw } from './nozzle-flow-power-law';
import { placementDrift } from './placement-drift';
import { runCalculatorRequest, type CalculatorRequestBody } from './runner';
import { serviceForecastCalculator } from './service-forecast';
import { UnknownCalculatorError, type Calculator, type CalculatorDeclaration, type CalculatorResponse } from './types';
import { unitConvert } from './unit-convert';
import { viscosityTemperature } from './viscosity-temperature';
import { weibull } from './weibull';

export * from './types';
export { CalculatorRequest, InputValue, ListInput, QuantityInput, type CalculatorRequestBody } from './runner';

export const calculators: readonly Calculator[] = [
  unitConvert,
  bead,
  dot,
  nozzleFlow,
  nozzleFlowPowerLaw,
  viscosityTemperature,
  airPistonForce,
  airConsumption,
  coilCheck,
  coilTemperature,
  placementDrift,
  serviceForecastCalculator,
  weibull,
  needleLift,
];

const byId = new Map(calculators.map((calculator) => [calculator.id, calculator]));

export function getCalculator(id: string): Calculator | undefined {
  return byId.get(id);
}

/** Declarations without their code, safe to send as JSON. */
export function listCalculators(): CalculatorDeclaration[] {
  return calculators.map(({ id, title, summary, inputs, outputs, formula, limits, references }) =>
    // A JSON round trip drops undefined fields and guarantees nothing but plain data leaves.
    JSON.parse(JSON.stringify({ id, title, summary, inputs, outputs, formula, limits, references })),
  );
}

/**
 * Runs a calculator on a request body. Throws UnknownCalculatorError for an unknown id and
 * CalculatorInputError (with every field problem) for bad input.
 */
export function runCalculator(id: string, request: CalculatorRequestBody | unknown): CalculatorResponse {
  const calculator = byId.get(id);
  if (!calculator) throw new UnknownCalculatorError(id);
  return runCalculatorRequest(calculator, request);
}
