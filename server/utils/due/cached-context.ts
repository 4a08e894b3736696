import type { Actor } from '../auth'
import { loadSiteContext, type SiteContext } from './site-context'

/** The site's context kept per site revision: settings and schedules change only by writes that move it. */
export function cachedSiteContext(actor: Actor, siteId: string): Promise<SiteContext> {
  return cachedForSite(actor, siteId, 'site-context', 60_000, () => loadSiteContext(useDb(), siteId))
}
