import type { InspectionRecorded } from '#shared/types/inspection'
import type { FloorOutcome, FloorRecordWords } from '~/composables/useFloorForm'

// Pre-shift truck inspection: the record (through the device outbox) and the return to service.
export function useInspectionActions() {
  const toast = useToast()
  const i18n = useNuxtApp().$i18n
  const { submitFloorRecord } = useFloorSubmit()
  const truckKeys = (id: string) => [`inspection-${id}`, `truck-${id}`, `history-truck-${id}`, 'bay-board']

  async function recordInspection(truckId: string, body: Record<string, unknown> & { idempotencyKey: string }, words: FloorRecordWords): Promise<FloorOutcome<InspectionRecorded>> {
    const outcome = await submitFloorRecord<InspectionRecorded>({ kind: 'inspection', url: `/api/trucks/${truckId}/inspections`, body, atField: 'at', ...words })
    if (outcome.state === 'saved') {
      await Promise.all([refreshNuxtData(truckKeys(truckId)), refreshDue()])
      toast.show(i18n.t('toast.inspection_recorded'))
    }
    return outcome
  }

  async function returnToService(truckId: string, whatWasDone: string) {
    await $fetch(`/api/trucks/${truckId}/return-to-service`, { method: 'POST', body: { whatWasDone } })
    await Promise.all([refreshNuxtData(truckKeys(truckId)), refreshDue()])
    toast.show(i18n.t('toast.truck_returned'), 'safe')
  }

  return { recordInspection, returnToService }
}
