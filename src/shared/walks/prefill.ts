// What a walk already knows about its valve, as calculator inputs: the applicator's recorded specs
// fill the matching inputs of a Measure step's calculator so the technician types only the reading.
import type { QuantityKind } from '../units';

export interface ApplicatorSpecs {
  coilDrive: '24v-dc' | 'high-voltage' | 'ac' | null;
  airPressureBar: number | null;
  orificeDiameterMm: number | null;
  viscosityMPas: number | null;
  viscosityTemperatureC: number | null;
  densityGPerCm3: number | null;
  setTemperatureC: number | null;
}

export interface Prefill {
  value: number;
  unit: string;
  /** Where the value came from, shown beside the field. */
  from: string;
}

/** Calculator input name → value, for the inputs a spec can answer. Kinds guard against mismatches. */
export function prefillFromApplicator(specs: ApplicatorSpecs, inputs: { name: string; kind: string }[]): Record<string, Prefill> {
  const known: Record<string, { kind: QuantityKind; p: Prefill | null }> = {
    // Only a plain 24 V DC drive has a single supply voltage; a spike-and-hold driver does not.
    supplyVoltage: { kind: 'voltage', p: specs.coilDrive === '24v-dc' ? { value: 24, unit: 'V', from: 'coil drive 24 V DC' } : null },
    airPressure: { kind: 'pressure', p: specs.airPressureBar !== null ? { value: specs.airPressureBar, unit: 'bar', from: 'the valve’s air pressure' } : null },
    seatDiameter: { kind: 'length', p: specs.orificeDiameterMm !== null ? { value: specs.orificeDiameterMm, unit: 'mm', from: 'the seat orifice' } : null },
    viscosity: { kind: 'viscosity', p: specs.viscosityMPas !== null ? { value: specs.viscosityMPas, unit: 'mPa.s', from: 'the fluid record' } : null },
    viscosity1: { kind: 'viscosity', p: specs.viscosityMPas !== null ? { value: specs.viscosityMPas, unit: 'mPa.s', from: 'the fluid record' } : null },
    temperature1: { kind: 'temperature', p: specs.viscosityTemperatureC !== null ? { value: specs.viscosityTemperatureC, unit: 'degC', from: 'the fluid record' } : null },
    density: { kind: 'density', p: specs.densityGPerCm3 !== null ? { value: specs.densityGPerCm3, unit: 'g/cm3', from: 'the fluid record' } : null },
  };
  const out: Record<string, Prefill> = {};
  for (const input of inputs) {
    const k = known[input.name];
    if (k?.p && input.kind === k.kind) out[input.name] = k.p;
  }
  return out;
}
