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
  const [{ byId }, [site]] = await Promise.all([
    areaNames(query.siteId),
    useDb().select({ timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, query.siteId)),
  ])
  const csv = toCsv(kind, (rows as ListRow[]).map(row => registryListItem(row)), byId)
  // the file is named by the site's today, as the people there write the date on it
  return sendCsv(event, `bayward-${kind}-list-${localDate(new Date(), site?.timeZone ?? 'UTC')}.csv`, csv)
}
