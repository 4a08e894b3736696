import type { FloorLookup, CylinderLookup } from '#shared/types/floor'
import { CORRECTION_PATHS, type CorrectableKind } from '#shared/utils/correction-schemas'

const WANTED_KIND: Record<string, string> = { truckId: 'truck', batteryInId: 'battery', batteryOutId: 'battery' }

// Correcting a record from an asset's history: assets typed by code become ids, the correction is posted
// (one retry key per opened form), then the asset's history and its record are refreshed.
export function useCorrectionActions(assetKind: string, assetId: string) {
  const toast = useToast()
  const session = useSessionStore()
  const { t } = useNuxtApp().$i18n

  /** The id of an asset typed by tag code, serial or fleet number (empty: none). */
  async function assetIdOf(field: string, typed: string): Promise<string | null> {
    const code = typed.trim()
    if (!code) return null
    const siteId = session.siteId ?? ''
    if (field === 'cylinderOnId') return (await $fetch<CylinderLookup>('/api/fuel/cylinders/lookup', { query: { siteId, code } })).item.id
    const found = await $fetch<FloorLookup>('/api/battery-room/lookup', { query: { siteId, code } })
    if (WANTED_KIND[field] && found.kind !== WANTED_KIND[field]) throw new Error(t('correction.wrong_kind', { code, wanted: t(`correction.wanted.${WANTED_KIND[field]}`) }))
    return found.id
  }

  async function correct(kind: CorrectableKind, recordId: string, idempotencyKey: string, values: Record<string, unknown>) {
    await $fetch(`${CORRECTION_PATHS[kind]}/${recordId}/corrections`, { method: 'POST', body: { ...values, idempotencyKey } })
    await refreshNuxtData([`history-${assetKind}-${assetId}`, `${assetKind}-${assetId}`])
    toast.show(t('correction.saved'))
  }
  return { assetIdOf, correct }
}
