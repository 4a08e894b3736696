import type { FitReason } from '#shared/utils/battery-fit'

export interface FloorLookup {
  kind: 'battery' | 'truck' | 'charger'
  id: string
  code: string | null
  label: string
  battery?: BayCardData
  truck?: { fleetNumber: string, power: string, systemVoltage: number | null, hourMeter: number, outOfService: boolean, currentBattery: { id: string, serial: string, tagCode: string | null } | null }
  charger?: { name: string, outputVoltage: number, outOfService: boolean, chemistryProfiles: string[], minCapacityAh: number, maxCapacityAh: number, openSession: { id: string, batteryId: string, at: string, serial: string } | null }
}

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
  state: 'in_truck' | 'on_charge' | 'cooling' | 'ready' | 'needs_charge' | 'out_of_service'
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

/** A refused check as the server answers it: every reason, and whether this user may override. */
export interface BatteryRoomRefusal {
  message: string
  reasons: FitReason[]
  overridable: boolean
}

export function refusalOf(error: unknown): BatteryRoomRefusal | null {
  const e = error as { statusCode?: number, data?: { message?: string, data?: { reasons?: FitReason[], overridable?: boolean } } }
  const reasons = e?.data?.data?.reasons
  if (!reasons?.length) return null
  return { message: e.data?.message ?? '', reasons, overridable: !!e.data?.data?.overridable }
}

/** What a floor form says about its record when the outbox keeps it: the label and the entered values in words. */
export interface FloorRecordWords { label: string, details?: string[] }

type SwapAnswer = { item: { id: string }, warnings: FitReason[], overridden?: FitReason[] }
type ChargeOnAnswer = { item: { id: string } }
type ChargeOffAnswer = { item: { gridKwh: number, energyCost: number, countedCycle: boolean, ranHot: boolean }, currency: string }
type CheckAnswer = { item: { id: string, meanCorrectedSg: number | null, spread: number | null, stateOfChargePct: number | null }, lowCells: number[], warnings: FitReason[] }

// Swaps, charges and electrolyte checks from the floor forms: through the device outbox, toast, refresh the board.
export function useBatteryRoomActions() {
  const toast = useToast()
  const session = useSessionStore()
  const { submitFloorRecord } = useFloorSubmit()
  const BOARD_KEYS = ['bay-board']

  function lookup(code: string) {
    return $fetch<FloorLookup>('/api/battery-room/lookup', { query: { siteId: session.siteId, code } })
  }

  async function settle<T>(outcome: FloorOutcome<T>, saved: (data: T) => void) {
    // a kept record is shown by the form itself and by the outbox banner
    if (outcome.state === 'kept') return outcome
    await Promise.all([refreshNuxtData(BOARD_KEYS), refreshDue()])
    saved(outcome.data)
    return outcome
  }

  async function swap(body: { truckId: string, batteryOutId: string | null, batteryInId: string, hourMeter: number, overrideReason?: string, idempotencyKey: string }, words: FloorRecordWords) {
    const outcome = await submitFloorRecord<SwapAnswer>({ kind: 'swap', url: '/api/battery-room/swaps', body, ...words })
    return settle(outcome, r => toast.show(r.overridden?.length ? 'Battery changed; the override is logged.' : 'Battery changed.'))
  }

  async function chargeOn(body: { batteryId: string, chargerId: string, overrideReason?: string, idempotencyKey: string }, words: FloorRecordWords) {
    const outcome = await submitFloorRecord<ChargeOnAnswer>({ kind: 'charge_on', url: '/api/battery-room/charges', body, ...words })
    return settle(outcome, () => toast.show('On charge.'))
  }

  async function chargeOff(sessionId: string, body: { ampHoursReturned: number, endTempF: number, equalize: boolean, outcome: 'complete' | 'interrupted', idempotencyKey: string }, words: FloorRecordWords) {
    const outcome = await submitFloorRecord<ChargeOffAnswer>({ kind: 'charge_off', url: `/api/battery-room/charges/${sessionId}/end`, body, atField: 'endedAt', ...words })
    return settle(outcome, r => toast.show(r.item.ranHot ? 'Off charge. It ran hot: let it cool and check it.' : 'Off charge; cooling now.', r.item.ranHot ? 'danger' : 'safe'))
  }

  async function check(body: Record<string, unknown>, words: FloorRecordWords) {
    const outcome = await submitFloorRecord<CheckAnswer>({ kind: 'check', url: '/api/battery-room/checks', body, ...words })
    return settle(outcome, r => toast.show(r.lowCells.length ? `Saved. Weak cell: ${r.lowCells.join(', ')}.` : 'Check saved.', r.lowCells.length ? 'danger' : 'safe'))
  }

  return { lookup, swap, chargeOn, chargeOff, check }
}

/** A version-4 UUID for a form's retry key (crypto.randomUUID needs a secure context; getRandomValues does not). */
export function newIdempotencyKey(): string {
  const b = crypto.getRandomValues(new Uint8Array(16))
  b[6] = (b[6]! & 0x0f) | 0x40
  b[8] = (b[8]! & 0x3f) | 0x80
  const h = [...b].map(x => x.toString(16).padStart(2, '0')).join('')
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`
}

/** One cell of the hydrometer grid as typed. */
export interface CheckCellEntry { sg: string, temp: string, error: string }
