import type { Actor } from '../auth'
import type { SqlRunner } from './effective'
import { loadSiteContext, type SiteContext } from './site-context'

/**
 * The site's context (its row and its schedules), kept until either changes (a schedule edit, a settings
 * change) rather than until the next record written at the site.
 * Inside a transaction pass the transaction: a miss read through the pool would hold one connection
 * while waiting for another, and at shift change every connection can be held that way at once. For the
 * same reason a caller inside a transaction never waits for another request's load still in flight; it
 * loads its own (cachedConfigForSite's `inTransaction`).
 */
export function cachedSiteContext(actor: Actor, siteId: string, db: SqlRunner = useDb()): Promise<SiteContext> {
  return cachedConfigForSite(actor, siteId, 'site-context', 60_000, () => loadSiteContext(db, siteId), { inTransaction: db !== useDb() })
}
