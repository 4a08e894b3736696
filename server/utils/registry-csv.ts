import type { H3Event } from 'h3'
import type { PgTable } from 'drizzle-orm/pg-core'
import type { AssetKind } from '#shared/utils/asset-schemas'
import { listQuerySchema } from '#shared/utils/asset-schemas'

// Asset lists as CSV: the export (the list's query without paging). The import is in asset-import.ts.

// The whole filtered list as CSV (the same query as the list, without paging).
export async function exportAssets(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const query = validateQuery(event, listQuerySchema)
  await requireAbility(event, 'site.member', query.siteId)
  const { condition, order } = listConditions(event, kind, query)
  const rows = await withStatusJoin(cfg, useDb().select({ row: cfg.table, tagCode: liveTagCode(kind, cfg.table), ...cfg.status?.columns })
    .from(cfg.table as PgTable)).where(condition).orderBy(...order).limit(200_000)
  const { byId } = await areaNames(query.siteId)
  const csv = toCsv(kind, (rows as ListRow[]).map(row => registryListItem(row)), byId)
  return sendCsv(event, `bayward-${kind}-list-${new Date().toISOString().slice(0, 10)}.csv`, csv)
}
