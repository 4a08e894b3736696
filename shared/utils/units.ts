// Display conversions between the stored US customary units and metric.
// Every factor is an exact definition (international yard and pound agreement, 1959; US gallon = 231 in³).

import { keptNumberFormat } from './intl-formats'

export type UnitSystem = 'us' | 'metric'

/** Kilograms in one avoirdupois pound (exact). */
export const KG_PER_LB = 0.45359237
/** Millimetres in one inch (exact). */
export const MM_PER_IN = 25.4
/** Square metres in one square foot (exact: 0.3048²). */
export const M2_PER_FT2 = 0.09290304
/** Cubic metres in one cubic foot (exact: 0.3048³). */
export const M3_PER_FT3 = 0.028316846592
/** Cubic metres per hour in one cubic foot per minute (exact: 0.3048³ × 60). */
export const M3H_PER_CFM = M3_PER_FT3 * 60
/** Litres in one US liquid gallon (exact: 231 in³). */
export const LITRES_PER_US_GAL = 3.785411784

export function lbToKg(lb: number): number {
  return lb * KG_PER_LB
}

export function kgToLb(kg: number): number {
  return kg / KG_PER_LB
}

export function inToMm(inches: number): number {
  return inches * MM_PER_IN
}

export function mmToIn(mm: number): number {
  return mm / MM_PER_IN
}

export function fahrenheitToCelsius(fahrenheit: number): number {
  return (fahrenheit - 32) * 5 / 9
}

export function celsiusToFahrenheit(celsius: number): number {
  return celsius * 9 / 5 + 32
}

export function ft2ToM2(ft2: number): number {
  return ft2 * M2_PER_FT2
}

export function m2ToFt2(m2: number): number {
  return m2 / M2_PER_FT2
}

export function ft3ToM3(ft3: number): number {
  return ft3 * M3_PER_FT3
}

export function m3ToFt3(m3: number): number {
  return m3 / M3_PER_FT3
}

export function cfmToM3PerHour(cfm: number): number {
  return cfm * M3H_PER_CFM
}

export function m3PerHourToCfm(m3h: number): number {
  return m3h / M3H_PER_CFM
}

export function usGalToLitres(gal: number): number {
  return gal * LITRES_PER_US_GAL
}

export function litresToUsGal(litres: number): number {
  return litres / LITRES_PER_US_GAL
}

/** A liquid's density in pounds per US gallon, in kilograms per litre. */
export function lbPerGalToKgPerLitre(lbPerGal: number): number {
  return lbPerGal * KG_PER_LB / LITRES_PER_US_GAL
}

/** A liquid's density (stored lb per US gal) as the site reads it: '4.2 lb/gal' or '0.503 kg/L'. */
export function formatDensity(lbPerGal: number, system: UnitSystem): string {
  return system === 'metric' ? `${lbPerGalToKgPerLitre(lbPerGal).toFixed(3)} kg/L` : `${lbPerGal} lb/gal`
}

export interface UnitFormatOptions {
  /** Fixed number of decimals; by default 0 from 100 up, 1 from 1 up, 2 below 1. */
  decimals?: number
}

// Fewer decimals for bigger numbers, so '2,000 lb' and '33.5 lb' both read naturally.
function displayDecimals(value: number, options: UnitFormatOptions | undefined): number {
  if (options?.decimals !== undefined) return options.decimals
  const magnitude = Math.abs(value)
  if (magnitude >= 100) return 0
  if (magnitude >= 1) return 1
  return 2
}

function formatQuantity(value: number, symbol: string, options: UnitFormatOptions | undefined): string {
  if (!Number.isFinite(value)) return '—'
  const decimals = displayDecimals(value, options)
  const text = keptNumberFormat('en-US', { maximumFractionDigits: decimals, minimumFractionDigits: 0 })
    .format(value)
  return `${text === '-0' ? '0' : text} ${symbol}`
}

export function formatWeight(lb: number, system: UnitSystem, options?: UnitFormatOptions): string {
  return system === 'metric' ? formatQuantity(lbToKg(lb), 'kg', options) : formatQuantity(lb, 'lb', options)
}

export function formatTemperature(fahrenheit: number, system: UnitSystem, options?: UnitFormatOptions): string {
  const opts = options ?? { decimals: 1 }
  return system === 'metric'
    ? formatQuantity(fahrenheitToCelsius(fahrenheit), '°C', opts)
    : formatQuantity(fahrenheit, '°F', opts)
}

/** Liquid volume stored in US gallons. */
export function formatVolume(gal: number, system: UnitSystem, options?: UnitFormatOptions): string {
  return system === 'metric' ? formatQuantity(usGalToLitres(gal), 'L', options) : formatQuantity(gal, 'gal', options)
}

/** Room or gas volume stored in cubic feet. */
export function formatRoomVolume(ft3: number, system: UnitSystem, options?: UnitFormatOptions): string {
  return system === 'metric' ? formatQuantity(ft3ToM3(ft3), 'm³', options) : formatQuantity(ft3, 'ft³', options)
}

export function formatAirflow(cfm: number, system: UnitSystem, options?: UnitFormatOptions): string {
  return system === 'metric' ? formatQuantity(cfmToM3PerHour(cfm), 'm³/h', options) : formatQuantity(cfm, 'cfm', options)
}

export function formatLength(inches: number, system: UnitSystem, options?: UnitFormatOptions): string {
  return system === 'metric' ? formatQuantity(inToMm(inches), 'mm', options) : formatQuantity(inches, 'in', options)
}

export function formatArea(ft2: number, system: UnitSystem, options?: UnitFormatOptions): string {
  return system === 'metric' ? formatQuantity(ft2ToM2(ft2), 'm²', options) : formatQuantity(ft2, 'ft²', options)
}

/** What a floor form and a setting take and show, in the site's units; Bayward stores °F, US gallons and pounds. */
export type EntryQuantity = 'temperature' | 'volume' | 'weight'

export const ENTRY_UNITS: Record<UnitSystem, Record<EntryQuantity, string>> = {
  us: { temperature: '°F', volume: 'US gal', weight: 'lb' },
  metric: { temperature: '°C', volume: 'L', weight: 'kg' },
}

/** A value typed in the site's units, in the unit Bayward stores (°F, US gal, lb). */
export function toStoredUnits(quantity: EntryQuantity, value: number, system: UnitSystem): number {
  if (system === 'us') return value
  return quantity === 'temperature' ? celsiusToFahrenheit(value) : quantity === 'volume' ? litresToUsGal(value) : kgToLb(value)
}

/** A stored value (°F, US gal, lb) in the site's units, for showing and for pre-filling a field. */
export function fromStoredUnits(quantity: EntryQuantity, value: number, system: UnitSystem): number {
  if (system === 'us') return value
  return quantity === 'temperature' ? fahrenheitToCelsius(value) : quantity === 'volume' ? usGalToLitres(value) : lbToKg(value)
}

/** The specific-gravity reference temperature a new site starts with: 25 °C (77 °F) metric, 80 °F US (TM 5-1185). */
export const defaultSgReferenceTempF = (system: UnitSystem): number => (system === 'metric' ? 77 : 80)

const STORED_UNIT_FORMATS: Record<string, (value: number, system: UnitSystem) => string> = {
  lb: formatWeight, gal: formatVolume, in: formatLength, f: formatTemperature,
}

/**
 * A reason's parameter sent in a stored unit, named by its suffix (`over_lb: 1.6`), as the site reads it under
 * its bare name (`['over', '0.73 kg']`); null for a parameter with no unit suffix.
 */
export function storedUnitParam(name: string, value: number, system: UnitSystem): [name: string, text: string] | null {
  const unit = /_(lb|gal|in|f)$/.exec(name)?.[1]
  return unit ? [name.slice(0, -unit.length - 1), STORED_UNIT_FORMATS[unit]!(value, system)] : null
}
