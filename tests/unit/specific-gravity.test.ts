import { describe, it, expect } from 'vitest'
import {
  DEFAULT_CELL_SPREAD_THRESHOLD,
  DEFAULT_SG_POLICY,
  IEEE450_SG_POLICY,
  cellCountForNominalVoltage,
  cellSpread,
  correctedSpecificGravity,
  formatSpecificGravity,
  nominalVoltsPerCell,
  openCircuitVoltsPerCell,
  parseSpecificGravityEntry,
  specificGravityFromOpenCircuitVolts,
  stateOfChargeFromSpecificGravity,
} from '../../shared/utils/specific-gravity'
import { celsiusToFahrenheit } from '../../shared/utils/units'

describe('correctedSpecificGravity', () => {
  // Worked examples referenced to 80 °F, 0.004 per 10 °F [pub, in several battery and engine manuals]
  it('1.250 read at 20 °F corrects to 1.226 [pub, in several battery and engine manuals]', () => {
    expect(correctedSpecificGravity(1.250, 20)).toBeCloseTo(1.226, 6)
    expect(formatSpecificGravity(correctedSpecificGravity(1.250, 20))).toBe('1.226')
  })

  it('1.235 read at 100 °F corrects to 1.243 [pub, in several battery and engine manuals]', () => {
    expect(correctedSpecificGravity(1.235, 100)).toBeCloseTo(1.243, 6)
    expect(formatSpecificGravity(correctedSpecificGravity(1.235, 100))).toBe('1.243')
  })

  it('leaves a reading at the reference temperature unchanged and does not round', () => {
    expect(correctedSpecificGravity(1.2805, 80)).toBe(1.2805)
    expect(correctedSpecificGravity(1.250, 81)).toBeCloseTo(1.2504, 9)
  })

  it('default policy is 80 °F and 0.004 per 10 °F [pub, US Army TM 5-1185 reference temperature]', () => {
    expect(DEFAULT_SG_POLICY.referenceTempF).toBe(80)
    expect(DEFAULT_SG_POLICY.correctionPerDegF * 10).toBeCloseTo(0.004, 12)
  })

  // 0.004 per 10 °F is about 0.0007 per °C [pub, battery makers' manuals; common practice]: a metric site reads °C,
  // converted at the edge (units.ts) to the stored °F, with its reference at 25 °C (77 °F).
  it('1.280 read at 35 °C corrected to 25 °C gives about 1.287 [pub, battery makers\' manuals, common practice]', () => {
    const metric = { referenceTempF: celsiusToFahrenheit(25), correctionPerDegF: DEFAULT_SG_POLICY.correctionPerDegF }
    expect(metric.referenceTempF).toBeCloseTo(77, 12)
    expect(correctedSpecificGravity(1.280, celsiusToFahrenheit(35), metric)).toBeCloseTo(1.287, 3)
    expect(formatSpecificGravity(correctedSpecificGravity(1.280, celsiusToFahrenheit(35), metric))).toBe('1.287')
    // per degree Celsius: 0.0004 × 9/5 = 0.00072, "about 0.0007 per °C"
    expect(DEFAULT_SG_POLICY.correctionPerDegF * 9 / 5).toBeCloseTo(0.0007, 4)
  })

  it('IEEE 450 policy: 0.001 per 3 °F from 77 °F [mem]', () => {
    expect(correctedSpecificGravity(1.215, 86, IEEE450_SG_POLICY)).toBeCloseTo(1.218, 9)
    expect(correctedSpecificGravity(1.215, 68, IEEE450_SG_POLICY)).toBeCloseTo(1.212, 9)
  })
})

describe('stateOfChargeFromSpecificGravity', () => {
  // Table corrected to 80 °F [pub, US Army TM 5-1185]
  it.each([
    [1.280, 100],
    [1.250, 75],
    [1.220, 50],
    [1.190, 25],
    [1.130, 0],
  ])('%s → %s %% [pub, US Army TM 5-1185]', (sg, percent) => {
    expect(stateOfChargeFromSpecificGravity(sg)).toBeCloseTo(percent, 9)
  })

  it('1.160 "nearly flat" [pub, US Army TM 5-1185] falls at 12.5 % on the 1.190–1.130 line', () => {
    expect(stateOfChargeFromSpecificGravity(1.160)).toBeCloseTo(12.5, 9)
  })

  it('interpolates between table rows and clamps to 0–100', () => {
    expect(stateOfChargeFromSpecificGravity(1.265)).toBeCloseTo(87.5, 9)
    expect(stateOfChargeFromSpecificGravity(1.300)).toBe(100)
    expect(stateOfChargeFromSpecificGravity(1.100)).toBe(0)
  })
})

describe('open-circuit volts', () => {
  it('volts per cell ≈ SG + 0.84 [pub, a truck maker\'s manual]', () => {
    expect(openCircuitVoltsPerCell(1.280)).toBeCloseTo(2.12, 9)
    expect(openCircuitVoltsPerCell(1.130)).toBeCloseTo(1.97, 9)
    expect(specificGravityFromOpenCircuitVolts(2.09)).toBeCloseTo(1.250, 9)
  })

  it('round-trips', () => {
    expect(specificGravityFromOpenCircuitVolts(openCircuitVoltsPerCell(1.215))).toBeCloseTo(1.215, 12)
  })
})

describe('cells per nominal voltage', () => {
  // 2 V nominal per lead-acid cell [practice]
  it.each([
    [24, 12],
    [36, 18],
    [48, 24],
    [72, 36],
    [80, 40],
  ])('%s V lead-acid = %s cells [practice]', (volts, cells) => {
    expect(cellCountForNominalVoltage(volts, 'flooded_lead_acid')).toBe(cells)
    expect(cellCountForNominalVoltage(volts, 'agm')).toBe(cells)
  })

  it('lead-acid is 2.0 V per cell [practice]; lithium-ion taken as LFP 3.2 V [mem]', () => {
    expect(nominalVoltsPerCell('gel')).toBe(2.0)
    expect(nominalVoltsPerCell('lithium_ion')).toBe(3.2)
    expect(cellCountForNominalVoltage(51.2, 'lithium_ion')).toBe(16)
    expect(cellCountForNominalVoltage(25.6, 'lithium_ion')).toBe(8)
  })

  it('returns null when the voltage is not a whole number of cells', () => {
    expect(cellCountForNominalVoltage(25, 'flooded_lead_acid')).toBeNull()
    expect(cellCountForNominalVoltage(24, 'lithium_ion')).toBeNull()
    expect(cellCountForNominalVoltage(0, 'flooded_lead_acid')).toBeNull()
    expect(cellCountForNominalVoltage(Number.NaN, 'flooded_lead_acid')).toBeNull()
  })
})

describe('parseSpecificGravityEntry', () => {
  it.each([
    ['1.280', 1.280],
    [' 1.280 ', 1.280],
    ['1,280', 1.280],
    ['1280', 1.280],
    ['1.28', 1.28],
    ['128', 1.28],
    ['1.000', 1.000],
    ['1', 1.000],
    ['1400', 1.400],
    ['1.2155', 1.2155],
  ])('reads %j as %s', (text, value) => {
    expect(parseSpecificGravityEntry(text)).toEqual({ ok: true, value })
  })

  it('refuses a value outside 1.000–1.400 in plain words', () => {
    expect(parseSpecificGravityEntry('1.9')).toEqual({ ok: false, message: '1.9 is outside 1.000–1.400; read the float again.' })
    expect(parseSpecificGravityEntry('1401')).toEqual({ ok: false, message: '1.401 is outside 1.000–1.400; read the float again.' })
    expect(parseSpecificGravityEntry('0,98')).toMatchObject({ ok: false, message: '0.98 is outside 1.000–1.400; read the float again.' })
    expect(parseSpecificGravityEntry('280')).toMatchObject({ ok: false })
  })

  it('refuses empty and garbage entries', () => {
    expect(parseSpecificGravityEntry('')).toMatchObject({ ok: false, message: expect.stringContaining('Enter the specific gravity') })
    expect(parseSpecificGravityEntry('   ')).toMatchObject({ ok: false })
    expect(parseSpecificGravityEntry('abc')).toEqual({ ok: false, message: '"abc" is not a specific gravity; enter it like 1.280.' })
    expect(parseSpecificGravityEntry('1.2.8')).toMatchObject({ ok: false })
    expect(parseSpecificGravityEntry('-1.2')).toMatchObject({ ok: false })
  })
})

describe('cellSpread', () => {
  it('default low-cell threshold is 0.020 [practice]', () => {
    expect(DEFAULT_CELL_SPREAD_THRESHOLD).toBe(0.020)
  })

  it('finds mean, extremes, spread and the cells more than 0.020 below the mean [practice]', () => {
    const result = cellSpread([1.280, 1.275, 1.250, 1.285, 1.280, 1.230])!
    expect(result.mean).toBeCloseTo(1.2666667, 6)
    expect(result.max).toBe(1.285)
    expect(result.min).toBe(1.230)
    expect(result.spread).toBeCloseTo(0.055, 9)
    expect(result.lowCells).toEqual([6])
  })

  it('a cell exactly at the threshold below the mean is not low', () => {
    expect(cellSpread([1.280, 1.260], 0.010)!.lowCells).toEqual([])
    expect(cellSpread([1.280, 1.259], 0.010)!.lowCells).toEqual([2])
  })

  it('takes the threshold as a setting', () => {
    const readings = [1.280, 1.280, 1.280, 1.265]
    expect(cellSpread(readings)!.lowCells).toEqual([])
    expect(cellSpread(readings, 0.010)!.lowCells).toEqual([4])
  })

  it('one reading has no spread and no low cell; no readings gives null', () => {
    expect(cellSpread([1.265])).toEqual({ mean: 1.265, max: 1.265, min: 1.265, spread: 0, lowCells: [] })
    expect(cellSpread([])).toBeNull()
  })

  it('refuses a reading that is not a number', () => {
    expect(() => cellSpread([1.280, Number.NaN])).toThrow(RangeError)
  })
})
