import type { AuthorisationReason } from '../utils/truck-authorisation'
import type { InspectionItem } from '../utils/truck-inspection'

/** GET /api/trucks/:id/inspection: what the pre-shift check form needs. */
export interface InspectionFormAnswer {
  truck: { id: string, siteId: string, fleetNumber: string, truckClass: number, power: string, model: string, tagCode: string | null }
  template: { id: string, version: number, title: string, items: InspectionItem[] }
  hourMeter: number
  lastInspectionAt: string | null
  hold: { since: string, reason: string, byName: string | null } | null
  /** why the caller may not take this truck, in words, and what the site does about it */
  authorisation: { problem: AuthorisationReason, policy: 'warn' | 'block' } | null
  mayReturn: boolean
}

/** POST /api/trucks/:id/inspections */
export interface InspectionRecorded {
  item: { id: string, criticalFailed: string[], failedCount: number }
  repeated: boolean
  authorisation: AuthorisationReason | null
  followUpId: string | null
}

/** GET /api/inspection/shift */
export type TruckCheckState = 'held' | 'checked' | 'unchecked'

export interface ShiftInspectionStatus {
  shiftStartedAt: string
  /** trucks used today (a battery or cylinder change, or a check) with no check since the shift began */
  unchecked: { id: string, fleetNumber: string, tagCode: string | null, lastInspectionAt: string | null }[]
  /** trucks on an inspection hold, oldest first, with how long */
  held: { id: string, fleetNumber: string, tagCode: string | null, since: string, hours: number, reason: string }[]
  /** every truck in service: held, checked this shift, or not */
  stateOf: Record<string, TruckCheckState>
}
