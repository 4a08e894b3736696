import type { Actor } from '../auth'
import type { SqlRunner } from './effective'
import { loadSiteContext, type SiteContext } from './site-context'

/**
 * The site's context kept per site revision: settings and schedules change only by writes that move it.
 * Inside a transaction pass the transaction: a miss read through the pool would hold one connection
 * while waiting for another, and at shift change every connection can be held that way at once.
 */
export function cachedSiteContext(actor: Actor, siteId: string, db: SqlRunner = useDb()): Promise<SiteContext> {
  return cachedForSite(actor, siteId, 'site-context', 60_000, () => loadSiteContext(db, siteId))
}
