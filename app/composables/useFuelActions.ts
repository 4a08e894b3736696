import type { RefillInput } from '#shared/utils/fuel-schemas'
import type { FloorRecordWords } from '~/composables/useBatteryRoomActions'

export interface CylinderLookup {
  item: Record<string, unknown> & { id: string, serial: string, tagCode: string | null, status: string, waterCapacityLb: number, tareLb: number, nominalPropaneLb: number, outOfService: boolean }
  truck: { id: string, fleetNumber: string } | null
  requalification: { dueOn: string, status: 'current' | 'due_soon' | 'overdue', daysLeft: number }
  fillBlocks: string[]
  mountBlocks: string[]
  fillLimitLb: number | null
  lpTransfer: { current: boolean, expiresOn: string | null }
  roles: string[]
}

export interface Refusal {
  status: number
  message: string
  reasons: string[]
  offerQuarantine: boolean
}

// Refusals come back as 403/409/422 with data.reasons; this turns them into something to show.
export function refusalFrom(error: unknown): Refusal | null {
  const e = error as { statusCode?: number, data?: { message?: string, data?: { reasons?: string[], offerQuarantine?: boolean } } }
  if (!e?.statusCode || ![403, 409, 422].includes(e.statusCode)) return null
  return {
    status: e.statusCode,
    message: e.data?.message ?? 'Refused.',
    reasons: e.data?.data?.reasons ?? [e.data?.message ?? 'Refused.'],
    offerQuarantine: !!e.data?.data?.offerQuarantine,
  }
}

// Fuel-station flows: refill, quarantine, cylinder change, requalification, emissions test, CO readings.
export function useFuelActions() {
  const toast = useToast()
  const session = useSessionStore()
  const { submitFloorRecord } = useFloorSubmit()
  const cylinderKeys = (id: string) => ['fuel-cage', 'cylinder-list', `cylinder-${id}`, `history-cylinder-${id}`]

  function lookupCylinder(code: string) {
    return $fetch<CylinderLookup>('/api/fuel/cylinders/lookup', { query: { siteId: session.siteId, code } })
  }

  // through the device outbox: `keptKey` is set when the record is kept on the device to send later
  async function refill(cylinderId: string, body: Partial<RefillInput>, words: FloorRecordWords = { label: 'Cylinder refill' }) {
    const outcome = await submitFloorRecord<{ item: { id: string, netAddedLb: number | null, gallonsAt60F: number | null } }>({ kind: 'refill', url: `/api/cylinders/${cylinderId}/refills`, body, atField: 'at', ...words })
    if (outcome.state === 'kept') {
      return { id: null, netAddedLb: null, gallonsAt60F: null, keptKey: outcome.key }
    }
    await Promise.all([refreshNuxtData(cylinderKeys(cylinderId)), refreshDue()])
    toast.show('Refill recorded: the cylinder is full.')
    return { ...outcome.data.item, keptKey: null }
  }

  async function quarantine(cylinderId: string, reason: string) {
    await $fetch(`/api/cylinders/${cylinderId}/quarantine`, { method: 'POST', body: { reason } })
    await refreshNuxtData(cylinderKeys(cylinderId))
    toast.show('Cylinder quarantined in the cage.')
  }

  // through the device outbox: `keptKey` is set when the record is kept on the device to send later
  async function exchange(truckId: string, body: { cylinderOnCode: string, cylinderOffId: string | null, hourMeter?: number | null, idempotencyKey: string, note?: string }, words: FloorRecordWords = { label: 'Cylinder change' }) {
    const outcome = await submitFloorRecord<{ item: { id: string } }>({ kind: 'exchange', url: `/api/trucks/${truckId}/cylinder-exchanges`, body, atField: 'at', ...words })
    if (outcome.state === 'kept') {
      return { id: null, keptKey: outcome.key }
    }
    await refreshNuxtData(['fuel-cage', 'fuel-lp-trucks', `truck-${truckId}`, `history-truck-${truckId}`])
    toast.show('Cylinder change recorded.')
    return { ...outcome.data.item, keptKey: null }
  }

  async function recordRequalification(cylinderId: string, body: Record<string, unknown>) {
    const result = await $fetch<{ requalification: { dueOn: string } }>(`/api/cylinders/${cylinderId}/requalifications`, { method: 'POST', body })
    await Promise.all([refreshNuxtData([...cylinderKeys(cylinderId), `requalifications-${cylinderId}`]), refreshDue()])
    toast.show(`Requalification recorded. Next due ${result.requalification.dueOn}.`)
    return result
  }

  async function uploadCertificate(file: File) {
    const form = new FormData()
    form.append('file', file, file.name)
    const result = await $fetch<{ item: { id: string, displayName: string } }>('/api/uploads', { method: 'POST', query: { siteId: session.siteId }, body: form })
    return result.item
  }

  async function recordEmissionsTest(truckId: string, body: Record<string, unknown>) {
    const result = await $fetch<{ item: { passed: boolean, nextDueOn: string }, verdict: { reasons: string[] } }>(`/api/trucks/${truckId}/emissions-tests`, { method: 'POST', body })
    await Promise.all([refreshNuxtData(['fuel-emissions', `emissions-tests-${truckId}`, `truck-${truckId}`, `history-truck-${truckId}`]), refreshDue()])
    toast.show(result.item.passed ? `Passed. Next test due ${result.item.nextDueOn}.` : `Failed. Retest due ${result.item.nextDueOn}.`, result.item.passed ? 'safe' : 'danger')
    return result
  }

  async function recordCoReadings(body: Record<string, unknown>) {
    const result = await $fetch<{ alert: boolean, assessment: { twaPpm: number } }>('/api/fuel/co-readings', { method: 'POST', body: { ...body, siteId: session.siteId } })
    await Promise.all([refreshNuxtData('fuel-co'), refreshDue()])
    toast.show(result.alert ? 'Saved. A reading is above the 200 ppm ceiling: clear the area and ventilate.' : 'CO readings saved.', result.alert ? 'danger' : 'safe')
    return result
  }

  return { lookupCylinder, refill, quarantine, exchange, recordRequalification, uploadCertificate, recordEmissionsTest, recordCoReadings }
}
