import type { StoredBatteryState } from './derived-battery'

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

export interface DerivedBatteryState {
  state: BatteryState
  /** Whole minutes until ready (rounded up); 0 unless cooling. */
  coolingMinutesLeft: number
  /** When the cool-down ends (or ended); null unless cooling or ready. */
  readyAt: Date | null
}

/**
 * The state a stored battery status shows at `now`: a charged battery is Cooling until its ready-at
 * (Ready exactly at that moment); the other stored states read as they are. Time moves Cooling to
 * Ready here, at read time; nothing is recomputed for it.
 */
export function batteryStateAt(stored: StoredBatteryState, readyAt: Date | null, now: Date): DerivedBatteryState {
  if (stored !== 'charged') return { state: stored, coolingMinutesLeft: 0, readyAt: null }
  if (!readyAt) return { state: 'ready', coolingMinutesLeft: 0, readyAt: null }
  const msLeft = readyAt.getTime() - now.getTime()
  if (msLeft > 0) return { state: 'cooling', coolingMinutesLeft: Math.ceil(msLeft / 60_000), readyAt }
  return { state: 'ready', coolingMinutesLeft: 0, readyAt }
}
