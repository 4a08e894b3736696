import type { z } from 'zod'
import type { coReadingsSchema, emissionsTestSchema, exchangeSchema, refillSchema, requalificationSchema } from '#shared/utils/fuel-schemas'
import type { CoReadingsAnswer, CylinderLookup, EmissionsTestAnswer, ExchangeAnswer, RefillAnswer, RequalificationAnswer } from '#shared/types/floor'
import type { FloorOutcome, FloorRecordWords } from '~/composables/useFloorForm'

export type { CylinderLookup } from '#shared/types/floor'
type Keyed<S extends z.ZodType> = z.input<S> & { idempotencyKey: string }

// Fuel-station flows: refill, quarantine, cylinder change, requalification, emissions test, CO readings.
export function useFuelActions() {
  const toast = useToast()
  const i18n = useNuxtApp().$i18n
  const { day } = useLocaleFormat()
  const session = useSessionStore()
  const { submitFloorRecord } = useFloorSubmit()
  const cylinderKeys = (id: string) => ['fuel-cage', 'cylinder-list', `cylinder-${id}`, `history-cylinder-${id}`]

  /** A scanned or typed cylinder code; with no signal, the device's copy from the last look-up. */
  function lookupCylinder(code: string) {
    return lookupOrSeen('cylinder', code, () => $fetch<CylinderLookup>('/api/fuel/cylinders/lookup', { query: { siteId: session.siteId, code } }), f => f.item.tagCode)
  }

  // through the device outbox: kept on the device when the connection drops
  async function refill(cylinderId: string, body: Keyed<typeof refillSchema>, words: FloorRecordWords): Promise<FloorOutcome<RefillAnswer>> {
    const outcome = await submitFloorRecord<RefillAnswer>({ kind: 'refill', url: `/api/cylinders/${cylinderId}/refills`, body, atField: 'at', ...words })
    if (outcome.state === 'saved') {
      await Promise.all([refreshNuxtData(cylinderKeys(cylinderId)), refreshDue()])
      toast.show(i18n.t('toast.refill_recorded'))
    }
    return outcome
  }

  async function quarantine(cylinderId: string, reason: string) {
    await $fetch(`/api/cylinders/${cylinderId}/quarantine`, { method: 'POST', body: { reason } })
    await refreshNuxtData(cylinderKeys(cylinderId))
    toast.show(i18n.t('toast.cylinder_quarantined'))
  }

  // through the device outbox: kept on the device when the connection drops
  async function exchange(truckId: string, body: Keyed<typeof exchangeSchema>, words: FloorRecordWords): Promise<FloorOutcome<ExchangeAnswer>> {
    const outcome = await submitFloorRecord<ExchangeAnswer>({ kind: 'exchange', url: `/api/trucks/${truckId}/cylinder-exchanges`, body, atField: 'at', ...words })
    if (outcome.state === 'saved') {
      await Promise.all([refreshNuxtData(['fuel-cage', 'fuel-lp-trucks', `truck-${truckId}`, `history-truck-${truckId}`]), refreshDue()])
      toast.show(i18n.t('toast.cylinder_changed'))
    }
    return outcome
  }

  async function recordRequalification(cylinderId: string, body: z.input<typeof requalificationSchema>) {
    const result = await $fetch<RequalificationAnswer>(`/api/cylinders/${cylinderId}/requalifications`, { method: 'POST', body })
    await Promise.all([refreshNuxtData([...cylinderKeys(cylinderId), `requalifications-${cylinderId}`]), refreshDue()])
    toast.show(i18n.t('toast.requal_recorded', { day: day(result.requalification.dueOn) }))
    return result
  }

  async function uploadCertificate(file: File) {
    const form = new FormData()
    form.append('file', file, file.name)
    const result = await $fetch<{ item: { id: string, displayName: string } }>('/api/uploads', { method: 'POST', query: { siteId: session.siteId }, body: form })
    return result.item
  }

  async function recordEmissionsTest(truckId: string, body: z.input<typeof emissionsTestSchema>) {
    const result = await $fetch<EmissionsTestAnswer>(`/api/trucks/${truckId}/emissions-tests`, { method: 'POST', body })
    await Promise.all([refreshNuxtData(['fuel-emissions', `emissions-tests-${truckId}`, `truck-${truckId}`, `history-truck-${truckId}`]), refreshDue()])
    toast.show(i18n.t(result.item.passed ? 'toast.emissions_passed' : 'toast.emissions_failed', { day: day(result.item.nextDueOn) }), result.item.passed ? 'safe' : 'danger')
    return result
  }

  async function recordCoReadings(body: z.input<typeof coReadingsSchema>) {
    const result = await $fetch<CoReadingsAnswer>('/api/fuel/co-readings', { method: 'POST', body })
    await Promise.all([refreshNuxtData('fuel-co'), refreshDue()])
    toast.show(i18n.t(result.alert ? 'toast.co_above_ceiling' : 'toast.co_saved'), result.alert ? 'danger' : 'safe')
    return result
  }

  return { lookupCylinder, refill, quarantine, exchange, recordRequalification, uploadCertificate, recordEmissionsTest, recordCoReadings }
}
