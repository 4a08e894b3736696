import { hydrogenLitresPerAmpHourPerCell } from './faraday'
import { M3_PER_FT3, fahrenheitToCelsius } from './units'

// Hydrogen from gassing batteries and the exhaust airflow that keeps it below the design concentration.

/** Hydrogen lower flammable limit in air, fraction by volume (4 %). */
export const HYDROGEN_LFL_FRACTION = 0.04
/** Usual design limit: 1 % by volume, a quarter of the lower flammable limit. */
export const HYDROGEN_DESIGN_FRACTION = 0.01
/** Prescriptive alternative: 1 cfm of exhaust per ft² of floor area (International Mechanical Code 502.4 as adopted). */
export const PRESCRIPTIVE_EXHAUST_CFM_PER_FT2 = 1

export const VENTILATION_SCOPE_CAUTION
  = 'The hydrogen-concentration and floor-area rules come from fire and mechanical code sections written for stationary battery systems; truck charging is also covered by NFPA 505 and IFC 309. The authority having jurisdiction decides what applies.'

const LITRES_PER_FT3 = M3_PER_FT3 * 1000

// Faraday's law at 1 atm: one ampere through one cell for one minute, as ft³ of H2. At 77 °F this is
// 0.000269 cfm per A per cell, the figure IEEE 484 gives.
export function hydrogenCfmPerAmpPerCell(tempF = 77): number {
  return hydrogenLitresPerAmpHourPerCell(fahrenheitToCelsius(tempF)) / 60 / LITRES_PER_FT3
}

export interface GassingSource {
  /** Current driven through the battery while it gasses (finishing or equalize current), A. */
  gassingCurrentA: number
  /** Cells per battery. */
  cells: number
  /** Batteries charging like this at the same time. */
  batteries: number
}

/** Hydrogen (cfm) from all batteries gassing at once. */
export function hydrogenEvolvedCfm(sources: readonly GassingSource[], tempF = 77): number {
  const perAmpCell = hydrogenCfmPerAmpPerCell(tempF)
  return sources.reduce((sum, s) => {
    if (![s.gassingCurrentA, s.cells, s.batteries].every(v => Number.isFinite(v) && v >= 0)) {
      throw new RangeError('gassing current, cells and batteries must be 0 or more')
    }
    return sum + perAmpCell * s.gassingCurrentA * s.cells * s.batteries
  }, 0)
}

function checkDesignFraction(designFraction: number): void {
  if (!(designFraction > 0 && designFraction < HYDROGEN_LFL_FRACTION)) {
    throw new RangeError(`design concentration must be above 0 and below the 4 % lower flammable limit, got ${designFraction}`)
  }
}

// Exhaust flow (room air leaving, hydrogen included) that holds the room at the design fraction C in
// steady state: Q = H2 / C. Worked example [calc]: 1.289 cfm H2 at 1 % → 128.9 cfm.
export function requiredExhaustCfm(h2Cfm: number, designFraction = HYDROGEN_DESIGN_FRACTION): number {
  checkDesignFraction(designFraction)
  return h2Cfm / designFraction
}

// Fresh air to mix with the hydrogen for the design fraction C: Q = H2 × (1 − C) / C; it equals the
// exhaust flow less the hydrogen itself.
export function requiredDilutionAirCfm(h2Cfm: number, designFraction = HYDROGEN_DESIGN_FRACTION): number {
  checkDesignFraction(designFraction)
  return h2Cfm * (1 - designFraction) / designFraction
}

/** Steady-state hydrogen in the room, % by volume, with a given exhaust flow. */
export function hydrogenPercentAtExhaust(h2Cfm: number, exhaustCfm: number): number {
  if (!(exhaustCfm > 0)) throw new RangeError(`exhaust flow must be above zero, got ${exhaustCfm}`)
  return h2Cfm / exhaustCfm * 100
}

/** Exhaust by floor area: 1 cfm per ft² (International Mechanical Code 502.4 as adopted). */
export function prescriptiveExhaustCfm(floorAreaFt2: number): number {
  if (!Number.isFinite(floorAreaFt2) || floorAreaFt2 < 0) throw new RangeError(`floor area must be 0 ft² or more, got ${floorAreaFt2}`)
  return floorAreaFt2 * PRESCRIPTIVE_EXHAUST_CFM_PER_FT2
}

export type GassingChargerType = 'iu' | 'iui' | 'w_taper'
export type GassingBatteryType = 'flooded' | 'vrla'

export interface GassingCurrentEntry {
  /** Gassing current, A per 100 Ah of rated capacity; null when the source gives none. */
  ampsPer100Ah: number | null
  /** The range the source gives, when it gives one. */
  range?: readonly [number, number]
}

export const GASSING_CURRENT_SOURCE = 'EN 62485-3 (EN 50272-3 before it), values as seen in a battery maker\'s calculator page'

// Gassing current per 100 Ah for traction batteries by charger characteristic, EN 62485-3 (published,
// seen in a battery maker's calculator page). The W (taper) charger has no VRLA value there.
export const GASSING_CURRENT_PER_100AH: Readonly<Record<GassingChargerType, Readonly<Record<GassingBatteryType, GassingCurrentEntry>>>> = {
  iu: { flooded: { ampsPer100Ah: 2 }, vrla: { ampsPer100Ah: 1 } },
  iui: { flooded: { ampsPer100Ah: 6 }, vrla: { ampsPer100Ah: 1.5 } },
  w_taper: { flooded: { ampsPer100Ah: 7, range: [5, 7] }, vrla: { ampsPer100Ah: null } },
}

/** EN 62485-3 airflow factor, m³/h per (cell · A per 100 Ah · Ah / 100), as in EN 50272-3. */
export const EN62485_FACTOR = 0.05
/** The same factor in the newer edition of EN 62485-3. */
export const EN62485_FACTOR_NEWER_EDITION = 0.055
/** Natural ventilation: each of inlet and outlet needs 28 cm² per m³/h of airflow (EN 62485-3). */
export const EN62485_OPENING_CM2_PER_M3H = 28

export interface En62485Battery {
  cells: number
  /** Gassing current, A per 100 Ah (GASSING_CURRENT_PER_100AH). */
  gassingCurrentPer100Ah: number
  /** Rated capacity, Ah. */
  capacityAh: number
  factor?: number
}

// EN 62485-3: Q = factor × n × I_gas × C_n / 100, in m³/h, for one traction battery on charge.
export function en62485AirflowM3h({ cells, gassingCurrentPer100Ah, capacityAh, factor = EN62485_FACTOR }: En62485Battery): number {
  if (![cells, gassingCurrentPer100Ah, capacityAh, factor].every(v => Number.isFinite(v) && v >= 0)) {
    throw new RangeError('cells, gassing current, capacity and factor must be 0 or more')
  }
  return factor * cells * gassingCurrentPer100Ah * capacityAh / 100
}

/** EN 62485-3 natural ventilation: free area A = 28 × Q cm², for the inlet and again for the outlet. */
export function naturalVentOpeningCm2(airflowM3h: number): number {
  if (!Number.isFinite(airflowM3h) || airflowM3h < 0) throw new RangeError(`airflow must be 0 m³/h or more, got ${airflowM3h}`)
  return EN62485_OPENING_CM2_PER_M3H * airflowM3h
}

export interface VentilationInput {
  installedCfm: number
  /** From requiredExhaustCfm (hydrogen at the design concentration). */
  requiredCfm: number
  /** From prescriptiveExhaustCfm (floor area), when the room's area is known. */
  prescriptiveCfm?: number | null
  roomVolumeFt3?: number | null
}

export interface VentilationMethodResult {
  requiredCfm: number
  pass: boolean
  /** Installed less required; negative when short. */
  marginCfm: number
}

export interface VentilationAssessment {
  concentration: VentilationMethodResult
  prescriptive: VentilationMethodResult | null
  /** The code sections accept either method, so one passing method meets them. */
  meetsOneMethod: boolean
  meetsAllMethods: boolean
  /** Installed exhaust as room air changes per hour, when the room volume is known. */
  airChangesPerHour: number | null
  caution: string
}

function methodResult(installedCfm: number, requiredCfm: number): VentilationMethodResult {
  return { requiredCfm, pass: installedCfm >= requiredCfm, marginCfm: installedCfm - requiredCfm }
}

// Installed exhaust against each method that applies; the caution travels with the verdict.
export function assessVentilation(input: VentilationInput): VentilationAssessment {
  const { installedCfm, requiredCfm, prescriptiveCfm, roomVolumeFt3 } = input
  for (const [name, value] of [['installed', installedCfm], ['required', requiredCfm]] as const) {
    if (!Number.isFinite(value) || value < 0) throw new RangeError(`${name} airflow must be 0 cfm or more, got ${value}`)
  }
  if (prescriptiveCfm !== null && prescriptiveCfm !== undefined && !(Number.isFinite(prescriptiveCfm) && prescriptiveCfm >= 0)) {
    throw new RangeError(`prescriptive airflow must be 0 cfm or more, got ${prescriptiveCfm}`)
  }
  const concentration = methodResult(installedCfm, requiredCfm)
  const prescriptive = prescriptiveCfm === null || prescriptiveCfm === undefined ? null : methodResult(installedCfm, prescriptiveCfm)
  const results = prescriptive ? [concentration, prescriptive] : [concentration]
  return {
    concentration,
    prescriptive,
    meetsOneMethod: results.some(r => r.pass),
    meetsAllMethods: results.every(r => r.pass),
    airChangesPerHour: roomVolumeFt3 && roomVolumeFt3 > 0 ? installedCfm * 60 / roomVolumeFt3 : null,
    caution: VENTILATION_SCOPE_CAUTION,
  }
}
