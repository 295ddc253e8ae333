// A valve's recorded specs fill a calculator's inputs only where the kind matches and the value is known.
import { describe, expect, it } from 'vitest';
import { getCalculator } from '@/shared/calculators';
import { prefillFromApplicator, type ApplicatorSpecs } from '@/shared/walks';

const specs: ApplicatorSpecs = {
  coilDrive: '24v-dc',
  airPressureBar: null,
  orificeDiameterMm: 1.5,
  viscosityMPas: 2500,
  viscosityTemperatureC: 160,
  densityGPerCm3: 0.98,
  setTemperatureC: 170,
};

describe('prefill from the applicator', () => {
  it('when a coil check runs on a 24 V DC valve, then the supply voltage is filled and nothing else is guessed', () => {
    const fill = prefillFromApplicator(specs, getCalculator('coil-check')!.inputs);
    expect(fill).toEqual({ supplyVoltage: { value: 24, unit: 'V', from: 'coil drive 24 V DC' } });
  });

  it('when the valve has a high-voltage driver, then no supply voltage is assumed', () => {
    expect(prefillFromApplicator({ ...specs, coilDrive: 'high-voltage' }, getCalculator('coil-check')!.inputs)).toEqual({});
  });

  it('when nozzle flow is worked out, then viscosity and density come from the fluid record in their units', () => {
    const fill = prefillFromApplicator(specs, getCalculator('nozzle-flow')!.inputs);
    expect(fill.viscosity).toMatchObject({ value: 2500, unit: 'mPa.s' });
    expect(fill.density).toMatchObject({ value: 0.98, unit: 'g/cm3' });
    expect(fill.innerDiameter).toBeUndefined();
  });

  it('when the air piston force is worked out on a valve with no air pressure recorded, then only the seat diameter is filled', () => {
    const fill = prefillFromApplicator(specs, getCalculator('air-piston-force')!.inputs);
    expect(Object.keys(fill)).toEqual(['seatDiameter']);
  });
});
