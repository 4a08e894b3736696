import type { AssetKind } from '#shared/utils/asset-schemas'
import type { SubjectRow } from '../utils/due/list'

// What is due on an asset (the tag page and the asset pages): its obligations, read from the obligations
// table with their state on the site's today — the same rows the due list shows. A battery's come with its
// status, in the battery room's one statement (plugins/battery-room.ts); on the tag page, another asset's
// come with the tag and the asset (server/utils/tag-lookup.ts).
export default defineNitroPlugin(() => {
  for (const kind of ['truck', 'charger', 'cylinder', 'area'] as AssetKind[]) {
    registerAssetFacts(kind, 'due', table => subjectObligationsJson(sql`${table}.site_id`, kind, sql`${table}.id`))
    registerAssetStatus(kind, async (row) => {
      const label = String(row.serial ?? row.fleetNumber ?? row.name ?? '')
      const subject = { kind, id: row.id, label, tagCode: null }
      // the tag look-up brings them with the asset once it knows the code's kind; otherwise ask
      const known = factsCameWithAsset<SubjectRow[]>(row, 'due')
      const items = known ? subjectObligations(known, subject) : await obligationsOfSubject(useDb(), row.siteId, subject)
      return { due: statusDueItems(items) }
    })
  }
})
