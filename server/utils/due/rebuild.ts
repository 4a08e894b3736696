import { sql } from 'drizzle-orm'
import type { PostgresJsDatabase } from 'drizzle-orm/postgres-js'
import type * as schema from '../../database/schema'
import { rowsOf } from './effective'
import { rebuildSiteReadModels } from './rules'

// `npm run rebuild-state`: every read model recomputed from the records, one site per transaction (a
// write at another site is never held up by it). The recovery path, and what runs after a migration
// that sets read_model_rebuilds.needed (set-up and the server at start both check it).

type Database = PostgresJsDatabase<typeof schema>

export interface RebuildReport {
  sites: number
  batteries: number
  trucks: number
  obligations: number
  ms: number
}

export async function rebuildReadModels(db: Database, opts: { siteIds?: string[], log?: (line: string) => void } = {}): Promise<RebuildReport> {
  const started = Date.now()
  const siteIds = opts.siteIds ?? (await rowsOf<{ id: string }>(db, sql`SELECT id FROM sites ORDER BY name`)).map(s => s.id)
  const report: RebuildReport = { sites: 0, batteries: 0, trucks: 0, obligations: 0, ms: 0 }
  for (const siteId of siteIds) {
    const computed = await db.transaction(async (tx) => {
      // two rebuilds of one site (two servers starting at once) take turns
      await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtext(${`read-models:${siteId}`}))`)
      const result = await rebuildSiteReadModels(tx, siteId)
      // the energy report's kept months are made again from the records when next read
      await tx.execute(sql`DELETE FROM charge_month_rollups WHERE site_id = ${siteId}`)
      // cached read models of the site are stale now
      await tx.execute(sql`SELECT site_revisions_touch(ARRAY[${siteId}]::uuid[])`)
      return result
    })
    report.sites += 1
    report.batteries += computed.batteryStatus.length
    report.trucks += computed.truckStatus.length
    report.obligations += computed.obligations.length
    opts.log?.(`  site ${report.sites}/${siteIds.length}: ${computed.batteryStatus.length} batteries, ${computed.obligations.length} obligations`)
  }
  report.ms = Date.now() - started
  return report
}

/** Runs the rebuild when a migration asked for it; false when nothing was needed. */
export async function rebuildReadModelsIfNeeded(db: Database, log?: (line: string) => void): Promise<RebuildReport | false> {
  const [flag] = await rowsOf<{ needed: boolean, requestedMs: number }>(db, sql`
    SELECT needed, (EXTRACT(EPOCH FROM requested_at) * 1000)::float8 AS "requestedMs" FROM read_model_rebuilds WHERE id = 1`)
  if (!flag?.needed) return false
  const report = await rebuildReadModels(db, { log })
  await db.execute(sql`UPDATE read_model_rebuilds SET needed = false, done_at = now() WHERE id = 1 AND requested_at <= to_timestamp(${flag.requestedMs / 1000})`)
  return report
}

/** Asks for a rebuild at the next start or set-up (a change to what the read models hold). */
export async function requestReadModelRebuild(db: Pick<Database, 'execute'>, reason: string) {
  await db.execute(sql`INSERT INTO read_model_rebuilds (id, needed, reason) VALUES (1, true, ${reason})
    ON CONFLICT (id) DO UPDATE SET needed = true, reason = EXCLUDED.reason, requested_at = now()`)
}
