import {
  EN62485_FACTOR, EN62485_FACTOR_NEWER_EDITION, GASSING_CURRENT_PER_100AH, HYDROGEN_DESIGN_FRACTION,
  assessVentilation, en62485AirflowM3h, hydrogenEvolvedCfm, naturalVentOpeningCm2, prescriptiveExhaustCfm,
  requiredDilutionAirCfm, requiredExhaustCfm, type GassingBatteryType, type GassingChargerType, type VentilationAssessment,
} from './ventilation'
import { m3PerHourToCfm } from './units'

// The ventilation check of one charging area: every charger at its finishing (gassing) current at once.

export type VentChargerType = 'iu' | 'iui' | 'taper' | 'lithium'

export interface VentCharger {
  id: string
  name: string
  chargerType: VentChargerType
  /** gassing current entered for this charger, A; null to take the EN 62485-3 default */
  gassingCurrentA: number | null
  /** cells of the battery it charges */
  cells: number
  /** rated capacity of the battery it charges, Ah */
  capacityAh: number
  batteryType: GassingBatteryType | 'lithium'
}

export interface VentChargerResult extends VentCharger {
  gassingCurrentUsedA: number
  gassingPer100Ah: number
  gassingSource: 'entered' | 'default' | 'none'
  h2Cfm: number
  en62485M3h: number
  note: string | null
}

export interface VentArea {
  floorAreaFt2: number | null
  roomVolumeFt3: number | null
  installedExhaustCfm: number | null
}

export interface ChargingAreaVentilation {
  chargers: VentChargerResult[]
  h2Cfm: number
  designFraction: number
  requiredExhaustCfm: number
  dilutionAirCfm: number
  prescriptiveCfm: number | null
  en62485M3h: number
  en62485NewerEditionM3h: number
  en62485Cfm: number
  naturalOpeningCm2: number
  installedExhaustCfm: number | null
  assessment: VentilationAssessment | null
}

const CHARGER_TO_GASSING: Readonly<Record<Exclude<VentChargerType, 'lithium'>, GassingChargerType>> = { iu: 'iu', iui: 'iui', taper: 'w_taper' }

// The gassing current a charger drives: as entered, else EN 62485-3's A per 100 Ah for its charger and
// battery type times the capacity / 100. Lithium-ion charging does not gas in normal use (from memory).
export function chargerGassingCurrent(c: VentCharger): { amps: number, per100Ah: number, source: VentChargerResult['gassingSource'], note: string | null } {
  const hundreds = c.capacityAh / 100
  if (c.gassingCurrentA !== null) {
    return { amps: c.gassingCurrentA, per100Ah: hundreds > 0 ? c.gassingCurrentA / hundreds : 0, source: 'entered', note: null }
  }
  if (c.chargerType === 'lithium' || c.batteryType === 'lithium') {
    return { amps: 0, per100Ah: 0, source: 'none', note: 'Lithium-ion: no gassing in normal charging; follow the battery maker.' }
  }
  const entry = GASSING_CURRENT_PER_100AH[CHARGER_TO_GASSING[c.chargerType]][c.batteryType]
  if (entry.ampsPer100Ah === null) {
    return { amps: 0, per100Ah: 0, source: 'none', note: 'EN 62485-3 gives no value for this charger and battery; enter the gassing current from the charger maker.' }
  }
  return { amps: entry.ampsPer100Ah * hundreds, per100Ah: entry.ampsPer100Ah, source: 'default', note: entry.range ? `EN 62485-3 gives ${entry.range[0]}–${entry.range[1]} A per 100 Ah; the upper value is used.` : null }
}

export function chargingAreaVentilation(area: VentArea, chargers: readonly VentCharger[], designFraction = HYDROGEN_DESIGN_FRACTION, tempF = 77): ChargingAreaVentilation {
  const results: VentChargerResult[] = chargers.map((c) => {
    const g = chargerGassingCurrent(c)
    return {
      ...c,
      gassingCurrentUsedA: g.amps,
      gassingPer100Ah: g.per100Ah,
      gassingSource: g.source,
      h2Cfm: hydrogenEvolvedCfm([{ gassingCurrentA: g.amps, cells: c.cells, batteries: 1 }], tempF),
      en62485M3h: en62485AirflowM3h({ cells: c.cells, gassingCurrentPer100Ah: g.per100Ah, capacityAh: c.capacityAh }),
      note: g.note,
    }
  })
  const h2Cfm = results.reduce((s, r) => s + r.h2Cfm, 0)
  const required = requiredExhaustCfm(h2Cfm, designFraction)
  const prescriptiveCfm = area.floorAreaFt2 === null ? null : prescriptiveExhaustCfm(area.floorAreaFt2)
  const en62485M3h = results.reduce((s, r) => s + r.en62485M3h, 0)
  const newer = results.reduce((s, r) => s + en62485AirflowM3h({ cells: r.cells, gassingCurrentPer100Ah: r.gassingPer100Ah, capacityAh: r.capacityAh, factor: EN62485_FACTOR_NEWER_EDITION }), 0)
  return {
    chargers: results,
    h2Cfm,
    designFraction,
    requiredExhaustCfm: required,
    dilutionAirCfm: requiredDilutionAirCfm(h2Cfm, designFraction),
    prescriptiveCfm,
    en62485M3h,
    en62485NewerEditionM3h: newer,
    en62485Cfm: m3PerHourToCfm(en62485M3h),
    naturalOpeningCm2: naturalVentOpeningCm2(en62485M3h),
    installedExhaustCfm: area.installedExhaustCfm,
    assessment: area.installedExhaustCfm === null
      ? null
      : assessVentilation({ installedCfm: area.installedExhaustCfm, requiredCfm: required, prescriptiveCfm, roomVolumeFt3: area.roomVolumeFt3 }),
  }
}

/** The EN 62485-3 factor the check uses first (the older edition's 0.05; 0.055 is shown beside it). */
export const VENTILATION_CHECK_EN_FACTOR = EN62485_FACTOR
