import { CORRECTION_PATHS, type CorrectableKind } from '#shared/utils/correction-schemas'

// Correcting a record from an asset's history: post the correction (one retry key per opened form),
// then refresh the asset's history and its record.
export function useCorrectionActions(assetKind: string, assetId: string) {
  const toast = useToast()
  async function correct(kind: CorrectableKind, recordId: string, idempotencyKey: string, values: Record<string, unknown>) {
    await $fetch(`${CORRECTION_PATHS[kind]}/${recordId}/corrections`, { method: 'POST', body: { ...values, idempotencyKey } })
    await refreshNuxtData([`history-${assetKind}-${assetId}`, `${assetKind}-${assetId}`])
    toast.show('Correction saved; the original is kept beside it.')
  }
  return { correct }
}
