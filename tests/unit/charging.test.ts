import { describe, it, expect } from 'vitest'
import { evaluate, faraday, unit } from 'mathjs'
import {
  COUNTED_CYCLE_MIN_FRACTION,
  DEFAULT_MAX_CHARGE_TEMP_F,
  DEFAULT_MAX_DEPTH_OF_DISCHARGE_PERCENT,
  US_FLUID_OUNCE_ML,
  depthOfDischargePercent,
  energyCost,
  exceedsDepthOfDischarge,
  gridEnergyKwh,
  isCountedCycle,
  overchargeWaterLossFluidOunces,
  overchargeWaterLossGrams,
  ranHot,
} from '../../shared/utils/charging'

describe('gridEnergyKwh', () => {
  it('Ah × V in kWh matches mathjs units, divided by charger efficiency', () => {
    const batteryKwh = evaluate('700 A * 1 h * 48 V').toNumber('kWh')
    expect(gridEnergyKwh(700, 48, 1)).toBeCloseTo(batteryKwh, 9)
    expect(gridEnergyKwh(700, 48, 0.8)).toBeCloseTo(batteryKwh / 0.8, 9)
    expect(gridEnergyKwh(0, 48, 0.9)).toBe(0)
  })

  it('refuses an efficiency at or below 0 or above 1', () => {
    expect(() => gridEnergyKwh(700, 48, 0)).toThrow(RangeError)
    expect(() => gridEnergyKwh(700, 48, -0.5)).toThrow(RangeError)
    expect(() => gridEnergyKwh(700, 48, 1.01)).toThrow(RangeError)
    expect(() => gridEnergyKwh(700, 48, Number.NaN)).toThrow(RangeError)
  })

  it('refuses negative amp-hours and a voltage at or below 0', () => {
    expect(() => gridEnergyKwh(-1, 48, 0.9)).toThrow(RangeError)
    expect(() => gridEnergyKwh(700, 0, 0.9)).toThrow(RangeError)
  })
})

describe('energyCost', () => {
  it('kWh × tariff, unrounded', () => {
    expect(energyCost(42, 0.135)).toBeCloseTo(5.67, 9)
    expect(energyCost(0, 0.2)).toBe(0)
  })
})

describe('ranHot', () => {
  it('above 115 °F by default [mem: keep under about 110–115 °F during charge]', () => {
    expect(DEFAULT_MAX_CHARGE_TEMP_F).toBe(115)
    expect(ranHot(115)).toBe(false)
    expect(ranHot(115.5)).toBe(true)
    expect(ranHot(111, 110)).toBe(true)
  })
})

describe('depth of discharge', () => {
  it('percent of rated capacity put back', () => {
    expect(depthOfDischargePercent(620, 775)).toBeCloseTo(80, 9)
    expect(depthOfDischargePercent(387.5, 775)).toBeCloseTo(50, 9)
    expect(() => depthOfDischargePercent(100, 0)).toThrow(RangeError)
  })

  it('beyond 80 % exceeds the limit, at 80 % does not [practice]', () => {
    expect(DEFAULT_MAX_DEPTH_OF_DISCHARGE_PERCENT).toBe(80)
    expect(exceedsDepthOfDischarge(620, 775)).toBe(false)
    expect(exceedsDepthOfDischarge(628, 775)).toBe(true)
    expect(exceedsDepthOfDischarge(628, 775, 90)).toBe(false)
  })
})

describe('water lost to overcharge', () => {
  // Faraday's law with mathjs's CODATA faraday: one H2O per 2 F [calc]
  it('matches 3600 / (2 F) × 18.015 g/mol per Ah per cell [calc]', () => {
    const gramsPerAhPerCell = 3600 / (2 * faraday.toNumber('C/mol')) * 18.015
    expect(overchargeWaterLossGrams(40, 24)).toBeCloseTo(40 * 24 * gramsPerAhPerCell, 6)
    expect(overchargeWaterLossGrams(40, 24)).toBeCloseTo(322.6, 1)
  })

  it('0.336 g per Ah per cell [calc]', () => {
    expect(overchargeWaterLossGrams(1, 1)).toBeCloseTo(0.336, 3)
  })

  it('US fluid ounces at 1 g/mL match mathjs floz', () => {
    expect(US_FLUID_OUNCE_ML).toBeCloseTo(unit(1, 'floz').toNumber('mL'), 10)
    const grams = overchargeWaterLossGrams(40, 24)
    expect(overchargeWaterLossFluidOunces(40, 24)).toBeCloseTo(unit(grams, 'mL').toNumber('floz'), 9)
  })
})

describe('isCountedCycle', () => {
  const charge = (ampHoursReturned: number | null, complete = true) => ({ complete, ampHoursReturned, ratedAh: 775 })

  it('counts a charge that put back at least 20 % of rated capacity [practice]', () => {
    expect(COUNTED_CYCLE_MIN_FRACTION).toBe(0.2)
    expect(isCountedCycle(charge(155))).toBe(true)
    expect(isCountedCycle(charge(154))).toBe(false)
  })

  it('counts an interrupted charge that returned enough, not a complete top-up', () => {
    expect(isCountedCycle(charge(400, false))).toBe(true)
    expect(isCountedCycle(charge(60, true))).toBe(false)
  })

  it('without an amp-hour figure, a complete charge counts and an interrupted one does not', () => {
    expect(isCountedCycle(charge(null, true))).toBe(true)
    expect(isCountedCycle(charge(null, false))).toBe(false)
  })
})
