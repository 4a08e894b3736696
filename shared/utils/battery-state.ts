import { DEFAULT_MAX_CHARGE_TEMP_F, ranHot } from './charging'
import { DEFAULT_CELL_SPREAD_THRESHOLD } from './specific-gravity'

export type BatteryState = 'in_truck' | 'on_charge' | 'cooling' | 'ready' | 'needs_charge' | 'out_of_service'

export const BATTERY_STATES: readonly BatteryState[] = [
  'in_truck',
  'on_charge',
  'cooling',
  'ready',
  'needs_charge',
  'out_of_service',
]

export const BATTERY_STATE_LABELS: Record<BatteryState, string> = {
  in_truck: 'In truck',
  on_charge: 'On charge',
  cooling: 'Cooling',
  ready: 'Ready',
  needs_charge: 'Needs charge',
  out_of_service: 'Out of service',
}

/** Rest after a charge before a battery goes out: 8 h work / 8 h charge / 8 h cool (common practice; a site setting). */
export const DEFAULT_COOL_DOWN_MINUTES = 480

export interface BatteryStateFacts {
  outOfService: boolean
  installedInTruck: boolean
  /** Start of a charge that has not been closed yet. */
  chargeOpenSince: Date | null
  lastChargeEndedAt: Date | null
  lastChargeComplete: boolean
  lastRemovedFromTruckAt: Date | null
}

export interface BatteryStatePolicy {
  coolDownMinutes: number
}

export interface DerivedBatteryState {
  state: BatteryState
  /** Whole minutes until ready (rounded up); 0 unless cooling. */
  coolingMinutesLeft: number
  /** When the cool-down ends (or ended); null unless cooling or ready. */
  readyAt: Date | null
}

/**
 * A battery's state from its latest facts. Out of service wins, then in truck, then on charge;
 * a complete charge that ended after the battery last left a truck means cooling until the
 * cool-down has passed (ready exactly at that moment); anything else needs a charge.
 */
export function deriveBatteryState(
  facts: BatteryStateFacts,
  policy: BatteryStatePolicy,
  now: Date,
): DerivedBatteryState {
  if (!(policy.coolDownMinutes >= 0)) {
    throw new RangeError(`Cool-down must be zero or more minutes; got ${policy.coolDownMinutes}.`)
  }
  const plain = (state: BatteryState): DerivedBatteryState => ({ state, coolingMinutesLeft: 0, readyAt: null })
  if (facts.outOfService) return plain('out_of_service')
  if (facts.installedInTruck) return plain('in_truck')
  if (facts.chargeOpenSince !== null) return plain('on_charge')

  const ended = facts.lastChargeEndedAt
  const removed = facts.lastRemovedFromTruckAt
  const chargedSinceRemoval = ended !== null && (removed === null || ended.getTime() > removed.getTime())
  if (!chargedSinceRemoval || !facts.lastChargeComplete) return plain('needs_charge')

  const readyAt = new Date(ended.getTime() + policy.coolDownMinutes * 60_000)
  const msLeft = readyAt.getTime() - now.getTime()
  if (msLeft > 0) {
    return { state: 'cooling', coolingMinutesLeft: Math.ceil(msLeft / 60_000), readyAt }
  }
  return { state: 'ready', coolingMinutesLeft: 0, readyAt }
}

export interface BatteryCareFacts {
  chargesSinceWatering: number
  /** Days since the last watering (since commissioning when never watered). */
  daysSinceWatering: number
  chargesSinceEqualize: number
  daysSinceEqualize: number
  /** Spread of the last every-cell reading (corrected), or null when none was taken. */
  lastSpread: number | null
  lowCellCount: number | null
  lastEndTempF: number | null
}

export interface BatteryCarePolicy {
  wateringEveryCharges: number
  wateringEveryDays: number
  /** Charges past due before watering counts as overdue. */
  wateringGraceCharges: number
  /** Days past due before watering counts as overdue. */
  wateringGraceDays: number
  equalizeEveryCharges: number
  equalizeEveryDays: number
  maxChargeTempF: number
  maxCellSpread: number
}

/**
 * Site defaults: water every 5 charges or 7 days, overdue one charge or one day later; equalize
 * every 5th cycle or weekly (common practice, the battery maker decides); 115 °F end of charge
 * (from memory); 0.020 spread (common practice).
 */
export const DEFAULT_BATTERY_CARE_POLICY: BatteryCarePolicy = {
  wateringEveryCharges: 5,
  wateringEveryDays: 7,
  wateringGraceCharges: 1,
  wateringGraceDays: 1,
  equalizeEveryCharges: 5,
  equalizeEveryDays: 7,
  maxChargeTempF: DEFAULT_MAX_CHARGE_TEMP_F,
  maxCellSpread: DEFAULT_CELL_SPREAD_THRESHOLD,
}

export interface BatteryFlags {
  wateringDue: boolean
  wateringOverdue: boolean
  equalizeDue: boolean
  weakCell: boolean
  ranHot: boolean
}

/** Care flags for a flooded lead-acid battery; each interval is met when either its charges or its days are reached. */
export function batteryFlags(
  facts: BatteryCareFacts,
  policy: BatteryCarePolicy = DEFAULT_BATTERY_CARE_POLICY,
): BatteryFlags {
  const wateringDue = facts.chargesSinceWatering >= policy.wateringEveryCharges
    || facts.daysSinceWatering >= policy.wateringEveryDays
  const wateringOverdue = facts.chargesSinceWatering >= policy.wateringEveryCharges + policy.wateringGraceCharges
    || facts.daysSinceWatering >= policy.wateringEveryDays + policy.wateringGraceDays
  const equalizeDue = facts.chargesSinceEqualize >= policy.equalizeEveryCharges
    || facts.daysSinceEqualize >= policy.equalizeEveryDays
  const weakCell = (facts.lastSpread !== null && facts.lastSpread > policy.maxCellSpread + 1e-9)
    || (facts.lowCellCount !== null && facts.lowCellCount > 0)
  return {
    wateringDue,
    wateringOverdue,
    equalizeDue,
    weakCell,
    ranHot: facts.lastEndTempF !== null && ranHot(facts.lastEndTempF, policy.maxChargeTempF),
  }
}
