// The calculators through HTTP: one published or derived check per calculator, the listing, and
// the 400 error shape for bad input. Each check names its source (or "derived" / "common practice").
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startTestApp, type TestApp } from '../helpers/test-app';

let t: TestApp;
let agent: Awaited<ReturnType<TestApp['signIn']>>['agent'];
beforeAll(async () => {
  t = await startTestApp();
  agent = (await t.signIn(['technician'])).agent;
});
afterAll(async () => t?.close());

const q = (value: number, unit: string) => ({ value, unit });

function close(actual: number, expected: number, rel = 1e-6) {
  expect(Math.abs(actual - expected) / Math.max(Math.abs(expected), 1e-300)).toBeLessThan(rel);
}

async function run(id: string, inputs: Record<string, unknown>, outputUnits?: Record<string, string>) {
  const res = await agent.post(`/api/calculators/${id}`).send({ inputs, outputUnits });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as { outputs: Record<string, { value: number; unit: string } | string>; warnings: { code: string; message: string }[] };
}
const v = (o: { value: number; unit: string } | string) => (o as { value: number }).value;

describe('calculators over HTTP', () => {
  it('when listing, then all fourteen contract ids come with inputs, outputs, formula and references', async () => {
    const res = await agent.get('/api/calculators');
    expect(res.status).toBe(200);
    const ids = res.body.calculators.map((c: { id: string }) => c.id).sort();
    expect(ids).toEqual(
      [
        'air-consumption',
        'air-piston-force',
        'bead',
        'coil-check',
        'coil-temperature',
        'dot',
        'needle-lift',
        'nozzle-flow',
        'nozzle-flow-power-law',
        'placement-drift',
        'service-forecast',
        'unit-convert',
        'viscosity-temperature',
        'weibull',
      ].sort(),
    );
    for (const c of res.body.calculators) {
      expect(c.inputs.length, c.id).toBeGreaterThan(0);
      expect(c.references.length, c.id).toBeGreaterThan(0);
      expect(c.formula, c.id).toBeTruthy();
    }
  });

  it('when converting 100 psi to bar, then 6.894757293 (NIST SP 811; psi derived exactly from lb, g_n and inch)', async () => {
    const r = await run('unit-convert', { value: q(100, 'psi'), to: 'bar' });
    close(v(r.outputs.value), 6.894757293168361, 1e-9);
    expect((r.outputs.value as { unit: string }).unit).toBe('bar');
  });

  it('when a 3 mm round bead 500 mm long at 1.20 g/cm3, then 4.241150 g per part (CRC Standard Mathematical Tables; mathjs cross-check)', async () => {
    const r = await run('bead', { profile: 'round', width: q(3, 'mm'), length: q(500, 'mm'), density: q(1.2, 'g/cm3'), partsPerMinute: q(12, '1/min') });
    close(v(r.outputs.mass), 4.24115, 1e-6);
    close(v(r.outputs.massPerLength), 8.4823, 1e-5);
    close(v(r.outputs.massPerHour), 3053.628, 1e-6);
  });

  it('when a dot of base radius 1.0 mm and height 0.5 mm, then 0.850848 uL (spherical cap, CRC tables, from memory)', async () => {
    const r = await run('dot', { baseDiameter: q(2, 'mm'), height: q(0.5, 'mm'), density: q(1.2, 'g/cm3') });
    close(v(r.outputs.volume), 0.850848, 1e-6);
    close(v(r.outputs.mass), 1.021018, 1e-6);
  });

  it('when the contract example for nozzle-flow is posted, then 10.92199 uL/s and Re 0.03731 (Hagen-Poiseuille; Bird, Stewart & Lightfoot)', async () => {
    const r = await run('nozzle-flow', { innerDiameter: q(0.41, 'mm'), length: q(12.7, 'mm'), viscosity: q(1000, 'cP'), pressureDrop: q(2, 'bar'), density: q(1.1, 'g/cm3') }, { flowRate: 'uL/s' });
    expect((r.outputs.flowRate as { unit: string }).unit).toBe('uL/s');
    close(v(r.outputs.flowRate), 10.92199, 1e-6);
    close(v(r.outputs.reynolds), 0.03731, 1e-3);
    expect(r.warnings).toEqual([]);
  });

  it('when water goes through the same needle at 2 bar, then the answer carries turbulent and entrance-length warnings (derived: Re about 33,749)', async () => {
    const r = await run('nozzle-flow', { innerDiameter: q(0.41, 'mm'), length: q(12.7, 'mm'), viscosity: q(1.0016, 'mPa.s'), pressureDrop: q(2, 'bar'), density: q(998.2, 'kg/m3') });
    const codes = r.warnings.map((w) => w.code);
    expect(codes).toContain('turbulent');
    expect(codes).toContain('entrance-length');
  });

  it('when a power-law fluid K=50 Pa.s^n, n=0.5 at 0.5 MPa, then 95.107 uL/s (Bird, Stewart & Lightfoot §8.3, from memory; derived numerically)', async () => {
    const r = await run(
      'nozzle-flow-power-law',
      { innerDiameter: q(0.5, 'mm'), length: q(12.7, 'mm'), consistency: q(50, 'Pa.s^n'), flowIndex: q(0.5, '1'), pressureDrop: q(0.5, 'MPa'), density: q(1100, 'kg/m3') },
      { flowRate: 'uL/s' },
    );
    close(v(r.outputs.flowRate), 95.107, 1e-5);
    close(v(r.outputs.wallShearRate), 9687.519, 1e-6);
  });

  it('when water is fitted at 300 K and 340 K, then 587.170 uPa.s at 320 K against 577.02 in Perry\u2019s Table 2-135', async () => {
    const r = await run('viscosity-temperature', {
      temperature1: q(300, 'K'),
      viscosity1: q(853.84e-6, 'Pa.s'),
      temperature2: q(340, 'K'),
      viscosity2: q(421.97e-6, 'Pa.s'),
      temperature: q(320, 'K'),
    });
    close(v(r.outputs.viscosity) * 1e6, 587.17, 1e-5);
    close(v(r.outputs.andradeB), 1797.265, 1e-6);
  });

  it('when a 20 mm piston at 6 bar lifts against 60 N + 8 N/mm and 50 bar on a 1.5 mm seat, then margin 119.6598 N (fluid-power textbook formula, derived)', async () => {
    const r = await run('air-piston-force', {
      boreDiameter: q(20, 'mm'),
      rodDiameter: q(6, 'mm'),
      airPressure: q(6, 'bar'),
      springPreload: q(60, 'N'),
      springRate: q(8, 'N/mm'),
      lift: q(1, 'mm'),
      fluidPressure: q(50, 'bar'),
      seatDiameter: q(1.5, 'mm'),
    });
    close(v(r.outputs.pistonForce), 188.4956, 1e-6);
    close(v(r.outputs.marginAtCrack), 119.6598, 1e-6);
    close(v(r.outputs.marginAtFullLift), 111.6598, 1e-6);
  });

  it('when there is no air pressure, then the margin is negative and the answer warns cannot-open (derived)', async () => {
    const r = await run('air-piston-force', { boreDiameter: q(20, 'mm'), airPressure: q(0, 'bar'), springPreload: q(60, 'N'), fluidPressure: q(50, 'bar'), seatDiameter: q(1.5, 'mm') });
    expect(v(r.outputs.marginAtCrack)).toBeLessThan(0);
    expect(r.warnings.map((w) => w.code)).toContain('cannot-open');
  });

  it('when a 20 mm x 1 mm stroke cycles at 300/min and 6 bar, then 0.652340 L/min of free air (isothermal ideal gas, derived; p_atm 101.325 kPa)', async () => {
    const r = await run('air-consumption', { boreDiameter: q(20, 'mm'), stroke: q(1, 'mm'), airPressure: q(6, 'bar'), cycleRate: q(300, '1/min') });
    close(v(r.outputs.freeAirPerCycle), 2.174466, 1e-6);
    close(v(r.outputs.freeAirPerMinute), 0.65234, 1e-5);
  });

  it('when a 28.8 ohm coil reads 25.0 ohm at 35 degC, then -18.03 % and a low verdict (IEC 60028 alpha; short threshold common practice)', async () => {
    const r = await run('coil-check', { supplyVoltage: q(24, 'V'), nominalResistance: q(28.8, 'ohm'), measuredResistance: q(25, 'ohm'), measuredAt: q(35, 'degC') });
    close(v(r.outputs.resistanceAt20), 23.60829, 1e-6);
    close(v(r.outputs.expectedCurrent), 0.833333, 1e-6);
    expect(r.outputs.verdict).toBe('low');
    expect(r.warnings.map((w) => w.code)).toContain('ac-or-pwm');
  });

  it('when a coil goes from 28.8 ohm at 20 degC to 34.5 ohm, then 70.36979 degC (resistance method, k = 234.5 for copper)', async () => {
    const r = await run('coil-temperature', { coldResistance: q(28.8, 'ohm'), coldTemperature: q(20, 'degC'), hotResistance: q(34.5, 'ohm') });
    close(v(r.outputs.hotTemperature), 70.36979, 1e-6);
    expect((r.outputs.hotTemperature as { unit: string }).unit).toBe('degC');
  });

  it('when the line runs at 500 mm/s with 8 ms open and 12 ms close delay, then 4 mm offset and 102 mm placed (constant-speed kinematics, derived)', async () => {
    const r = await run('placement-drift', { lineSpeed: q(30, 'm/min'), openDelay: q(8, 'ms'), closeDelay: q(12, 'ms'), commandedLength: q(100, 'mm') });
    close(v(r.outputs.startOffset), 4, 1e-9);
    close(v(r.outputs.placedLength), 102, 1e-9);
  });

  it('when a valve runs 2 Hz, 16 h/day, 70 % active, then the seat is due in 1240.079 days (seat life 1e8 cycles is common practice)', async () => {
    const r = await run('service-forecast', { cycleRate: q(2, 'Hz'), hoursPerDay: q(16, 'h'), activeFraction: q(70, '%'), cyclesSoFar: q(0, 'cycles'), part: 'seat' });
    close(v(r.outputs.cyclesPerDay), 80640, 1e-9);
    close(v(r.outputs.daysRemaining), 1240.079, 1e-6);
    expect(r.outputs.status).toBe('ok');
    expect(r.warnings.map((w) => w.code)).toContain('rule-of-thumb');
  });

  it('when the NIST e-Handbook §8.4.1.3 censored data are fitted by MLE, then beta 1.7208 and eta 606.53 h', async () => {
    const r = await run('weibull', {
      failures: { values: [54, 187, 216, 240, 244, 335, 361, 373, 375, 386], unit: 'h' },
      suspensions: { values: Array(10).fill(500), unit: 'h' },
      age: q(100, 'h'),
    });
    close(v(r.outputs.shape), 1.720797, 1e-4);
    close(v(r.outputs.scale), 606.5276, 1e-4);
    close(v(r.outputs.reliabilityAtAge), 0.956031, 1e-4);
  });

  it('when a 1.5 mm seat meets a 90 degree cone, then the exact crossover lift is 0.688206 mm (frustum area, derived)', async () => {
    const r = await run('needle-lift', { seatDiameter: q(1.5, 'mm'), coneIncludedAngle: q(90, 'deg'), lift: q(0.2, 'mm') });
    close(v(r.outputs.crossoverLift), 0.688206, 1e-6);
    close(v(r.outputs.curtainArea), 0.622004, 1e-5);
  });
});

describe('bad calculator input', () => {
  it('when a unit is unknown, an input missing and a length negative, then one 400 names every field', async () => {
    const res = await agent.post('/api/calculators/nozzle-flow').send({ inputs: { innerDiameter: q(0.41, 'furlong'), length: q(-1, 'mm'), pressureDrop: q(2, 'bar') } });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_input');
    const fields = Object.keys(res.body.error.fields);
    expect(fields).toEqual(expect.arrayContaining(['inputs.innerDiameter', 'inputs.length', 'inputs.viscosity']));
    expect(res.body.error.fields['inputs.innerDiameter']).toMatch(/furlong/);
  });

  it('when a unit of the wrong kind is given, then 400 says which units fit', async () => {
    const res = await agent.post('/api/calculators/unit-convert').send({ inputs: { value: q(100, 'psi'), to: 'mm' } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['inputs.to']).toMatch(/bar/);
  });

  it('when the body is not the request shape or the calculator is unknown, then 400 / 404', async () => {
    expect((await agent.post('/api/calculators/bead').send({ inputs: 'lots' })).status).toBe(400);
    expect((await agent.post('/api/calculators/flux-capacitor').send({ inputs: {} })).status).toBe(404);
  });

  it('when a temperature below absolute zero is converted, then 400', async () => {
    const res = await agent.post('/api/calculators/unit-convert').send({ inputs: { value: q(-300, 'degC'), to: 'K' } });
    expect(res.status).toBe(400);
    expect(res.body.error.fields['inputs.value']).toMatch(/absolute zero/);
  });
});
