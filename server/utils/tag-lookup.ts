import type { H3Event } from 'h3'
import { LRUCache } from 'lru-cache'
import type { PgTable } from 'drizzle-orm/pg-core'
import type { AssetKind } from '#shared/utils/asset-schemas'
import type { Actor } from './auth'
import type { Database } from './db'

const NOT_FOUND = 'No tag with that code at your sites. Check the code on the label and type it again.'

// A tag code (as typed or scanned) to its asset, among the user's sites. Unknown codes and codes of
// sites the user cannot see get the same 404, so a code's existence does not leak.
export async function resolveTagForActor(event: H3Event, raw: string) {
  const code = normalizeTagCode(raw)
  const actor = await requireActor(event)
  if (!code) throw codedError(404, 'tag_not_found', NOT_FOUND)
  // the code's letter names its asset's kind (Bayward issues every code so), so even a code's first look-up
  // reads the tag and its asset in one statement; a code whose letter does not (a row written by hand) takes
  // the long way once, and its kind is then known
  const kind = codeKinds.get(code) ?? tagKind(code)
  if (kind) {
    const found = await tagWithAsset(code, kind, actor.siteIds)
    if (found) return { actor, ...found }
  }
  const db = useDb()
  const [tag] = await db.select().from(tables.tags).where(eq(tables.tags.code, code))
  if (!tag || !actor.siteIds.includes(tag.siteId)) throw codedError(404, 'tag_not_found', NOT_FOUND)
  const { row, tagCode } = await findAssetForActor(event, tag.assetKind, tag.assetId)
  codeKinds.set(code, tag.assetKind)
  return { actor, tag, kind: tag.assetKind, row, liveCode: tagCode }
}

// The asset kind of a code whose letter does not name it, learnt from its first look-up (a code names one
// asset for life, retired or not): with it, the tag and its asset come in one statement, not two after each other.
const codeKinds = new LRUCache<string, AssetKind>({ max: 20_000 })

async function tagWithAsset(code: string, kind: AssetKind, siteIds: string[]) {
  if (siteIds.length === 0) return null
  const [found] = await tagQuery(useDb(), kind).execute({ code })
  // the user's sites are checked here, not in the statement: its text and plan then stay the same for everyone
  if (!found || !siteIds.includes(found.tag.siteId) || !siteIds.includes((found.row as { siteId: string }).siteId)) return null
  if (found.facts) keepFactsWithAsset(found.row, found.facts)
  return { tag: found.tag, kind, row: found.row as Record<string, unknown> & { id: string, siteId: string }, liveCode: found.tagCode }
}

// The tag and its asset of one kind, as a statement whose SQL is built once per database and kind (a scan
// builds no query text). The facts the asset's status providers registered come with it (asset-status.ts:
// what is due on it, a battery's status, a truck's battery), so its status asks PostgreSQL nothing more.
function buildTagQuery(db: Database, kind: AssetKind) {
  const cfg = assetKinds()[kind]
  const facts = sql<Record<string, unknown> | null>`${assetFactsSql(kind, sql`${cfg.table}`) ?? sql`NULL::json`}`
  return db
    .select({ tag: tables.tags, row: cfg.table, tagCode: liveTagCode(kind, cfg.table), facts })
    .from(tables.tags)
    .innerJoin(cfg.table as PgTable, eq(cfg.table.id, tables.tags.assetId))
    .where(and(eq(tables.tags.code, sql.placeholder('code')), eq(tables.tags.assetKind, kind)))
    .prepare(`bayward_tag_${kind}`)
}
const tagQueries = new WeakMap<Database, Map<AssetKind, ReturnType<typeof buildTagQuery>>>()
function tagQuery(db: Database, kind: AssetKind) {
  let byKind = tagQueries.get(db)
  if (!byKind) tagQueries.set(db, byKind = new Map())
  let query = byKind.get(kind)
  if (!query) byKind.set(kind, query = buildTagQuery(db, kind))
  return query
}

// Which site a code belongs to, learnt from earlier look-ups: a tag keeps its site for life. It only picks
// the cache entry; the entry is used when the user is a member of that site and it answers for that site.
const TAG_CACHE_MS = 5_000
const codeSites = new LRUCache<string, string>({ max: 20_000 })

/**
 * A tag's view (asset and state, no one's roles), shared between the users of its site for a few seconds
 * and recomputed after any write there. `resolve` does the full look-up and its checks.
 */
export async function tagViewForActor<T extends { asset: { siteId: string } }>(event: H3Event, raw: string, resolve: () => Promise<T>): Promise<{ actor: Actor, view: T }> {
  const actor = await requireActor(event)
  const code = normalizeTagCode(raw)
  const siteId = code ? codeSites.get(code) : undefined
  if (code && siteId && actor.siteIds.includes(siteId)) {
    const view = await cachedForSite(actor, siteId, `tag:${code}`, TAG_CACHE_MS, resolve)
    if (view.asset.siteId === siteId) return { actor, view }
  }
  const view = await resolve()
  if (code) codeSites.set(code, view.asset.siteId)
  return { actor, view }
}
