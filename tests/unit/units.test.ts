// Unit table and conversions: exact factors against NIST SP 811 definitions, mathjs as an
// independent cross-check, and round trips for every spelling of every kind.
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { all, create } from 'mathjs';
import { KIND_LABELS, QUANTITY_KINDS, UNITS, assertAboveAbsoluteZero, convert, fromSI, kindOfUnit, kindsOfUnit, toSI, unitLabel, unitsFor, UnitError, type QuantityKind } from '@/shared/units';
import { CalculatorInputError } from '@/shared/calculators/types';
import { expectRel, catchError } from '../helpers/calc';

const EXACT = 1e-9;

const math = create(all, {});
// mathjs 15.2.0 has no poise, cP or thou; defined as calculators.md §1 gives them.
math.createUnit('poise', '0.1 Pa s');
math.createUnit('cP', '1 mPa s');
math.createUnit('thou', '0.001 in');

describe('unit table', () => {
  it('when listing the kinds, then every kind of the contract table is there with its spellings in order', () => {
    // calculators.md "Unit spellings" table calculators.md
    const expected: Record<QuantityKind, string[]> = {
      pressure: ['Pa', 'kPa', 'MPa', 'bar', 'psi'],
      viscosity: ['Pa.s', 'mPa.s', 'cP', 'P'],
      consistency: ['Pa.s^n'],
      length: ['mm', 'm', 'um', 'in', 'thou'],
      area: ['mm2', 'm2', 'in2'],
      volume: ['mL', 'm3', 'L', 'uL', 'mm3', 'cm3', 'in3', 'floz'],
      flowRate: ['mL/s', 'm3/s', 'uL/s', 'mL/min', 'L/min'],
      mass: ['g', 'kg', 'mg', 'lb', 'oz'],
      massPerLength: ['g/m', 'kg/m'],
      massRate: ['g/h', 'kg/h', 'lb/h'],
      density: ['g/cm3', 'kg/m3'],
      temperature: ['degC', 'degF', 'K'],
      temperatureDifference: ['degC', 'degF', 'K'],
      force: ['N', 'lbf'],
      springRate: ['N/mm', 'lbf/in'],
      time: ['s', 'ms', 'min', 'h', 'd'],
      speed: ['mm/s', 'm/s', 'm/min', 'ft/min'],
      frequency: ['1/min', '1/s', 'Hz'],
      shearRate: ['1/s'],
      energyPerMole: ['kJ/mol', 'J/mol'],
      resistance: ['ohm'],
      voltage: ['V'],
      current: ['A'],
      power: ['W'],
      angle: ['deg', 'rad'],
      count: ['cycles'],
      dimensionless: ['1', '%'],
    };
    expect(Object.keys(UNITS).sort()).toEqual(Object.keys(expected).sort());
    for (const kind of QUANTITY_KINDS) {
      expect(
        UNITS[kind].map((spec) => spec.unit),
        kind,
      ).toEqual(expected[kind]);
      expect(KIND_LABELS[kind]).toBeTruthy();
    }
  });

  it('when asking for labels, then trade spellings show their symbols', () => {
    // calculators.md §1: "mil" is ambiguous, so label it "thou (0.001 in)" [common practice]
    expect(unitLabel('thou')).toBe('thou (0.001 in)');
    expect(unitLabel('uL')).toBe('µL');
    expect(unitLabel('degC')).toBe('°C');
    expect(unitLabel('Pa.s')).toBe('Pa·s');
    expect(unitLabel('mm2')).toBe('mm²');
    expect(unitLabel('ohm')).toBe('Ω');
    expect(unitLabel('1/s', 'shearRate')).toBe('s⁻¹');
    expect(unitLabel('1/s', 'frequency')).toBe('per s');
  });

  it('when a spelling belongs to two kinds, then both are reported and the earlier kind wins', () => {
    // derived: the contract table lists 1/s under frequency and shear rate
    expect(kindsOfUnit('1/s')).toEqual(['frequency', 'shearRate']);
    expect(kindOfUnit('1/s')).toBe('frequency');
    expect(kindsOfUnit('degC')).toEqual(['temperature', 'temperatureDifference']);
    expect(kindOfUnit('bar')).toBe('pressure');
    expect(kindOfUnit('furlong')).toBeUndefined();
  });

  it('when the user works in imperial units, then psi, in, in², in³, lb, °F, lbf, lbf/in, ft/min and lb/h come first', () => {
    // common practice: show the user's own system first
    expect(unitsFor('pressure', 'imperial')[0]).toBe('psi');
    expect(unitsFor('length', 'imperial').slice(0, 2)).toEqual(['in', 'thou']);
    expect(unitsFor('area', 'imperial')[0]).toBe('in2');
    expect(unitsFor('volume', 'imperial').slice(0, 2)).toEqual(['in3', 'floz']);
    expect(unitsFor('mass', 'imperial').slice(0, 2)).toEqual(['lb', 'oz']);
    expect(unitsFor('temperature', 'imperial')[0]).toBe('degF');
    expect(unitsFor('force', 'imperial')[0]).toBe('lbf');
    expect(unitsFor('springRate', 'imperial')[0]).toBe('lbf/in');
    expect(unitsFor('speed', 'imperial')[0]).toBe('ft/min');
    expect(unitsFor('massRate', 'imperial')[0]).toBe('lb/h');
    expect(unitsFor('pressure', 'metric')).toEqual(['Pa', 'kPa', 'MPa', 'bar', 'psi']);
    expect(unitsFor('viscosity', 'imperial')).toEqual(['Pa.s', 'mPa.s', 'cP', 'P']);
  });

  it('when a unit does not belong to the kind asked for, then conversion refuses it', () => {
    // derived: conversion functions take the kind so shared spellings stay unambiguous
    expect(() => toSI(1, 'bar', 'length')).toThrow(UnitError);
    expect(() => fromSI(1, 'furlong', 'length')).toThrow(/use mm, m, um, in or thou/);
  });
});

describe('§1 unit conversions: check cases', () => {
  it('when 1 psi is taken to SI, then it is exactly 0.45359237 × 9.80665 / 0.0254² Pa', () => {
    // NIST SP 811 App. B.9 prints 6.894 757 E+03 [memory]; exact value derived from lb, g_n, inch [derived]
    expectRel(toSI(1, 'psi', 'pressure'), 6894.757293168361, EXACT);
  });

  it('when 100 psi is converted to bar, then 6.894757293 bar', () => {
    // calculators.md §1, derived from exact definitions [derived]
    expectRel(convert(100, 'psi', 'bar', 'pressure'), 6.894757293168361, EXACT);
  });

  it('when 1 bar is converted to psi, then 14.50377377 psi', () => {
    // calculators.md §1 [derived]
    expectRel(convert(1, 'bar', 'psi', 'pressure'), 14.503773773020923, EXACT);
  });

  it('when 87 psi gauge is converted to kPa, then 599.8438845 kPa gauge', () => {
    // calculators.md §1 [derived]; gauge stays gauge
    expectRel(convert(87, 'psi', 'kPa', 'pressure'), 599.8438845, EXACT);
  });

  it('when 1 standard atmosphere is expressed in kPa and MPa, then 101.325 and 0.101325', () => {
    // NIST SP 811 App. B.8 [memory]: standard atmosphere 101 325 Pa exact
    expectRel(convert(101325, 'Pa', 'kPa', 'pressure'), 101.325, EXACT);
    expectRel(convert(101325, 'Pa', 'MPa', 'pressure'), 0.101325, EXACT);
  });

  it('when 1500 cP is converted to Pa·s and 15 P to cP, then 1.5 Pa·s and 1500 cP', () => {
    // NIST SP 811 App. B.8: poise = 0.1 Pa·s [memory]
    expectRel(convert(1500, 'cP', 'Pa.s', 'viscosity'), 1.5, EXACT);
    expectRel(convert(15, 'P', 'cP', 'viscosity'), 1500, EXACT);
    expectRel(convert(1, 'cP', 'mPa.s', 'viscosity'), 1, EXACT);
  });

  it('when 1 in³ and 1 US fl oz are converted to mL, then 16.387064 and 29.5735295625 mL', () => {
    // calculators.md §1 [derived]: fl oz = 231 in³ / 128
    expectRel(convert(1, 'in3', 'mL', 'volume'), 16.387064, EXACT);
    expectRel(convert(1, 'floz', 'mL', 'volume'), 29.5735295625, EXACT);
  });

  it('when cc, mL, cm³, µL and mm³ are compared, then 1 mL = 1 cm³ and 1 µL = 0.001 mL = 1 mm³', () => {
    // NIST SP 811 [memory]
    expectRel(convert(1, 'mL', 'cm3', 'volume'), 1, EXACT);
    expectRel(convert(1, 'uL', 'mL', 'volume'), 0.001, EXACT);
    expectRel(convert(1, 'uL', 'mm3', 'volume'), 1, EXACT);
    expectRel(convert(1, 'L', 'm3', 'volume'), 0.001, EXACT);
  });

  it('when 1 lb and 1 oz are converted to grams, then 453.59237 and 28.349523125 g', () => {
    // NIST SP 811 App. B.8 [memory]; exact by definition of the pound
    expectRel(convert(1, 'lb', 'g', 'mass'), 453.59237, EXACT);
    expectRel(convert(1, 'oz', 'g', 'mass'), 28.349523125, EXACT);
  });

  it('when 1 in and 25 thou are converted to mm, then 25.4 and 0.635 mm', () => {
    // NIST SP 811 App. B.8 [memory]
    expectRel(convert(1, 'in', 'mm', 'length'), 25.4, EXACT);
    expectRel(convert(25, 'thou', 'mm', 'length'), 0.635, EXACT);
  });

  it('when 350 °F is converted, then 176.66667 °C and 449.81667 K', () => {
    // calculators.md §1: T/K = t/°C + 273.15; t/°F = 1.8 t/°C + 32 [derived]
    expectRel(convert(350, 'degF', 'degC', 'temperature'), 176.66666666666667, EXACT);
    expectRel(convert(350, 'degF', 'K', 'temperature'), 449.81666666666666, EXACT);
  });

  it('when −40 °C is converted to °F, then −40 °F', () => {
    // calculators.md §1 edge case [derived]
    expectRel(convert(-40, 'degC', 'degF', 'temperature'), -40, EXACT);
  });

  it('when −300 °C is converted, then it is refused as below absolute zero', () => {
    // calculators.md §1 edge case: reject any temperature below 0 K [derived]
    expect(() => convert(-300, 'degC', 'K', 'temperature')).toThrow(CalculatorInputError);
    expect(() => convert(-500, 'degF', 'degC', 'temperature')).toThrow(/below absolute zero/);
    expect(() => assertAboveAbsoluteZero(-0.001, 'measuredAt', 'Coil temperature')).toThrow(CalculatorInputError);
    expect(() => assertAboveAbsoluteZero(0, 'measuredAt', 'Coil temperature')).not.toThrow();
    const error = catchError(() => assertAboveAbsoluteZero(-1, 'temperature1', 'Temperature 1', 'degC'));
    expect(error).toBeInstanceOf(CalculatorInputError);
    expect((error as CalculatorInputError).fields).toEqual({ 'inputs.temperature1': 'Temperature 1 is below absolute zero (-273.15 °C)' });
  });

  it('when a temperature difference is converted, then no offset applies: 1 K = 1 °C = 1.8 °F', () => {
    // calculators.md §1 warning [derived]
    expectRel(convert(1, 'K', 'degC', 'temperatureDifference'), 1, EXACT);
    expectRel(convert(1, 'degC', 'degF', 'temperatureDifference'), 1.8, EXACT);
    expectRel(convert(50.36979, 'degC', 'K', 'temperatureDifference'), 50.36979, EXACT);
    // A difference below zero is a fall, not a temperature below absolute zero.
    expectRel(convert(-300, 'degC', 'degF', 'temperatureDifference'), -540, EXACT);
  });

  it('when the trade rate units are converted, then ft/min, lbf/in and lb/h match their definitions', () => {
    // derived from the exact inch, pound and standard gravity
    expectRel(toSI(1, 'ft/min', 'speed'), 0.3048 / 60, EXACT);
    expectRel(toSI(1, 'lbf', 'force'), 4.4482216152605, EXACT);
    expectRel(toSI(1, 'lbf/in', 'springRate'), 4.4482216152605 / 0.0254, EXACT);
    expectRel(convert(1, 'lb/h', 'g/h', 'massRate'), 453.59237, EXACT);
    expectRel(convert(300, '1/min', 'Hz', 'frequency'), 5, EXACT);
    expectRel(convert(180, 'deg', 'rad', 'angle'), Math.PI, EXACT);
    expectRel(convert(70, '%', '1', 'dimensionless'), 0.7, EXACT);
    expectRel(convert(1, 'd', 'h', 'time'), 24, EXACT);
  });
});

describe('§1 mathjs cross-check', () => {
  it('when mathjs converts 100 psi to bar, then it agrees within 1e-9 (its psi constant is off by 5.9e-11)', () => {
    // calculators.md §1 npm cross-check: mathjs 15.2.0 gives 6.89475729276459 (verified)
    const fromMath = math.unit(100, 'psi').toNumber('bar');
    expectRel(convert(100, 'psi', 'bar', 'pressure'), fromMath, EXACT);
  });

  it('when mathjs has poise, cP and thou added, then its conversions match ours', () => {
    // calculators.md §1: createUnit('poise','0.1 Pa s'), ('cP','1 mPa s'), ('thou','0.001 in') (verified)
    expectRel(convert(1500, 'cP', 'Pa.s', 'viscosity'), math.unit(1500, 'cP').toNumber('Pa s'), EXACT);
    expectRel(convert(15, 'P', 'cP', 'viscosity'), math.unit(15, 'poise').toNumber('cP'), EXACT);
    expectRel(convert(25, 'thou', 'mm', 'length'), math.unit(25, 'thou').toNumber('mm'), EXACT);
  });

  it('when mathjs converts its built-in trade units, then they match ours', () => {
    // calculators.md §1: floz, cuin, cc, mil, lb, oz, degC and degF exist in mathjs
    expectRel(convert(1, 'floz', 'mL', 'volume'), math.unit(1, 'floz').toNumber('mL'), EXACT);
    expectRel(convert(1, 'in3', 'mL', 'volume'), math.unit(1, 'cuin').toNumber('mL'), EXACT);
    expectRel(convert(1, 'cm3', 'mL', 'volume'), math.unit(1, 'cc').toNumber('mL'), EXACT);
    expectRel(convert(1, 'thou', 'mm', 'length'), math.unit(1, 'mil').toNumber('mm'), EXACT);
    expectRel(convert(1, 'lb', 'g', 'mass'), math.unit(1, 'lb').toNumber('g'), EXACT);
    expectRel(convert(1, 'oz', 'g', 'mass'), math.unit(1, 'oz').toNumber('g'), EXACT);
    expectRel(convert(350, 'degF', 'degC', 'temperature'), math.unit(350, 'degF').toNumber('degC'), EXACT);
    // mathjs gives 211.99999999999997 here, hence a tolerance rather than equality.
    expectRel(convert(100, 'degC', 'degF', 'temperature'), math.unit(100, 'degC').toNumber('degF'), EXACT);
  });
});

describe('round trips', () => {
  const cases = QUANTITY_KINDS.flatMap((kind) => UNITS[kind].map((spec) => ({ kind, unit: spec.unit })));

  it.each(cases)('when 123.456 $unit ($kind) goes to SI and back, then it returns unchanged', ({ kind, unit }) => {
    // derived: toSI and fromSI are inverses
    expectRel(fromSI(toSI(123.456, unit, kind), unit, kind), 123.456, 1e-12);
  });

  it('when any value goes through any pair of units of a kind and back, then it returns unchanged (property)', () => {
    // derived: conversion is invertible for every spelling
    const pair = fc
      .constantFrom(...QUANTITY_KINDS)
      .chain((kind) => fc.tuple(fc.constant(kind), fc.constantFrom(...UNITS[kind].map((s) => s.unit)), fc.constantFrom(...UNITS[kind].map((s) => s.unit))));
    fc.assert(
      fc.property(pair, fc.double({ min: 1, max: 1e6, noNaN: true }), ([kind, from, to], value) => {
        const back = convert(convert(value, from, to, kind), to, from, kind);
        return Math.abs(back - value) <= 1e-9 * Math.abs(value);
      }),
    );
  });
});
