import { describe, it, expect } from 'vitest'
import { faraday, gasConstant, molarVolume, unit } from 'mathjs'
import {
  FARADAY_C_PER_MOL,
  GAS_CONSTANT_J_PER_MOL_K,
  hydrogenLitresPerAmpHourPerCell,
  hydrogenMolPerAmpHourPerCell,
  idealGasLitres,
  waterGramsPerAmpHourPerCell,
} from '../../shared/utils/faraday'

const relativeError = (value: number, reference: number) => Math.abs(value - reference) / Math.abs(reference)
const significant = (value: number, digits: number) => Number(value.toPrecision(digits))

describe('constants against mathjs (CODATA 2018)', () => {
  it('Faraday constant matches mathjs faraday', () => {
    expect(relativeError(FARADAY_C_PER_MOL, faraday.toNumber('C/mol'))).toBeLessThan(1e-10)
  })

  it('molar gas constant matches mathjs gasConstant', () => {
    expect(relativeError(GAS_CONSTANT_J_PER_MOL_K, gasConstant.toNumber('J/(mol K)'))).toBeLessThan(1e-10)
  })

  it('one mole of ideal gas at 0 °C, 1 atm matches mathjs molarVolume', () => {
    expect(relativeError(idealGasLitres(1, 0), molarVolume.toNumber('L/mol'))).toBeLessThan(1e-9)
  })
})

describe('hydrogen per ampere-hour of overcharge', () => {
  it('3600 / (2 F) = 0.018656 mol per Ah per cell [calc]', () => {
    expect(hydrogenMolPerAmpHourPerCell()).toBeCloseTo(0.018656, 6)
    expect(relativeError(hydrogenMolPerAmpHourPerCell(), 3600 / (2 * faraday.toNumber('C/mol')))).toBeLessThan(1e-10)
  })

  it('0.4181 L at 0 °C, 1 atm [calc]', () => {
    expect(hydrogenLitresPerAmpHourPerCell(0)).toBeCloseTo(0.4181, 4)
  })

  it('0.4564 L at 25 °C, 1 atm [calc]', () => {
    expect(hydrogenLitresPerAmpHourPerCell(25)).toBeCloseTo(0.4564, 4)
  })

  // One charging ampere for one hour is one ampere-hour, so litres per Ah are litres per hour per ampere.
  it('0.000269 ft³/min per charging ampere per cell at 77 °F (IEEE 484 figure) [pub], to 3 significant figures', () => {
    const celsius = unit(77, 'degF').toNumber('degC')
    const litresPerHour = hydrogenLitresPerAmpHourPerCell(celsius)
    const cfm = unit(litresPerHour, 'L').toNumber('ft^3') / unit(1, 'hour').toNumber('min')
    expect(significant(cfm, 3)).toBe(0.000269)
    expect(significant(unit(litresPerHour, 'L/hour').toNumber('ft^3/min'), 3)).toBe(0.000269)
  })

  it('0.127 mL/s per charging ampere per cell at 77 °F (IEEE 484 figure) [pub]', () => {
    const celsius = unit(77, 'degF').toNumber('degC')
    const mlPerSecond = unit(hydrogenLitresPerAmpHourPerCell(celsius), 'L/hour').toNumber('mL/s')
    expect(significant(mlPerSecond, 3)).toBe(0.127)
  })
})

describe('water per ampere-hour of overcharge', () => {
  it('0.336 g per Ah per cell [calc]', () => {
    expect(waterGramsPerAmpHourPerCell()).toBeCloseTo(0.336, 3)
  })
})
