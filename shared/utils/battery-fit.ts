import type { BatteryState } from './battery-state'
import { isLithiumIon } from './chemistry-rules'

export type BatteryChemistry = 'flooded_lead_acid' | 'agm' | 'gel' | 'lithium_ion'

export const BATTERY_CHEMISTRY_LABELS: Record<BatteryChemistry, string> = {
  flooded_lead_acid: 'flooded lead-acid',
  agm: 'AGM',
  gel: 'gel',
  lithium_ion: 'lithium-ion',
}

/** What the truck's nameplate and battery compartment accept. */
export interface TruckBatterySpec {
  systemVoltage: number
  connector: string
  allowedChemistries: BatteryChemistry[]
  compartmentLengthIn: number
  compartmentWidthIn: number
  compartmentHeightIn: number
  minBatteryWeightLb: number
  maxBatteryWeightLb: number
}

export interface BatterySpec {
  voltage: number
  cellCount: number
  chemistry: BatteryChemistry
  connector: string
  lengthIn: number
  widthIn: number
  heightIn: number
  weightLb: number
  capacityAh: number
}

export interface ChargerSpec {
  outputVoltage: number
  chemistryProfiles: BatteryChemistry[]
  minCapacityAh: number
  maxCapacityAh: number
  maxCurrentA: number
}

/**
 * A reason's numbers and names, for the words in the reader's language (`refusal.<code>` in i18n/locales). A
 * name ending in a stored unit (`_lb`, `_in`, `_gal`, `_f`) holds a value in that unit, shown in the site's units.
 */
export type ReasonParams = Record<string, string | number | string[]>

/**
 * Why a battery cannot go where it was asked to: a stable snake_case code, plain English words with the
 * numbers (the fallback), and the numbers and codes themselves (`params`) for the client's own language.
 */
export interface FitReason {
  code: string
  message: string
  params?: ReasonParams
}

const quantity = new Intl.NumberFormat('en-US', { maximumFractionDigits: 2 })

function withUnit(value: number, unit: string): string {
  return `${quantity.format(value)} ${unit}`
}

function recorded(value: number): boolean {
  return Number.isFinite(value) && value > 0
}

function sameConnector(a: string, b: string): boolean {
  const key = (s: string) => s.trim().replace(/\s+/g, ' ').toLowerCase()
  return key(a) === key(b)
}

function chemistryList(chemistries: BatteryChemistry[]): string {
  return chemistries.length === 0 ? 'none' : chemistries.map(c => BATTERY_CHEMISTRY_LABELS[c]).join(', ')
}

const TOLERANCE = 1e-9

/**
 * Everything that stops a battery going into a truck; empty means it fits. The nameplate weight
 * range is part of the truck's counterweight (ANSI/ITSDF B56.1, clause unchecked), so a battery or
 * truck without a recorded weight is reported, never passed.
 */
export function batteryTruckFit(truck: TruckBatterySpec, battery: BatterySpec): FitReason[] {
  const reasons: FitReason[] = []

  if (Math.abs(battery.voltage - truck.systemVoltage) > TOLERANCE) {
    reasons.push({
      code: 'voltage_mismatch',
      params: { battery: battery.voltage, truck: truck.systemVoltage },
      message: `Battery is ${withUnit(battery.voltage, 'V')}; this truck takes ${withUnit(truck.systemVoltage, 'V')}.`,
    })
  }
  if (!sameConnector(battery.connector, truck.connector)) {
    reasons.push({
      code: 'connector_mismatch',
      params: { battery: battery.connector.trim(), truck: truck.connector.trim() },
      message: `Battery connector is ${battery.connector.trim() || 'not recorded'}; this truck takes ${truck.connector.trim() || 'a connector not recorded'}.`,
    })
  }
  if (!truck.allowedChemistries.includes(battery.chemistry)) {
    reasons.push({
      code: 'chemistry_not_allowed',
      params: { chemistry: battery.chemistry, chemistries: truck.allowedChemistries },
      message: `This truck is not approved for ${BATTERY_CHEMISTRY_LABELS[battery.chemistry]} batteries (approved: ${chemistryList(truck.allowedChemistries)}).`,
    })
  }

  const dimensions = [
    { code: 'too_long_for_compartment', word: 'long', battery: battery.lengthIn, compartment: truck.compartmentLengthIn },
    { code: 'too_wide_for_compartment', word: 'wide', battery: battery.widthIn, compartment: truck.compartmentWidthIn },
    { code: 'too_tall_for_compartment', word: 'tall', battery: battery.heightIn, compartment: truck.compartmentHeightIn },
  ]
  if (dimensions.some(d => !recorded(d.battery) || !recorded(d.compartment))) {
    reasons.push({
      code: 'compartment_size_unknown',
      message: 'Battery or compartment size is not recorded; measure both before fitting.',
    })
  }
  else {
    for (const d of dimensions) {
      if (d.battery > d.compartment + TOLERANCE) {
        reasons.push({
          code: d.code,
          params: { battery_in: d.battery, compartment_in: d.compartment },
          message: `Battery is ${withUnit(d.battery, 'in')} ${d.word}; the compartment takes ${withUnit(d.compartment, 'in')}.`,
        })
      }
    }
  }

  if (!recorded(truck.minBatteryWeightLb)) {
    reasons.push({
      code: 'truck_minimum_weight_unknown',
      message: 'This truck\'s nameplate minimum battery weight is not recorded; read the nameplate before fitting any battery.',
    })
  }
  if (!recorded(battery.weightLb)) {
    reasons.push({
      code: 'battery_weight_unknown',
      message: 'Battery weight is not recorded; it cannot be checked against the truck\'s nameplate minimum.',
    })
  }
  else {
    if (recorded(truck.minBatteryWeightLb) && battery.weightLb < truck.minBatteryWeightLb - TOLERANCE) {
      reasons.push({
        code: 'under_minimum_weight',
        params: { battery_lb: battery.weightLb, truck_lb: truck.minBatteryWeightLb },
        message: `Battery weighs ${withUnit(battery.weightLb, 'lb')}; this truck's nameplate minimum is ${withUnit(truck.minBatteryWeightLb, 'lb')} — a light battery upsets the counterweight.`,
      })
    }
    if (recorded(truck.maxBatteryWeightLb) && battery.weightLb > truck.maxBatteryWeightLb + TOLERANCE) {
      reasons.push({
        code: 'over_maximum_weight',
        params: { battery_lb: battery.weightLb, truck_lb: truck.maxBatteryWeightLb },
        message: `Battery weighs ${withUnit(battery.weightLb, 'lb')}; this truck's nameplate maximum is ${withUnit(truck.maxBatteryWeightLb, 'lb')} — a heavy battery overloads the truck.`,
      })
    }
  }
  return reasons
}

/** Everything that stops a charger charging a battery; empty means they match. */
export function chargerBatteryMatch(charger: ChargerSpec, battery: BatterySpec): FitReason[] {
  const reasons: FitReason[] = []
  if (Math.abs(charger.outputVoltage - battery.voltage) > TOLERANCE) {
    reasons.push({
      code: 'charger_voltage_mismatch',
      params: { charger: charger.outputVoltage, battery: battery.voltage },
      message: `Charger puts out ${withUnit(charger.outputVoltage, 'V')}; this battery is ${withUnit(battery.voltage, 'V')}.`,
    })
  }
  // a charger that records no profiles at all cannot be checked: a lithium-ion battery goes on with a warning
  // (CHARGER_PROFILE_UNRECORDED, chemistry-rules.ts) rather than a refusal
  const unrecorded = charger.chemistryProfiles.length === 0 && isLithiumIon(battery.chemistry)
  if (!unrecorded && !charger.chemistryProfiles.includes(battery.chemistry)) {
    reasons.push({
      code: 'charger_profile_missing',
      params: { chemistry: battery.chemistry, chemistries: charger.chemistryProfiles },
      message: `Charger has no ${BATTERY_CHEMISTRY_LABELS[battery.chemistry]} profile (it has: ${chemistryList(charger.chemistryProfiles)}).`,
    })
  }
  const range = `${quantity.format(charger.minCapacityAh)}–${withUnit(charger.maxCapacityAh, 'Ah')}`
  if (!recorded(battery.capacityAh)) {
    reasons.push({
      code: 'capacity_unknown',
      params: { min: charger.minCapacityAh, max: charger.maxCapacityAh },
      message: `Battery capacity is not recorded; this charger is rated for ${range}.`,
    })
  }
  else if (battery.capacityAh < charger.minCapacityAh - TOLERANCE) {
    reasons.push({
      code: 'capacity_below_charger_range',
      params: { battery: battery.capacityAh, min: charger.minCapacityAh, max: charger.maxCapacityAh },
      message: `Battery is ${withUnit(battery.capacityAh, 'Ah')}; this charger is rated for ${range} and would charge it too hard.`,
    })
  }
  else if (battery.capacityAh > charger.maxCapacityAh + TOLERANCE) {
    reasons.push({
      code: 'capacity_above_charger_range',
      params: { battery: battery.capacityAh, min: charger.minCapacityAh, max: charger.maxCapacityAh },
      message: `Battery is ${withUnit(battery.capacityAh, 'Ah')}; this charger is rated for ${range} and cannot charge it fully in time.`,
    })
  }
  return reasons
}

export interface BatteryReadinessFacts {
  state: BatteryState
  outOfService: boolean
  wateringOverdue: boolean
  coolingMinutesLeft: number
}

function minutesText(minutes: number): string {
  const whole = Math.max(0, Math.ceil(minutes))
  const hours = Math.floor(whole / 60)
  const rest = whole % 60
  if (hours === 0) return `${rest} min`
  return rest === 0 ? `${hours} h` : `${hours} h ${rest} min`
}

/** Everything that stops a battery being issued to a truck now; empty means it is ready to go. */
export function batteryReadinessReasons(facts: BatteryReadinessFacts): FitReason[] {
  const reasons: FitReason[] = []
  if (facts.outOfService || facts.state === 'out_of_service') {
    reasons.push({ code: 'out_of_service', message: 'Battery is out of service; do not fit it.' })
  }
  if (facts.state === 'in_truck') {
    reasons.push({ code: 'already_in_truck', message: 'Battery is already in a truck; log it out of that truck first.' })
  }
  if (facts.state === 'on_charge') {
    reasons.push({ code: 'not_charged', message: 'Battery is still on charge; let the charge finish.', params: { variant: 'on_charge' } })
  }
  if (facts.state === 'needs_charge') {
    reasons.push({ code: 'not_charged', message: 'Battery has not been charged since it last came out of a truck.', params: { variant: 'needs_charge' } })
  }
  if (facts.state === 'cooling') {
    const left = facts.coolingMinutesLeft > 0 ? `${minutesText(facts.coolingMinutesLeft)} left` : 'almost done'
    reasons.push({ code: 'still_cooling', message: `Battery is still cooling after its charge: ${left}.`, params: { minutes: Math.max(0, Math.ceil(facts.coolingMinutesLeft)) } })
  }
  if (facts.wateringOverdue) {
    reasons.push({ code: 'watering_overdue', message: 'Watering is overdue; check levels and water it before it goes out.' })
  }
  return reasons
}

export interface BatteryCandidate {
  id: string
  ready: boolean
  fitReasons: FitReason[]
  /** When the battery came off charge and began resting; null when not known. */
  restedSince: Date | null
  cycleCount: number
}

/** Ready and compatible with the truck. */
export function isIssuableBattery(candidate: BatteryCandidate): boolean {
  return candidate.ready && candidate.fitReasons.length === 0
}

function restedSinceMs(candidate: BatteryCandidate): number {
  const ms = candidate.restedSince?.getTime()
  return ms === undefined || Number.isNaN(ms) ? Number.POSITIVE_INFINITY : ms
}

function compareCandidates(a: BatteryCandidate, b: BatteryCandidate): number {
  const issuable = Number(isIssuableBattery(b)) - Number(isIssuableBattery(a))
  if (issuable !== 0) return issuable
  const rested = restedSinceMs(a) - restedSinceMs(b)
  if (rested !== 0 && !Number.isNaN(rested)) return rested
  if (a.cycleCount !== b.cycleCount) return a.cycleCount - b.cycleCount
  return a.id < b.id ? -1 : a.id > b.id ? 1 : 0
}

/**
 * Batteries in the order to offer them for a truck: ready and compatible first, then among
 * equals the one rested longest (unknown rest last), then the fewest cycles, then by id.
 */
export function rankBatteriesForTruck<T extends BatteryCandidate>(candidates: readonly T[]): T[] {
  return [...candidates].sort(compareCandidates)
}

/** The battery to take next for a truck, or null when none is ready and compatible. */
export function chooseNextBattery(candidates: readonly BatteryCandidate[]): string | null {
  const first = rankBatteriesForTruck(candidates)[0]
  return first !== undefined && isIssuableBattery(first) ? first.id : null
}
