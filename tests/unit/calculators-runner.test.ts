// The calculator registry and request runner: the contract's ids and names, declarations the API can
// send as JSON, and the field errors a bad request ends in.
import { describe, expect, it } from 'vitest';
import { CalculatorRequest, calculators, getCalculator, listCalculators, runCalculator } from '@/shared/calculators';
import { CalculatorInputError, UnknownCalculatorError } from '@/shared/calculators/types';
import { UNITS, isQuantityKind, isUnitOf } from '@/shared/units';
import { expectRel, q, out } from '../helpers/calc';

function fieldsOf(fn: () => unknown): Record<string, string> {
  try {
    fn();
  } catch (error) {
    if (error instanceof CalculatorInputError) return error.fields;
    throw error;
  }
  throw new Error('expected a CalculatorInputError');
}

// calculators.md "The calculators" table calculators.md: inputs (optional ones marked ?) and outputs.
const CONTRACT: Record<string, { inputs: string[]; outputs: string[] }> = {
  'unit-convert': { inputs: ['value', 'to'], outputs: ['value'] },
  bead: { inputs: ['profile', 'width', 'height?', 'length', 'density', 'partsPerMinute?'], outputs: ['area', 'massPerLength', 'volume', 'mass', 'massPerHour'] },
  dot: { inputs: ['baseDiameter', 'height?', 'contactAngle?', 'density', 'dotsPerPart?', 'partsPerMinute?'], outputs: ['height', 'volume', 'mass', 'massPerHour'] },
  'nozzle-flow': {
    inputs: ['innerDiameter', 'length', 'viscosity', 'density?', 'pressureDrop?', 'flowRate?'],
    outputs: ['flowRate', 'pressureDrop', 'meanVelocity', 'reynolds', 'wallShearRate', 'wallShearStress'],
  },
  'nozzle-flow-power-law': {
    inputs: ['innerDiameter', 'length', 'consistency', 'flowIndex', 'density?', 'pressureDrop?', 'flowRate?'],
    outputs: ['flowRate', 'pressureDrop', 'meanVelocity', 'wallShearRate', 'wallShearStress', 'wallViscosity', 'reynolds'],
  },
  'viscosity-temperature': { inputs: ['temperature1', 'viscosity1', 'temperature2', 'viscosity2', 'temperature'], outputs: ['viscosity', 'andradeB', 'activationEnergy'] },
  'air-piston-force': {
    inputs: ['boreDiameter', 'rodDiameter?', 'airPressure', 'springPreload', 'springRate?', 'lift?', 'fluidPressure', 'seatDiameter', 'friction?'],
    outputs: ['pistonForce', 'returnForce', 'fluidForce', 'marginAtCrack', 'marginAtFullLift', 'minAirPressureToCrack', 'minAirPressureFullLift'],
  },
  'air-consumption': {
    inputs: ['boreDiameter', 'rodDiameter?', 'stroke', 'airPressure', 'cycleRate', 'doubleActing?', 'deadVolume?'],
    outputs: ['freeAirPerCycle', 'freeAirPerMinute'],
  },
  'coil-check': {
    inputs: ['supplyVoltage', 'nominalResistance', 'measuredResistance', 'measuredAt', 'operatingTemperature?', 'tolerance?'],
    outputs: ['expectedCurrent', 'expectedPower', 'resistanceAt20', 'deviation', 'hotResistance', 'hotCurrent', 'hotPower', 'verdict'],
  },
  'coil-temperature': { inputs: ['coldResistance', 'coldTemperature', 'hotResistance'], outputs: ['hotTemperature', 'temperatureRise'] },
  'placement-drift': {
    inputs: ['lineSpeed', 'openDelay', 'closeDelay', 'commandedLength?', 'newOpenDelay?', 'newCloseDelay?'],
    outputs: ['startOffset', 'tailLength', 'placedLength', 'advanceDistance', 'startShift', 'tailShift'],
  },
  'service-forecast': { inputs: ['cycleRate', 'hoursPerDay', 'activeFraction', 'cyclesSoFar', 'part', 'threshold?'], outputs: ['cyclesPerDay', 'daysRemaining', 'status'] },
  weibull: { inputs: ['failures', 'suspensions?', 'age?', 'method?'], outputs: ['shape', 'scale', 'b10', 'reliabilityAtAge', 'failureCount'] },
  'needle-lift': {
    inputs: ['seatDiameter', 'coneIncludedAngle', 'lift'],
    outputs: ['curtainArea', 'curtainAreaApprox', 'orificeArea', 'crossoverLift', 'crossoverLiftApprox', 'areaRatio'],
  },
};

// Output units the contract states; all other quantity outputs use the first unit of their kind.
const STATED_UNITS: Record<string, Record<string, string>> = {
  dot: { volume: 'uL', mass: 'mg' },
  'air-consumption': { freeAirPerCycle: 'cm3', freeAirPerMinute: 'L/min' },
  'service-forecast': { daysRemaining: 'd' },
  'viscosity-temperature': { andradeB: 'K' },
  'coil-check': { deviation: '%' },
};

const nozzleB = {
  innerDiameter: q(0.41, 'mm'),
  length: q(12.7, 'mm'),
  viscosity: q(1000, 'cP'),
  pressureDrop: q(2, 'bar'),
  density: q(1.1, 'g/cm3'),
};

describe('registry against the contract', () => {
  it('when the calculators are listed, then the 14 contract ids are there in order', () => {
    expect(calculators.map((c) => c.id)).toEqual(Object.keys(CONTRACT));
    expect(listCalculators().map((c) => c.id)).toEqual(Object.keys(CONTRACT));
  });

  it.each(Object.entries(CONTRACT))('when %s is declared, then its input and output names and optional flags match the contract', (id, contract) => {
    const calc = getCalculator(id)!;
    expect(calc.inputs.map((i) => (i.optional ? `${i.name}?` : i.name))).toEqual(contract.inputs);
    expect(calc.outputs.map((o) => o.name)).toEqual(contract.outputs);
  });

  it.each(calculators.map((c) => [c.id, c] as const))('when %s is declared, then its units, ranges, defaults and references are well formed', (id, calc) => {
    expect(calc.title.length).toBeGreaterThan(3);
    expect(calc.summary).toMatch(/\.$/);
    expect(calc.formula.length).toBeGreaterThan(10);
    expect(calc.limits.length).toBeGreaterThan(0);
    expect(calc.references.length).toBeGreaterThan(0);
    for (const ref of calc.references) expect(['checked', 'memory', 'derived', 'common practice']).toContain(ref.tag);
    for (const input of calc.inputs) {
      expect(input.help.length, input.name).toBeGreaterThan(5);
      const kind = input.kind === 'list' ? input.listKind : input.kind;
      if (kind && isQuantityKind(kind)) {
        expect(isUnitOf(input.defaultUnit!, kind), `${id}.${input.name} default unit`).toBe(true);
      }
      if (input.kind === 'choice') {
        expect(input.choices!.length).toBeGreaterThan(1);
        if (input.default !== undefined) expect(input.choices!.map((c) => c.value)).toContain(input.default);
      }
      for (const bound of [input.min, input.max]) if (bound !== undefined) expect(Number.isFinite(bound)).toBe(true);
    }
    for (const output of calc.outputs) {
      if (output.kind === 'verdict') {
        expect(output.values!.length).toBeGreaterThan(1);
        continue;
      }
      if (output.unitFrom) {
        // Follows the unit of an input (weibull ages, unit-convert's target); the fallback is that input's default unit.
        const source = calc.inputs.find((i) => i.name === output.unitFrom)!;
        if (output.unit !== undefined) expect(output.unit).toBe(source.defaultUnit);
        continue;
      }
      if (output.kind === 'any') throw new Error(`${id}.${output.name}: 'any' output without unitFrom`);
      const expected = STATED_UNITS[id]?.[output.name] ?? UNITS[output.kind][0].unit;
      expect(output.unit, `${id}.${output.name}`).toBe(expected);
    }
  });

  it('when the declarations are listed, then they are plain JSON with no code in them', () => {
    const listed = listCalculators();
    expect(JSON.parse(JSON.stringify(listed))).toEqual(listed);
    for (const calc of listed) {
      expect(calc).not.toHaveProperty('compute');
      expect(calc).not.toHaveProperty('check');
    }
  });

  it('when an unknown id is run, then a distinct UnknownCalculatorError is thrown', () => {
    expect(() => runCalculator('flux-capacitor', { inputs: {} })).toThrow(UnknownCalculatorError);
    expect(getCalculator('flux-capacitor')).toBeUndefined();
  });
});

describe('request schema and conversions', () => {
  it("when the contract's example body is parsed, then the zod schema accepts it", () => {
    const body = { inputs: nozzleB, outputUnits: { flowRate: 'uL/s' } };
    expect(CalculatorRequest.parse(body)).toEqual(body);
    expect(CalculatorRequest.safeParse({ inputs: { a: 5 } }).success).toBe(false);
    expect(CalculatorRequest.safeParse({ inputs: { a: { values: [1, 2], unit: 'h' }, b: 'mle' } }).success).toBe(true);
  });

  it('when the contract example runs, then flowRate 10.92199 uL/s and reynolds 0.03731 with unit "1"', () => {
    // calculators.md "Request and response" [derived]
    const r = runCalculator('nozzle-flow', { inputs: nozzleB, outputUnits: { flowRate: 'uL/s' } });
    expect(Math.abs(out(r, 'flowRate', 'uL/s') - 10.92199)).toBeLessThan(5e-6);
    expect(Math.abs(out(r, 'reynolds', '1') - 0.03731)).toBeLessThan(5e-6);
    expect(r.warnings).toEqual([]);
  });

  it('when no output units are asked for, then each output comes in its declared default unit', () => {
    const r = runCalculator('nozzle-flow', { inputs: nozzleB });
    expect(r.outputs.flowRate).toMatchObject({ unit: 'mL/s' });
    expect(r.outputs.pressureDrop).toEqual({ value: 200000, unit: 'Pa' });
    expect(r.outputs.meanVelocity).toMatchObject({ unit: 'mm/s' });
  });

  it('when inputs are given in imperial units, then the answer matches the metric one', () => {
    // derived: conversion happens before the formula
    const metric = runCalculator('nozzle-flow', { inputs: nozzleB });
    const imperial = runCalculator('nozzle-flow', {
      inputs: { ...nozzleB, innerDiameter: q(0.41 / 0.0254, 'thou'), length: q(12.7 / 25.4, 'in'), pressureDrop: q(2e5 / 6894.757293168361, 'psi') },
    });
    expectRel(out(imperial, 'flowRate'), out(metric, 'flowRate'), 1e-9);
  });

  it('when an optional input with a default is left out, then the default is used', () => {
    // coil-check tolerance defaults to 10 % [common practice]
    const inputs = { supplyVoltage: q(24, 'V'), nominalResistance: q(28.8, 'ohm'), measuredAt: q(20, 'degC') };
    expect(runCalculator('coil-check', { inputs: { ...inputs, measuredResistance: q(26.2, 'ohm') } }).outputs.verdict).toBe('ok');
    expect(runCalculator('coil-check', { inputs: { ...inputs, measuredResistance: q(25.8, 'ohm') } }).outputs.verdict).toBe('low');
  });
});

describe('unit-convert', () => {
  it('when 100 psi is converted to bar, then 6.894757293 bar', () => {
    // calculators.md §1 [derived]
    const r = runCalculator('unit-convert', { inputs: { value: q(100, 'psi'), to: 'bar' } });
    expectRel(out(r, 'value', 'bar'), 6.894757293168361, 1e-9);
  });

  it('when 350 °F is converted to °C, then 176.66667 °C', () => {
    // calculators.md §1 [derived]
    expectRel(out(runCalculator('unit-convert', { inputs: { value: q(350, 'degF'), to: 'degC' } }), 'value', 'degC'), 176.66666666666667, 1e-9);
  });

  it('when 1 US fl oz is converted to mL and 25 thou to mm, then 29.57352956 and 0.635', () => {
    // calculators.md §1 [derived]
    expectRel(out(runCalculator('unit-convert', { inputs: { value: q(1, 'floz'), to: 'mL' } }), 'value'), 29.5735295625, 1e-9);
    expectRel(out(runCalculator('unit-convert', { inputs: { value: q(25, 'thou'), to: 'mm' } }), 'value'), 0.635, 1e-9);
  });

  it('when −300 °C is converted, then the value is refused as below absolute zero', () => {
    // calculators.md §1 edge case [derived]
    expect(fieldsOf(() => runCalculator('unit-convert', { inputs: { value: q(-300, 'degC'), to: 'K' } }))).toEqual({
      'inputs.value': 'Value is below absolute zero (-273.15 °C)',
    });
  });

  it('when the target unit is of another kind or unknown, then "to" is refused', () => {
    expect(fieldsOf(() => runCalculator('unit-convert', { inputs: { value: q(1, 'bar'), to: 'mm' } }))).toEqual({
      'inputs.to': "'mm' is not a pressure unit: use Pa, kPa, MPa, bar or psi",
    });
    expect(fieldsOf(() => runCalculator('unit-convert', { inputs: { value: q(1, 'bar'), to: 'furlong' } }))['inputs.to']).toMatch(/Unknown unit 'furlong'/);
  });
});

describe('field errors', () => {
  it('when a required input is missing, then it is named', () => {
    const { viscosity: _v, ...rest } = nozzleB;
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: rest }))).toEqual({ 'inputs.viscosity': 'Viscosity is required' });
  });

  it('when a unit is unknown, then the message lists the units of that kind', () => {
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: { ...nozzleB, innerDiameter: q(0.41, 'furlong') } }))).toEqual({
      'inputs.innerDiameter': "Unknown unit 'furlong' for inner diameter: use mm, m, um, in or thou",
    });
  });

  it('when a unit of the wrong kind is given, then the message says which kind is needed', () => {
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: { ...nozzleB, innerDiameter: q(0.41, 'bar') } }))).toEqual({
      'inputs.innerDiameter': "Unit 'bar' is a pressure unit; inner diameter needs a length unit: use mm, m, um, in or thou",
    });
  });

  it('when a length is negative or zero, then it must be greater than 0 in the unit typed', () => {
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: { ...nozzleB, innerDiameter: q(-0.41, 'mm') } }))).toEqual({
      'inputs.innerDiameter': 'Inner diameter must be greater than 0 mm',
    });
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: { ...nozzleB, length: q(0, 'in') } }))).toEqual({
      'inputs.length': 'Needle length must be greater than 0 in',
    });
  });

  it('when an input name is unknown, then it is refused and the known names listed', () => {
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: { ...nozzleB, diameter: q(1, 'mm') } }))['inputs.diameter']).toMatch(
      /^Unknown input 'diameter': this calculator takes innerDiameter, length/,
    );
  });

  it('when both pressure drop and flow rate are given, or neither, then both fields are flagged', () => {
    const both = fieldsOf(() => runCalculator('nozzle-flow', { inputs: { ...nozzleB, flowRate: q(5, 'uL/s') } }));
    expect(both).toEqual({
      'inputs.pressureDrop': 'Give either the pressure drop or the flow rate, not both',
      'inputs.flowRate': 'Give either the pressure drop or the flow rate, not both',
    });
    const { pressureDrop: _p, ...neither } = nozzleB;
    expect(Object.keys(fieldsOf(() => runCalculator('nozzle-flow', { inputs: neither }))).sort()).toEqual(['inputs.flowRate', 'inputs.pressureDrop']);
  });

  it('when a value is not finite or not a number with a unit, then it is refused', () => {
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: { ...nozzleB, length: q(Number.NaN, 'mm') } }))).toEqual({
      'inputs.length': 'Needle length must be a finite number',
    });
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: { ...nozzleB, length: q(Infinity, 'mm') } }))).toEqual({
      'inputs.length': 'Needle length must be a finite number',
    });
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: { ...nozzleB, length: '12.7 mm' } }))['inputs.length']).toMatch(/number and a unit/);
  });

  it('when a choice is not one of the options, then the options are listed', () => {
    expect(fieldsOf(() => runCalculator('bead', { inputs: { profile: 'square', width: q(3, 'mm'), length: q(1, 'm'), density: q(1.2, 'g/cm3') } }))).toEqual({
      'inputs.profile': 'Bead shape must be one of: round, half-round, fillet',
    });
  });

  it('when a list holds a bad value, then the list is refused naming the value', () => {
    expect(fieldsOf(() => runCalculator('weibull', { inputs: { failures: { values: [10, -5, 30], unit: 'h' } } }))).toEqual({
      'inputs.failures': 'Failure ages: value 2 (-5) must be greater than 0 h',
    });
    expect(fieldsOf(() => runCalculator('weibull', { inputs: { failures: q(10, 'h') } }))['inputs.failures']).toMatch(/list of numbers/);
  });

  it('when an output unit is unknown, of the wrong kind, for an unknown output or for a verdict, then each is refused', () => {
    const coil = { supplyVoltage: q(24, 'V'), nominalResistance: q(28.8, 'ohm'), measuredResistance: q(28.8, 'ohm'), measuredAt: q(20, 'degC') };
    expect(fieldsOf(() => runCalculator('coil-check', { inputs: coil, outputUnits: { expectedCurrent: 'mA', expectedPower: 'V', verdict: '1', temperature: 'K' } }))).toEqual({
      'outputUnits.expectedCurrent': "Unknown unit 'mA' for expected current at 20 °C: use A",
      'outputUnits.expectedPower': "Unit 'V' cannot be used for expected power at 20 °C, which is a power: use W",
      'outputUnits.verdict': 'Verdict is a verdict and has no unit',
      'outputUnits.temperature': expect.stringMatching(/^Unknown output 'temperature'/),
    });
  });

  it('when many things are wrong at once, then every field problem is reported together with its path', () => {
    const fields = fieldsOf(() =>
      runCalculator('nozzle-flow', {
        inputs: {
          innerDiameter: q(-1, 'mm'),
          length: q(12.7, 'furlong'),
          viscosity: q(1, 'bar'),
          density: q(Number.NaN, 'g/cm3'),
          pressureDrop: q(2, 'bar'),
          flowRate: q(5, 'uL/s'),
          colour: 'red',
        },
        outputUnits: { flowRate: 'psi' },
      }),
    );
    expect(Object.keys(fields).sort()).toEqual(
      ['inputs.colour', 'inputs.density', 'inputs.flowRate', 'inputs.innerDiameter', 'inputs.length', 'inputs.pressureDrop', 'inputs.viscosity', 'outputUnits.flowRate'].sort(),
    );
  });

  it('when the body is not an object with inputs, then the request itself is refused', () => {
    expect(fieldsOf(() => runCalculator('nozzle-flow', null))).toEqual({ inputs: 'The request needs "inputs": an object of named values' });
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: [] }))).toHaveProperty('inputs');
    expect(fieldsOf(() => runCalculator('nozzle-flow', { inputs: nozzleB, outputUnits: { flowRate: 3 } }))).toHaveProperty(['outputUnits.flowRate']);
  });

  it('when an input error is thrown, then its message carries the field messages', () => {
    const error = (() => {
      try {
        runCalculator('nozzle-flow', { inputs: { ...nozzleB, innerDiameter: q(-1, 'mm') } });
      } catch (e) {
        return e as CalculatorInputError;
      }
      return undefined;
    })();
    expect(error).toBeInstanceOf(CalculatorInputError);
    expect(error!.message).toBe('Inner diameter must be greater than 0 mm');
    expect(error!.name).toBe('CalculatorInputError');
  });
});
