import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { sql } from 'drizzle-orm'
import { builtServer, type Client } from '../support/http'
import { closeTestDb, rebuildSite, site, useTestDb } from '../support/db'
import { chargingArea, charger, dueList, person } from '../support/due'

process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

// 5,000 assets of each kind the engine walks, written with one INSERT … SELECT generate_series each,
// then their read models from scratch (`npm run rebuild-state` for the site).
async function fleetOf(siteId: string, areaId: string, n: number) {
  const db = useTestDb()
  await db.execute(sql`
    INSERT INTO batteries (site_id, serial, chemistry, voltage, cell_count, capacity_ah, weight_lb, length_in, width_in, height_in, connector, home_area_id)
    SELECT ${siteId}, 'SCALE-B-' || g, 'flooded_lead_acid', 36, 18, 750, 2100, 38.5, 20.5, 31, 'Grey 350 A', ${areaId} FROM generate_series(1, ${n}) g`)
  await db.execute(sql`
    INSERT INTO chargers (site_id, name, area_id, charger_type, output_voltage, max_current_a, min_capacity_ah, max_capacity_ah, chemistry_profiles)
    SELECT ${siteId}, 'SCALE-C-' || g, ${areaId}, 'iu', 36, 120, 500, 1000, '{flooded_lead_acid}' FROM generate_series(1, ${n}) g`)
  await db.execute(sql`
    INSERT INTO trucks (site_id, fleet_number, truck_class, power)
    SELECT ${siteId}, 'SCALE-T-' || g, 5, 'lp_gas' FROM generate_series(1, ${n}) g`)
  await db.execute(sql`
    INSERT INTO lp_cylinders (site_id, serial, specification, water_capacity_lb, tare_lb, nominal_propane_lb, manufacture_year, manufacture_month)
    SELECT ${siteId}, 'SCALE-L-' || g, 'dot_4bw', 79.5, 30, 33.5, 2015 + g % 10, 1 + g % 12 FROM generate_series(1, ${n}) g`)
}

describe('the due list of a site with 5,000 assets', () => {
  let small: { siteId: string, lead: Client }
  let large: { siteId: string, lead: Client }

  beforeAll(async () => {
    for (const [which, n] of [['small', 3], ['large', 5000]] as const) {
      const siteId = (await site()).id
      const areaId = (await chargingArea(siteId)).id
      await charger({ siteId, areaId })
      await fleetOf(siteId, areaId, n)
      await rebuildSite(siteId)
      const { client } = await person(siteId, ['facilities_lead', 'safety_lead', 'technician'])
      if (which === 'small') small = { siteId, lead: client }
      else large = { siteId, lead: client }
    }
  }, 120_000)
  afterAll(closeTestDb)

  it('answers in the same, bounded number of queries as a site with three assets', async () => {
    const few = await dueList(small.lead, { siteId: small.siteId, role: 'all', limit: 20000 })
    const many = await dueList(large.lead, { siteId: large.siteId, role: 'all', limit: 20000 })
    // from the obligations read model: the site, the page and the counts in one statement
    expect(many.meta.queries).toBe(few.meta.queries)
    expect(many.meta.queries).toBe(1)
    // 5,000 batteries × 3 care tasks, 5,001 chargers, 5,000 trucks and 5,000 cylinders, plus the area's
    expect(many.total).toBeGreaterThanOrEqual(5000 * 3 + 5001 + 5000 + 5000)
    console.log(`due list: ${few.total} obligations in ${few.meta.queries} queries, ${few.meta.ms} ms; ${many.total} in ${many.meta.queries} queries, ${many.meta.ms} ms`)
  })

  it('a filtered list runs only the kinds it needs', async () => {
    const one = await dueList(large.lead, { siteId: large.siteId, role: 'all', kind: 'emissions_test' })
    expect(one.meta.queries).toBe(1)
    expect(one.total).toBe(5000)
    expect(one.items.every(o => o.state === 'overdue')).toBe(true)
  })
})
