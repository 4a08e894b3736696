import { describe, it, expect } from 'vitest'
import { unit } from 'mathjs'
import {
  ENTRY_UNITS,
  defaultSgReferenceTempF,
  fromStoredUnits,
  toStoredUnits,
  celsiusToFahrenheit,
  cfmToM3PerHour,
  fahrenheitToCelsius,
  formatAirflow,
  formatDensity,
  storedUnitParam,
  lbPerGalToKgPerLitre,
  formatArea,
  formatLength,
  formatRoomVolume,
  formatTemperature,
  formatVolume,
  formatWeight,
  ft2ToM2,
  ft3ToM3,
  inToMm,
  kgToLb,
  lbToKg,
  litresToUsGal,
  m2ToFt2,
  m3PerHourToCfm,
  m3ToFt3,
  mmToIn,
  usGalToLitres,
} from '../../shared/utils/units'

// Outside reference for every factor: mathjs unit definitions.
const ref = (value: number, from: string, to: string) => unit(value, from).toNumber(to)

describe('conversion factors against mathjs units', () => {
  it('lb ↔ kg (mathjs lbm → kg)', () => {
    expect(lbToKg(1)).toBeCloseTo(ref(1, 'lbm', 'kg'), 12)
    expect(lbToKg(2000)).toBeCloseTo(ref(2000, 'lbm', 'kg'), 9)
    expect(kgToLb(907)).toBeCloseTo(ref(907, 'kg', 'lbm'), 9)
  })

  it('in ↔ mm (mathjs inch → mm)', () => {
    expect(inToMm(1)).toBeCloseTo(ref(1, 'inch', 'mm'), 12)
    expect(mmToIn(6.35)).toBeCloseTo(ref(6.35, 'mm', 'inch'), 12)
  })

  it('°F ↔ °C (mathjs degF → degC)', () => {
    for (const f of [-40, 0, 32, 60, 77, 80, 100, 212]) {
      expect(fahrenheitToCelsius(f)).toBeCloseTo(ref(f, 'degF', 'degC'), 9)
    }
    for (const c of [-40, 0, 25, 100]) {
      expect(celsiusToFahrenheit(c)).toBeCloseTo(ref(c, 'degC', 'degF'), 9)
    }
  })

  it('ft² ↔ m² (mathjs ft^2 → m^2)', () => {
    expect(ft2ToM2(1)).toBeCloseTo(ref(1, 'ft^2', 'm^2'), 12)
    expect(m2ToFt2(100)).toBeCloseTo(ref(100, 'm^2', 'ft^2'), 9)
  })

  it('ft³ ↔ m³ (mathjs ft^3 → m^3)', () => {
    expect(ft3ToM3(1)).toBeCloseTo(ref(1, 'ft^3', 'm^3'), 12)
    expect(m3ToFt3(1)).toBeCloseTo(ref(1, 'm^3', 'ft^3'), 9)
  })

  it('cfm ↔ m³/h (mathjs ft^3/min → m^3/h)', () => {
    expect(cfmToM3PerHour(1)).toBeCloseTo(ref(1, 'ft^3/min', 'm^3/h'), 12)
    expect(m3PerHourToCfm(18.6)).toBeCloseTo(ref(18.6, 'm^3/h', 'ft^3/min'), 9)
  })

  it('US gal ↔ L (mathjs gal → L)', () => {
    expect(usGalToLitres(1)).toBeCloseTo(ref(1, 'gal', 'L'), 12)
    expect(litresToUsGal(100)).toBeCloseTo(ref(100, 'L', 'gal'), 9)
  })

  it('round trips return the input', () => {
    expect(kgToLb(lbToKg(33.5))).toBeCloseTo(33.5, 12)
    expect(celsiusToFahrenheit(fahrenheitToCelsius(77))).toBeCloseTo(77, 12)
    expect(m3PerHourToCfm(cfmToM3PerHour(128.9))).toBeCloseTo(128.9, 12)
  })
})

describe('display formatting', () => {
  it('weight: 2,000 lb / 907 kg', () => {
    expect(formatWeight(2000, 'us')).toBe('2,000 lb')
    expect(formatWeight(2000, 'metric')).toBe('907 kg')
    expect(formatWeight(33.5, 'us')).toBe('33.5 lb')
    expect(formatWeight(33.5, 'metric')).toBe('15.2 kg')
    expect(formatWeight(2000, 'metric', { decimals: 2 })).toBe('907.18 kg')
  })

  it('temperature keeps one decimal at most', () => {
    expect(formatTemperature(77, 'us')).toBe('77 °F')
    expect(formatTemperature(77, 'metric')).toBe('25 °C')
    expect(formatTemperature(80, 'metric')).toBe('26.7 °C')
    expect(formatTemperature(20, 'metric')).toBe('-6.7 °C')
  })

  it('liquid volume, room volume, airflow, length and area', () => {
    expect(formatVolume(100, 'us')).toBe('100 gal')
    expect(formatVolume(100, 'metric')).toBe('379 L')
    expect(formatRoomVolume(10000, 'metric')).toBe('283 m³')
    expect(formatAirflow(128.9, 'us')).toBe('129 cfm')
    expect(formatAirflow(128.9, 'metric')).toBe('219 m³/h')
    expect(formatLength(0.25, 'us')).toBe('0.25 in')
    expect(formatLength(0.25, 'metric')).toBe('6.4 mm')
    expect(formatArea(1200, 'us')).toBe('1,200 ft²')
    expect(formatArea(1200, 'metric')).toBe('111 m²')
  })

  it('shows a dash for a value that is not a number', () => {
    expect(formatWeight(Number.NaN, 'us')).toBe('—')
  })
})

// What a form on a metric site sends is converted to the stored US units, checked against mathjs (a general-purpose
// library this project did not write) rather than against our own factors.
describe('entry in the site\'s units', () => {
  it('converts °C, L and kg to the stored °F, US gal and lb, and back', () => {
    expect(toStoredUnits('temperature', 25, 'metric')).toBeCloseTo(unit(25, 'degC').toNumber('degF'), 9)
    expect(toStoredUnits('volume', 2, 'metric')).toBeCloseTo(unit(2, 'L').toNumber('gal'), 9)
    expect(toStoredUnits('weight', 1000, 'metric')).toBeCloseTo(unit(1000, 'kg').toNumber('lbm'), 9)
    for (const q of ['temperature', 'volume', 'weight'] as const) {
      expect(fromStoredUnits(q, toStoredUnits(q, 37.5, 'metric'), 'metric')).toBeCloseTo(37.5, 9)
      expect(toStoredUnits(q, 37.5, 'us')).toBe(37.5)
    }
  })

  it('propane density 4.2 lb/US gal in kg/L (mathjs lbm/gal → kg/L), for the refill form\'s volume note', () => {
    expect(lbPerGalToKgPerLitre(4.2)).toBeCloseTo(unit(4.2, 'lbm/gal').toNumber('kg/L'), 12)
    expect(formatDensity(4.2, 'metric')).toBe(`${unit(4.2, 'lbm/gal').toNumber('kg/L').toFixed(3)} kg/L`)
    expect(formatDensity(4.2, 'us')).toBe('4.2 lb/gal')
  })

  it('a scale read in kg on a metric site is checked in pounds: 17.5 kg of propane (mathjs kg → lbm)', () => {
    expect(toStoredUnits('weight', 17.5, 'metric')).toBeCloseTo(unit(17.5, 'kg').toNumber('lbm'), 9)
    expect(formatWeight(toStoredUnits('weight', 17.5, 'metric'), 'metric')).toBe('17.5 kg')
  })

  it('a reason\'s stored-unit parameter reads in the site\'s units under its bare name (mathjs lbm → kg, inch → mm, degF → degC, gal → L)', () => {
    expect(storedUnitParam('over_lb', 1.61, 'metric')).toEqual(['over', `${unit(1.61, 'lbm').toNumber('kg').toFixed(2)} kg`])
    expect(storedUnitParam('battery_in', 39, 'metric')).toEqual(['battery', `${Math.round(unit(39, 'inch').toNumber('mm'))} mm`])
    expect(storedUnitParam('end_f', 96, 'metric')).toEqual(['end', `${unit(96, 'degF').toNumber('degC').toFixed(1)} °C`])
    expect(storedUnitParam('water_gal', 2, 'metric')).toEqual(['water', `${unit(2, 'gal').toNumber('L').toFixed(1)} L`])
    expect(storedUnitParam('over_lb', 1.6, 'us')).toEqual(['over', '1.6 lb'])
    expect(storedUnitParam('percent', 42, 'metric')).toBeNull()
  })

  it('names the units a site types in; a metric site reads specific gravity against 25 °C (77 °F)', () => {
    expect(ENTRY_UNITS.metric).toEqual({ temperature: '°C', volume: 'L', weight: 'kg' })
    expect(ENTRY_UNITS.us).toEqual({ temperature: '°F', volume: 'US gal', weight: 'lb' })
    expect(defaultSgReferenceTempF('metric')).toBeCloseTo(unit(25, 'degC').toNumber('degF'), 9)
    expect(defaultSgReferenceTempF('us')).toBe(80)
  })
})
