// Demo data for Bayward: Quillmere Cold Logistics, two sites and a year of battery-room and fuel-station records.
// Usage: npx tsx scripts/seed.ts [--reset]
import postgres from 'postgres'
import { drizzle } from 'drizzle-orm/postgres-js'
import { eq, sql } from 'drizzle-orm'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import * as schema from '../server/database/schema'
import { defaultSiteSettings } from '../shared/utils/site-settings'
import { Clock } from './seed/clock'
import type { SeedContext } from './seed/context'
import { Random, uuidFactory } from './seed/random'
import { emptySeedRows } from './seed/rows'
import { buildOrganization, buildPeople, DEMO_ORGANIZATION, siteContexts } from './seed/people'
import { buildFleet } from './seed/fleet'
import { simulateBatteryRoom, writeChargeSessions, HISTORY_DAYS } from './seed/battery-history'
import { writeElectrolyteChecks } from './seed/electrolyte'
import { buildCylinders, simulateFuelStation } from './seed/fuel'
import { writeCoReadings, writeEmissionsTests } from './seed/compliance'
import { writeAreaLogs } from './seed/area-logs'
import { writeIncidents } from './seed/incidents'
import { writeInspections } from './seed/inspections'
import { insertSchedules } from './seed/schedules'
import { writeBatteryHolds, writeTagsAndAudit } from './seed/registry'
import { writeSeedFiles } from './seed/certificates'
import { countRows, insertSeedRows, truncateSchemaTables } from './seed/database'
import { boardSummary } from './seed/summary'
import { rebuildReadModels } from '../server/utils/due/rebuild'
import { DEMO_PASSWORD, DEMO_SIGN_INS } from './seed/sign-ins'

const SEED = 20261
const databaseUrl = process.env.NUXT_DATABASE_URL ?? 'postgres://bayward@127.0.0.1:54329/bayward'

// Everything is built in memory first, then written in one transaction.
async function buildDemo(now: Date) {
  const clock = new Clock(now)
  const rand = new Random(SEED)
  const newId = uuidFactory(SEED + 1)
  const rows = emptySeedRows()
  const registeredAt = clock.daysAgo(HISTORY_DAYS + 35)
  const scrypt = new Hash(new Scrypt({}))
  const hashes = await Promise.all(DEMO_SIGN_INS.map(() => scrypt.make(DEMO_PASSWORD)))

  const org = buildOrganization(rows, newId, registeredAt)
  const people = buildPeople(rows, newId, clock, rand, hashes, registeredAt, org.siteIds)
  const ctx: SeedContext = {
    clock,
    rand,
    newId,
    settings: defaultSiteSettings(),
    rows,
    adminId: people.adminId,
    lpRefillerId: people.lpRefillerId,
    fenwickLpExpiredOn: people.fenwickLpExpiredOn,
    sites: siteContexts(org.siteIds, org.siteNames, org.areas, people.people),
    registeredAt,
    files: [],
  }

  const fleet = buildFleet(ctx)
  const cylinders = buildCylinders(ctx)
  writeTagsAndAudit(ctx, { areas: org.areas, trucks: fleet.trucks, batteries: fleet.batteries.map(b => b.row), chargers: fleet.chargers, cylinders: cylinders.map(c => c.row) })

  const history = simulateBatteryRoom(ctx, fleet)
  writeChargeSessions(ctx, history)
  touchBatteries(rows, fleet)
  writeElectrolyteChecks(ctx, fleet, history)
  writeBatteryHolds(ctx, fleet, history.heldAt)

  const fuel = simulateFuelStation(ctx, cylinders, fleet.combustion)
  const cage = ctx.sites.fx.fuelStation
  const cageAudit = rows.auditLog.find(a => a.entityId === cage.id)
  if (cageAudit) cageAudit.after = { ...(cageAudit.after as object), lpStorageLimitLb: cage.lpStorageLimitLb }
  await writeEmissionsTests(ctx, fleet.combustion)
  writeCoReadings(ctx)
  writeAreaLogs(ctx)
  const dented = cylinders.find(c => c.special === 'quarantine')?.row
  const heldAt = dented && rows.assetHolds.find(h => h.assetId === dented.id)?.at
  writeIncidents(ctx, dented && heldAt ? { id: dented.id, heldAt } : undefined)

  rows.trucks.push(...fleet.trucks)
  writeInspections(ctx, fleet.trucks)
  rows.batteries.push(...fleet.batteries.map(b => b.row))
  rows.chargers.push(...fleet.chargers)
  rows.lpCylinders.push(...cylinders.map(c => c.row))
  return { rows, ctx, fleet, history, fuel }
}

// The battery and truck rows were last changed by their latest swap or charge.
function touchBatteries(rows: ReturnType<typeof emptySeedRows>, fleet: ReturnType<typeof buildFleet>) {
  const latest = new Map<string, Date>()
  const touch = (id: string | null | undefined, at: Date | null | undefined) => {
    if (id && at && (latest.get(id) ?? new Date(0)) < at) latest.set(id, at)
  }
  for (const s of rows.batterySwaps) {
    touch(s.batteryInId, s.at)
    touch(s.batteryOutId, s.at)
    touch(s.truckId, s.at)
  }
  for (const c of rows.chargeSessions) touch(c.batteryId, c.endedAt)
  for (const row of [...fleet.batteries.map(b => b.row), ...fleet.trucks]) row.updatedAt = latest.get(row.id) ?? row.updatedAt
}

async function main() {
  const reset = process.argv.includes('--reset')
  const started = Date.now()
  const client = postgres(databaseUrl, { max: 1, onnotice: () => {} })
  const db = drizzle(client, { schema, casing: 'snake_case' })
  try {
    if (!reset) {
      const [existing] = await db.select({ id: schema.organizations.id }).from(schema.organizations).where(eq(schema.organizations.name, DEMO_ORGANIZATION)).limit(1)
      if (existing) {
        console.log('demo data already present')
        return
      }
      const [tagged] = await db.execute<{ n: number }>(sql`SELECT count(*)::int AS n FROM tags`)
      if ((tagged?.n ?? 0) > 0) {
        console.error('The database already holds other assets; run with --reset to replace everything with the demo data.')
        process.exitCode = 1
        return
      }
    }
    const demo = await buildDemo(new Date())
    await db.transaction(async (tx) => {
      if (reset) await truncateSchemaTables(tx)
      await insertSeedRows(tx, demo.rows)
      await insertSchedules(tx, demo.ctx)
    })
    // the certificates' bytes, once their upload rows are in
    const files = await writeSeedFiles(demo.ctx)
    // the read models from the records, as `npm run rebuild-state` computes them
    const rebuilt = await rebuildReadModels(db)
    await db.execute(sql`UPDATE read_model_rebuilds SET needed = false, done_at = now()`)

    const counts = await countRows(db)
    console.log(`Seeded ${DEMO_ORGANIZATION} in ${((Date.now() - started) / 1000).toFixed(1)} s${reset ? ' (after reset)' : ''}.`)
    console.table(Object.fromEntries(counts.filter(c => c.rows > 0).map(c => [c.table, c.rows])))
    console.log(`Files: ${files} certificates written to ${process.env.NUXT_UPLOADS_DRIVER === 's3' ? `the S3 bucket ${process.env.NUXT_UPLOADS_S3_BUCKET}` : '.data/uploads/'}.`)
    console.log(`Read models: ${rebuilt.batteries} batteries, ${rebuilt.trucks} trucks, ${rebuilt.obligations} obligations (${(rebuilt.ms / 1000).toFixed(1)} s).`)
    console.log(await boardSummary(db, demo.ctx))
    if (demo.history.skippedSwaps > 0 || demo.fuel.skippedExchanges > 0) {
      console.log(`Days without a change for want of a ready battery or full cylinder: ${demo.history.skippedSwaps} battery, ${demo.fuel.skippedExchanges} cylinder.`)
    }
    console.log(`\nDemo sign-ins (password for all: ${DEMO_PASSWORD})`)
    console.table(DEMO_SIGN_INS.map(s => ({ email: s.email, role: s.role, site: s.site })))
  }
  finally {
    await client.end({ timeout: 5 })
  }
}

main().catch((error: unknown) => {
  console.error(error)
  process.exit(1)
})
