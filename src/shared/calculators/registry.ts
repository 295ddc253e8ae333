// The calculators themselves, in the order the UI shows them, without the request runner (and the
// validation library it brings): what lists and tiles need, and what the runner looks up.
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
import { serviceForecastCalculator } from './service-forecast';
import { unitConvert } from './unit-convert';
import { viscosityTemperature } from './viscosity-temperature';
import { weibull } from './weibull';
import type { Calculator, CalculatorDeclaration } from './types';

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

export const byId = new Map(calculators.map((calculator) => [calculator.id, calculator]));

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
