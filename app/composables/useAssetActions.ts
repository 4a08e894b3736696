import type { AssetKind } from '#shared/utils/asset-schemas'

// Create, edit and out-of-service flows for the asset registry: $fetch, then refresh the cached lists.
export function useAssetActions(kind: AssetKind) {
  const view = ASSET_VIEWS[kind]
  const toast = useToast()
  const i18n = useNuxtApp().$i18n

  async function save(values: Record<string, unknown>, id?: string) {
    const session = useSessionStore()
    const result = id
      ? await $fetch<{ item: { id: string } }>(`${view.api}/${id}`, { method: 'PATCH', body: values })
      : await $fetch<{ item: { id: string } }>(view.api, { method: 'POST', body: { ...values, siteId: session.siteId } })
    await refreshNuxtData([`${kind}-list`, `${kind}-${result.item.id}`])
    toast.show(i18n.t(id ? 'toast.saved' : `toast.added.${kind}`))
    return result.item
  }

  async function setOutOfService(id: string, outOfService: boolean, reason: string) {
    await $fetch(`${view.api}/${id}/out-of-service`, { method: 'POST', body: { outOfService, reason } })
    await refreshNuxtData([`${kind}-list`, `${kind}-${id}`, `history-${kind}-${id}`])
    toast.show(i18n.t(outOfService ? 'toast.out_of_service' : 'toast.back_in_service'))
  }

  return { save, setOutOfService }
}
