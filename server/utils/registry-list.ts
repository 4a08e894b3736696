import type { H3Event } from 'h3'
import type { PgTable } from 'drizzle-orm/pg-core'
import type { SQL } from 'drizzle-orm'
import type { AssetKind, ListQuery } from '#shared/utils/asset-schemas'
import { listQuerySchema } from '#shared/utils/asset-schemas'
import { batteryStateAt } from '#shared/utils/battery-state'
import type { StoredBatteryState } from '#shared/utils/derived-battery'

// An asset kind's list: its WHERE and ORDER BY, its status beside each row, a page of it (the CSV export,
// registry-csv.ts, reads the same query without paging). The kinds themselves are in registry.ts.

// The WHERE and ORDER BY of an asset list from its query (?siteId, q, sort, dir and the kind's filters).
export function listConditions(event: H3Event, kind: AssetKind, query: ListQuery) {
  const cfg = assetKinds()[kind]
  const raw = getQuery(event)
  const where: SQL[] = [eq(cfg.table.siteId, query.siteId)]
  for (const [name, f] of Object.entries(cfg.filters)) {
    if (raw[name] === undefined || raw[name] === '') continue
    const parsed = f.schema.safeParse(raw[name])
    if (!parsed.success) throw schemaFieldsError(parsed.error, `Check the filter "${name}".`, name)
    where.push(eq(f.column, parsed.data as never))
  }
  if (query.q) {
    const like = `%${query.q.replace(/[\\%_]/g, m => `\\${m}`)}%`
    where.push(or(...cfg.search.map(col => ilike(col, like)), sql`${liveTagCode(kind, cfg.table)} ILIKE ${like}`)!)
  }
  // only the kind's own sort keys: `constructor`, `__proto__` and other names every object answers to are refused
  if (query.sort && !Object.hasOwn(cfg.sortable, query.sort)) {
    throw checkFieldsError({ sort: 'Not a column this list sorts by.' }, `Sort by one of: ${Object.keys(cfg.sortable).join(', ')}.`, { sort: { code: 'invalid_value' } })
  }
  const sortKey = query.sort ?? cfg.defaultSort
  const sortCol = cfg.sortable[sortKey]!
  return { condition: and(...where), sortKey, order: [query.dir === 'desc' ? desc(sortCol) : asc(sortCol), asc(cfg.table.id)] }
}

// The kind's status read model (cycles and state of a battery, a truck's hour meter now) beside each row.
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- drizzle's builder types do not survive a conditional join
export function withStatusJoin(cfg: KindConfig, query: any): any {
  return cfg.status ? query.leftJoin(cfg.status.table, cfg.status.on) : query
}

export type ListRow = { row: Record<string, unknown>, tagCode: string | null } & Record<string, unknown>
/** A list row as the list sends it: the asset's columns, its status columns that are set, and its tag code. */
export function registryListItem(item: ListRow, now = new Date()) {
  // one object written field by field: spreading the row and the status into new objects cost ~8 µs an item
  const out: Record<string, unknown> = Object.assign({}, item.row)
  for (const key in item) {
    if (key === 'row' || key === 'tagCode') continue
    const value = item[key]
    if (value !== null && value !== undefined) out[key] = value
  }
  // a battery's stored state reads as it stands now (a charged one is Cooling until ready-at, then Ready)
  if (typeof out.state === 'string') out.state = batteryStateAt(out.state as StoredBatteryState, (out.readyAt as Date | undefined) ?? null, now).state
  out.tagCode = item.tagCode
  return out
}

// Server-side paged, sorted, filtered list of one asset kind at one site.
export async function listAssets(event: H3Event, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const query = validateQuery(event, listQuerySchema)
  await requireAbility(event, 'site.member', query.siteId)
  const { condition, sortKey, order } = listConditions(event, kind, query)
  const db = useDb()
  const now = new Date()
  const columns = { row: cfg.table, tagCode: liveTagCode(kind, cfg.table), ...cfg.status?.columns }
  const offset = (query.page - 1) * query.pageSize
  // Sorted by the asset's own columns, the page's ids are found first and only those 50 rows are joined to
  // their status (joined first, PostgreSQL read and sorted the status of every asset of the site). A sort
  // key named like a status column (a battery's cycles, a truck's hour meter now) needs the join to sort.
  const sortsByStatus = !!cfg.status && Object.hasOwn(cfg.status.columns, sortKey)
  const pageRows = sortsByStatus
    ? withStatusJoin(cfg, db.select(columns).from(cfg.table as PgTable)).where(condition).orderBy(...order).limit(query.pageSize).offset(offset)
    : withStatusJoin(cfg, db.select(columns).from(cfg.table as PgTable))
        .where(inArray(cfg.table.id, db.select({ id: cfg.table.id }).from(cfg.table as PgTable).where(condition).orderBy(...order).limit(query.pageSize).offset(offset)))
        .orderBy(...order)
  const [items, [{ total } = { total: 0 }]] = await Promise.all([
    pageRows,
    db.select({ total: count() }).from(cfg.table as PgTable).where(condition),
  ])
  return {
    items: (items as ListRow[]).map(item => registryListItem(item, now)),
    total: Number(total),
    page: query.page,
    pageSize: query.pageSize,
    sort: sortKey,
    dir: query.dir,
  }
}
