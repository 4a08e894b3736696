import { execFileSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import postgres from 'postgres'
import { shiftStartedAt } from '../../shared/utils/shift-times'
import { parseSiteSettings } from '../../shared/utils/site-settings'

// The demo seed runs against its own database so it never mixes with other tests' fixtures.
const url = (process.env.NUXT_DATABASE_URL ?? '').replace(/\/[^/]+$/, '/bayward_test_seed')
const env = { ...process.env, NUXT_DATABASE_URL: url }
const sql = postgres(url, { max: 1, onnotice: () => {} })
const run = (...args: string[]) => execFileSync('npx', ['tsx', 'scripts/seed.ts', ...args], { env, encoding: 'utf8', timeout: 120_000 })

async function counts() {
  const [row] = await sql`SELECT
    (SELECT count(*) FROM sites)::int AS sites, (SELECT count(*) FROM users)::int AS users,
    (SELECT count(*) FROM trucks)::int AS trucks, (SELECT count(*) FROM batteries)::int AS batteries,
    (SELECT count(*) FROM chargers)::int AS chargers, (SELECT count(*) FROM lp_cylinders)::int AS cylinders,
    (SELECT count(*) FROM tags)::int AS tags`
  return row!
}

afterAll(() => sql.end())

describe('demo seed', () => {
  it('builds the scenario, is harmless the second time, and rebuilds with --reset', async () => {
    execFileSync('node', ['scripts/migrate.mjs'], { env })
    run('--reset')
    const first = await counts()
    expect(first.sites).toBe(2)
    expect(first.trucks).toBeGreaterThanOrEqual(25)
    expect(first.batteries).toBeGreaterThanOrEqual(50)
    expect(first.cylinders).toBeGreaterThanOrEqual(70)
    expect(first.tags).toBe(first.trucks + first.batteries + first.chargers + first.cylinders + 5)
    expect(run()).toMatch(/already present/)
    expect(await counts()).toEqual(first)
    run('--reset')
    expect(await counts()).toEqual(first)
    const [twoTrucks] = await sql`SELECT count(*)::int AS n FROM (SELECT truck_id FROM battery_status WHERE truck_id IS NOT NULL GROUP BY 1 HAVING count(*) > 1) x`
    expect(twoTrucks!.n).toBe(0)
    // the seed leaves its read models built: a status row per battery and truck, obligations, no rebuild asked for
    const [models] = await sql`SELECT (SELECT count(*) FROM battery_status)::int AS batteries, (SELECT count(*) FROM truck_status)::int AS trucks,
      (SELECT count(*) FROM obligations)::int AS obligations, (SELECT count(*) FROM read_model_rebuilds WHERE needed)::int AS pending`
    expect(models).toMatchObject({ batteries: first.batteries, trucks: first.trucks, pending: 0 })
    expect(models!.obligations).toBeGreaterThan(first.batteries)
    // a year played forward leaves no battery forgotten: none waits for a charge or stays in a truck for more
    // than a week (out-of-service ones aside), and nothing is overdue by months but the one cylinder past its
    // requalification that the scenario has on purpose
    const stale = await sql`SELECT b.serial, bs.state, bs.state_since FROM battery_status bs JOIN batteries b ON b.id = bs.battery_id
      WHERE bs.state IN ('needs_charge', 'in_truck') AND bs.state_since < now() - interval '7 days'`
    expect(stale).toEqual([])
    const longOverdue = await sql`SELECT kind, label, due_on FROM obligations WHERE due_on < current_date - 60 ORDER BY kind`
    expect(longOverdue.map(o => o.kind)).toEqual(['cylinder_requalification'])
    // the pre-shift checks of today are those of the shift the demo opens in (06:00, 14:00, 22:00 Chicago), so
    // its due list asks for a few trucks, not for every truck checked at dawn
    const shiftStart = shiftStartedAt(new Date(), parseSiteSettings({}).shiftStarts, 'America/Chicago')
    const earlier = await sql`SELECT at FROM truck_inspections WHERE at < ${shiftStart} AND failed_count = 0`
    expect(earlier).toEqual([])
    // every emissions test has its tester's certificate, a PDF in the uploads storage (disk here) matching its row
    const tests = await sql`SELECT u.storage_key, u.sha256, u.bytes, u.content_type FROM emissions_tests e LEFT JOIN uploads u ON u.id = e.certificate_upload_id`
    expect(tests.length).toBeGreaterThan(10)
    for (const u of tests) {
      expect(u.content_type).toBe('application/pdf')
      const file = readFileSync(join('.data/uploads', ...String(u.storage_key).split(':')))
      expect(file.subarray(0, 5).toString()).toBe('%PDF-')
      expect([file.length, createHash('sha256').update(file).digest('hex')]).toEqual([u.bytes, u.sha256])
    }
  }, 180_000)
})
