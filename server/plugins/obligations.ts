import type { AssetKind } from '#shared/utils/asset-schemas'

// What is due on an asset (the tag page and the asset pages): its obligations, read from the obligations
// table with their state on the site's today — the same rows the due list shows.
export default defineNitroPlugin(() => {
  for (const kind of ['battery', 'truck', 'charger', 'cylinder', 'area'] as AssetKind[]) {
    registerAssetStatus(kind, async (row) => {
      const label = String(row.serial ?? row.fleetNumber ?? row.name ?? '')
      const items = await obligationsOfSubject(useDb(), row.siteId, { kind, id: row.id, label, tagCode: null })
      return { due: items.map(o => ({ what: o.what, kind: o.kind, dueOn: o.dueOn, state: o.state, detail: o.detail, detailWords: o.detailWords, action: o.action })) }
    })
  }
})
