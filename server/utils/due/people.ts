import { sql } from 'drizzle-orm'
import { rowsOf } from './effective'
import { recomputeSubjects } from './rules'
import type { ReadModelDb } from './write'

// A person's obligations (the operator evaluation) live at each site they belong to: a new qualification,
// a role change, a rename or a deactivation recomputes them at every such site (and at `alsoSiteIds`,
// where a role was just taken away).
export async function recomputePersonAtSites(db: ReadModelDb, userId: string, alsoSiteIds: readonly string[] = []) {
  const member = await rowsOf<{ siteId: string }>(db, sql`SELECT DISTINCT site_id AS "siteId" FROM memberships WHERE user_id = ${userId}`)
  const siteIds = [...new Set([...member.map(m => m.siteId), ...alsoSiteIds])]
  for (const siteId of siteIds) await recomputeSubjects(db, siteId, [{ kind: 'person', id: userId }], { lock: false })
}
