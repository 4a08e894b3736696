import type { FitReason } from '../utils/battery-fit'
import type { AuthorisationReason } from '../utils/truck-authorisation'
import type { BatteryState } from '../utils/battery-state'
import type { EmissionsPolicy } from '../utils/emissions'
import type { TruckCheckState } from './inspection'
import type { CoExposureAssessment } from '../utils/co-exposure'

// What the floor routes answer, written once: the route declares it as its return type and the floor
// forms read it. Only the fields the forms use are named; the routes may send more.

/** A battery as the Bay board and the floor forms show it. */
export interface BayCardData {
  id: string
  serial: string
  tagCode: string | null
  chemistry: string
  voltage: number
  cellCount: number
  capacityAh: number
  cycleCount: number
  ratedCycles: number
  outOfServiceReason: string | null
  state: BatteryState
  label: string
  coolingMinutesLeft: number
  readyAt: string | null
  flags: { key: string, label: string }[]
  readiness: FitReason[]
  truck: { id: string, fleetNumber: string | null, tagCode: string | null } | null
  charge: { id: string, chargerId: string | null, chargerName: string | null, since: string } | null
  lastChargeEndedAt: string | null
  justCharged: boolean
  lastStateOfChargePct: number | null
}

/**
 * A battery as the Bay board shows it: what the card, the groups and the suggestion read, and nothing else
 * (the board of a 200-battery area is polled by wall screens and phones, so every field is paid for often).
 */
export interface BoardCardData {
  id: string
  serial: string
  tagCode: string | null
  voltage: number
  capacityAh: number
  cycleCount: number
  ratedCycles: number
  outOfServiceReason: string | null
  state: BatteryState
  coolingMinutesLeft: number
  readyAt: string | null
  flags: { key: string, label: string }[]
  /** why it may not go into a truck now, as codes (the words are the app's) */
  readiness: { code: string }[]
  truck: { id: string, fleetNumber: string | null } | null
  charge: { chargerName: string | null } | null
}

/** GET /api/battery-room/lookup: a scanned or typed code with what the swap, charge and check forms need. */
/** GET /api/battery-room/board: the batteries of an area (or the site) by state and, for a truck, the battery to take */
export interface BoardReply {
  now: string
  areaId: string | null
  areas: { id: string, name: string }[]
  policy: { coolDownMinutes: number, cellSpreadThreshold: number }
  batteries: BoardCardData[]
  trucks: { id: string, fleetNumber: string, systemVoltage: number | null, outOfService: boolean, batteryId: string | null, inspection: TruckCheckState | null }[]
  suggestion: { truckId: string, choice: string | null, ranked: string[], compatibleNotReady: number } | null
}

export interface FloorLookup {
  kind: 'battery' | 'truck' | 'charger'
  id: string
  code: string | null
  label: string
  battery?: BayCardData
  truck?: { fleetNumber: string, power: string, systemVoltage: number | null, hourMeter: number, outOfService: boolean, currentBattery: { id: string, serial: string, tagCode: string | null } | null }
  charger?: { name: string, outputVoltage: number, outOfService: boolean, chemistryProfiles: string[], minCapacityAh: number, maxCapacityAh: number, openSession: { id: string, batteryId: string, at: string | Date, serial: string } | null }
}

/** GET /api/fuel/cylinders/lookup */
export interface CylinderLookup {
  item: { id: string, serial: string, tagCode: string | null, status: string, waterCapacityLb: number, tareLb: number, nominalPropaneLb: number, outOfService: boolean }
  truck: { id: string, fleetNumber: string } | null
  requalification: { dueOn: string, status: 'current' | 'due_soon' | 'overdue', daysLeft: number }
  fillBlocks: FitReason[]
  mountBlocks: FitReason[]
  fillLimitLb: number | null
  lpTransfer: { current: boolean, expiresOn: string | null }
  roles: string[]
}

/** POST /api/battery-room/swaps */
export interface SwapAnswer { item: { id: string }, replayed: boolean, warnings: FitReason[], overridden?: FitReason[], /** why the operator is not authorised for the truck's class (site policy: warn) */ authorisation?: AuthorisationReason | null }
/** POST /api/battery-room/charges */
export interface ChargeOnAnswer { item: { id: string }, replayed: boolean, warnings?: FitReason[] }
/** POST /api/battery-room/charges/:id/end */
export interface ChargeOffAnswer { item: { gridKwh: number | null, energyCost: number | null, countedCycle: boolean, ranHot: boolean }, currency: string }
/** POST /api/battery-room/checks (a repeated key answers the stored check without the cell list) */
export interface CheckAnswer { item: { id: string, meanCorrectedSg: number | null, spread: number | null, stateOfChargePct: number | null }, lowCells?: number[], warnings: FitReason[] }
/** POST /api/cylinders/:id/refills */
export interface RefillAnswer { item: { id: string, netAddedLb: number | null, gallonsAt60F: number | null }, cylinder: { id: string, status: string }, repeated: boolean }
/** POST /api/trucks/:id/cylinder-exchanges */
export interface ExchangeAnswer { item: { id: string }, repeated: boolean, /** why the operator is not authorised for the truck's class (site policy: warn) */ authorisation?: AuthorisationReason | null }
/** POST /api/cylinders/:id/requalifications */
export interface RequalificationAnswer { requalification: { dueOn: string } }
/** POST /api/trucks/:id/emissions-tests */
export interface EmissionsTestAnswer { item: { id: string, passed: boolean, nextDueOn: string }, verdict: { pass: boolean, reasons: string[], findings: FitReason[] }, policy: EmissionsPolicy, source: string }
/** POST /api/fuel/co-readings */
export interface CoReadingsAnswer { items: { id: string, ppm: number, durationHours: number }[], alert: boolean, assessment: CoExposureAssessment, limits: object }
/** POST /api/incidents */
export interface IncidentAnswer { alerted: number }
/** POST /api/logs/entries */
export interface LogEntriesAnswer { followUps: string[] }
