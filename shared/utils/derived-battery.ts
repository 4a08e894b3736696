import type { BatteryChemistry } from './battery-fit'
import { ranHot } from './charging'
import { localDate } from './due-dates'
import type { ScheduleDefinition } from './due-schedules'
import { chargesProgress, scheduleObligation, type ObligationRecord, type ObligationSubject } from './due-rules'
import { customObligations, type CompletionFact } from './derived-custom'
import { coolDownMinutesFor } from './chemistry-rules'

// A battery's read models from its effective records: the status row the Bay board, the tag page and the
// floor forms read, and its obligations (watering, equalize, every-cell reading, lead-added schedules).

/** The state kept on write; 'charged' reads as Cooling until `readyAt`, then Ready (read time). */
export type StoredBatteryState = 'out_of_service' | 'in_truck' | 'on_charge' | 'charged' | 'needs_charge'

export interface BatteryFacts {
  id: string
  siteId: string
  serial: string
  tagCode: string | null
  homeAreaId: string | null
  chemistry: BatteryChemistry
  outOfService: boolean
  createdAt: Date
  /** 'YYYY-MM-DD' from the registry, when given */
  inServiceOn: string | null
  /** the latest hold on it, when out of service */
  heldAt: Date | null
  openCharge: { id: string, at: Date, chargerId: string } | null
  /** the latest ended charge (by when it started) */
  lastEndedCharge: { endedAt: Date, outcome: 'complete' | 'interrupted' | null, endTempF: number | null } | null
  /** charges that counted as a cycle */
  cycles: number
  /** its latest installation in a truck and removal from one; `displaced`: another battery went into that truck later */
  lastIn: { at: Date, truckId: string } | null
  lastOut: Date | null
  displaced: boolean
  lastWateredAt: Date | null
  /** when its latest complete equalize charge ended */
  lastEqualizedAt: Date | null
  /** ends of its charges, oldest first, from the earliest moment any rule counts from */
  chargeEnds: Date[]
  lastSg: { at: Date, meanCorrectedSg: number, stateOfChargePct: number | null } | null
  lastCellCheck: { at: Date, spread: number | null, lowCellCount: number } | null
  completions: CompletionFact[]
}

export interface BatteryStatusPolicy {
  coolDownMinutes: number
  cellSpreadThreshold: number
  maxChargeTempF: number
}

export interface BatteryStatusRow {
  batteryId: string
  siteId: string
  state: StoredBatteryState
  stateSince: Date
  readyAt: Date | null
  truckId: string | null
  chargeSessionId: string | null
  chargerId: string | null
  cycles: number
  lastChargeEndedAt: Date | null
  lastChargeOutcome: 'complete' | 'interrupted' | null
  lastEndTempF: number | null
  ranHot: boolean
  lastInstalledAt: Date | null
  lastRemovedAt: Date | null
  chargesSinceWatering: number
  lastWateredAt: Date | null
  chargesSinceEqualize: number
  lastEqualizedAt: Date | null
  lastCheckAt: Date | null
  lastSg: number | null
  lastSocPct: number | null
  lastCellCheckAt: Date | null
  lastSpread: number | null
  lowCellCount: number | null
  weakCell: boolean
}

const later = (...ds: (Date | null | undefined)[]) => ds.filter((d): d is Date => !!d).sort((a, b) => b.getTime() - a.getTime())[0] ?? null
const countAfter = (ends: readonly Date[], since: Date | null) => (since ? ends.filter(e => e > since).length : ends.length)

/**
 * Out of service wins, then in a truck (its latest installation is later than its latest removal and no
 * other battery went into that truck since), then on charge; a complete charge that ended after it last
 * left a truck makes it charged (Cooling until ready-at, then Ready); anything else needs a charge.
 */
export function batteryStatusFrom(f: BatteryFacts, policy: BatteryStatusPolicy): BatteryStatusRow {
  const inTruck = !!f.lastIn && !f.displaced && (!f.lastOut || f.lastIn.at > f.lastOut)
  const ended = f.lastEndedCharge
  const charged = !!ended && ended.outcome === 'complete' && (!f.lastOut || ended.endedAt > f.lastOut)
  let state: StoredBatteryState = 'needs_charge'
  let since: Date = later(f.lastOut, ended?.endedAt, f.createdAt)!
  if (f.outOfService) {
    state = 'out_of_service'
    since = f.heldAt ?? f.createdAt
  }
  else if (inTruck) {
    state = 'in_truck'
    since = f.lastIn!.at
  }
  else if (f.openCharge) {
    state = 'on_charge'
    since = f.openCharge.at
  }
  else if (charged) {
    state = 'charged'
    since = ended.endedAt
  }
  const spread = f.lastCellCheck?.spread ?? null
  const lowCells = f.lastCellCheck?.lowCellCount ?? null
  return {
    batteryId: f.id,
    siteId: f.siteId,
    state,
    stateSince: since,
    // the site's cool-down for lead-acid; none for lithium-ion (chemistry-rules.ts)
    readyAt: state === 'charged' ? new Date(ended!.endedAt.getTime() + coolDownMinutesFor(f.chemistry, policy.coolDownMinutes) * 60_000) : null,
    truckId: inTruck ? f.lastIn!.truckId : null,
    chargeSessionId: f.openCharge?.id ?? null,
    chargerId: f.openCharge?.chargerId ?? null,
    cycles: f.cycles,
    lastChargeEndedAt: ended?.endedAt ?? null,
    lastChargeOutcome: ended?.outcome ?? null,
    lastEndTempF: ended?.endTempF ?? null,
    ranHot: ended?.endTempF !== null && ended?.endTempF !== undefined && ranHot(ended.endTempF, policy.maxChargeTempF),
    lastInstalledAt: f.lastIn?.at ?? null,
    lastRemovedAt: f.lastOut,
    chargesSinceWatering: countAfter(f.chargeEnds, f.lastWateredAt),
    lastWateredAt: f.lastWateredAt,
    chargesSinceEqualize: countAfter(f.chargeEnds, f.lastEqualizedAt),
    lastEqualizedAt: f.lastEqualizedAt,
    lastCheckAt: f.lastSg?.at ?? null,
    lastSg: f.lastSg?.meanCorrectedSg ?? null,
    lastSocPct: f.lastSg?.stateOfChargePct ?? null,
    lastCellCheckAt: f.lastCellCheck?.at ?? null,
    lastSpread: spread,
    lowCellCount: lowCells,
    weakCell: (spread !== null && spread > policy.cellSpreadThreshold + 1e-9) || (lowCells !== null && lowCells > 0),
  }
}

/** Watering, equalize and the every-cell reading for a flooded battery in service; lead-added schedules for any. */
export function batteryObligations(f: BatteryFacts, schedules: readonly ScheduleDefinition[], timeZone: string): ObligationRecord[] {
  if (f.outOfService) return []
  const subject: ObligationSubject = { kind: 'battery', id: f.id, label: f.serial, tagCode: f.tagCode, areaId: f.homeAreaId }
  const startOn = f.inServiceOn ?? localDate(f.createdAt, timeZone)
  const onDate = (d: Date | null) => (d ? localDate(d, timeZone) : null)
  const out: ObligationRecord[] = []
  if (f.chemistry === 'flooded_lead_acid') {
    for (const s of schedules) {
      if (!s.active || s.every === null) continue
      if (s.kind === 'battery_watering' || s.kind === 'battery_equalize') {
        const since = s.kind === 'battery_watering' ? f.lastWateredAt : f.lastEqualizedAt
        const count = chargesProgress(f.chargeEnds, since, s.every, timeZone)
        const what = s.kind === 'battery_watering' ? 'watering' : 'equalize'
        out.push(scheduleObligation(s, subject, { lastDoneOn: onDate(since), startOn, count, detail: `${count.now} of ${s.every} charges since ${what}`, detailWords: { code: `charges_since_${what}`, params: { now: count.now, every: s.every } } }))
      }
      else if (s.kind === 'electrolyte_full_check') {
        out.push(scheduleObligation(s, subject, { lastDoneOn: onDate(f.lastCellCheck?.at ?? null), startOn }))
      }
    }
  }
  out.push(...customObligations(schedules, subject, f.createdAt, f.completions, { chargeEnds: f.chargeEnds }, timeZone))
  return out
}
