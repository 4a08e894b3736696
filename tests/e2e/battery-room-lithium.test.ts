import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { eq } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import { area, battery, closeTestDb, site, tables, user, useTestDb } from '../support/db'
import { fittedTruck, hoursAgo, putInTruck, roomCharger, tagFor } from '../support/battery-room'
import { actionsFor } from '../../app/utils/tag-actions'

await setup(builtServer)

const codes = (body: { data?: { reasons?: { code: string }[] } }) => (body.data?.reasons ?? []).map(r => r.code)

// Lithium-ion as the trade runs it (battery makers' manuals, common practice): no cool-down after a charge,
// charged in the truck during breaks, no electrolyte readings and no equalize charge, and a charger set to a
// lithium-ion profile. Lead-acid at the same site keeps the site's cool-down and comes out of the truck to charge.
describe('lithium-ion batteries', () => {
  let siteId: string
  let areaId: string
  let tech: Client

  beforeAll(async () => {
    siteId = (await site()).id
    areaId = (await area({ siteId })).id
    tech = await signIn(await user({ siteId, roles: ['technician'] }))
  })
  afterAll(closeTestDb)

  const lithium = (over: Record<string, unknown> = {}) => battery({ siteId, homeAreaId: areaId, chemistry: 'lithium_ion', ...over })
  const lithiumCharger = (profiles: string[] = ['lithium_ion']) => roomCharger(siteId, areaId, { chemistryProfiles: profiles })
  const board = async () => (await tech.get(`/api/battery-room/board?siteId=${siteId}`)).body as { batteries: { id: string, state: string, readyAt: string | null }[] }
  const card = async (id: string) => (await board()).batteries.find(b => b.id === id)!
  const chargeOn = (body: Record<string, unknown>) => tech.post('/api/battery-room/charges', { idempotencyKey: randomUUID(), ...body })
  const chargeOff = (id: string, over: Record<string, unknown> = {}) => tech.post(`/api/battery-room/charges/${id}/end`, { ampHoursReturned: 400, endTempF: 95, equalize: false, outcome: 'complete', endedAt: hoursAgo(1).toISOString(), ...over })

  it('is Ready as soon as a complete charge ends; lead-acid at the same site still cools for the site\'s cool-down', async () => {
    const li = await lithium()
    const lead = await battery({ siteId, homeAreaId: areaId })
    for (const [b, ch] of [[li, await lithiumCharger()], [lead, await roomCharger(siteId, areaId)]] as const) {
      const on = await chargeOn({ batteryId: b.id, chargerId: ch.id, at: hoursAgo(3).toISOString() })
      expect(on.status, JSON.stringify(on.body)).toBe(201)
      expect((await chargeOff(on.body.item.id)).status).toBe(200)
    }
    const [liCard, leadCard] = [await card(li.id), await card(lead.id)]
    expect(liCard.state).toBe('ready')
    expect(new Date(liCard.readyAt!).getTime()).toBeLessThanOrEqual(Date.now())
    expect(leadCard.state).toBe('cooling')
  })

  it('goes on charge while in its truck (opportunity charging); a lead-acid battery in a truck is still refused', async () => {
    const li = await lithium()
    const t = await fittedTruck(siteId, { allowedChemistries: ['lithium_ion'] })
    await putInTruck(li.id, t.id)
    const on = await chargeOn({ batteryId: li.id, chargerId: (await lithiumCharger()).id })
    expect(on.status, JSON.stringify(on.body)).toBe(201)
    expect((await card(li.id)).state).toBe('in_truck')

    const lead = await battery({ siteId, homeAreaId: areaId })
    await putInTruck(lead.id, (await fittedTruck(siteId)).id)
    const refused = await chargeOn({ batteryId: lead.id, chargerId: (await roomCharger(siteId, areaId)).id })
    expect(refused.status).toBe(409)
    expect(codes(refused.body)).toEqual(['in_truck'])
  })

  it('refuses an electrolyte check with a clear reason, and stores nothing', async () => {
    const li = await lithium()
    const res = await tech.post('/api/battery-room/checks', { idempotencyKey: randomUUID(), batteryId: li.id, level: 'ok', waterAddedGal: 0, scope: 'pilot_cell', cells: [{ cellNumber: 1, specificGravity: 1.28, temperatureF: 80 }] })
    expect(res.status).toBe(400)
    expect(codes(res.body)).toEqual(['no_electrolyte_reading'])
    expect(res.body.message).toMatch(/sealed cells/)
    expect(await useTestDb().select().from(tables.electrolyteChecks).where(eq(tables.electrolyteChecks.batteryId, li.id))).toEqual([])
  })

  it('refuses an equalize charge and leaves the charge open; the same end without equalize goes through', async () => {
    const li = await lithium()
    const on = await chargeOn({ batteryId: li.id, chargerId: (await lithiumCharger()).id, at: hoursAgo(4).toISOString() })
    const equalized = await chargeOff(on.body.item.id, { equalize: true })
    expect(equalized.status).toBe(400)
    expect(codes(equalized.body)).toEqual(['no_equalize'])
    const [open] = await useTestDb().select().from(tables.chargeSessions).where(eq(tables.chargeSessions.id, on.body.item.id))
    expect(open!.endedAt).toBeNull()
    expect((await chargeOff(on.body.item.id)).status).toBe(200)
  })

  it('takes the state of charge off the pack display (0–100 %): out of range is a 400 at the field, in range is stored and in the history', async () => {
    const li = await lithium()
    const on = await chargeOn({ batteryId: li.id, chargerId: (await lithiumCharger()).id, at: hoursAgo(4).toISOString() })
    for (const bad of [101, -1, 'full']) {
      const res = await chargeOff(on.body.item.id, { packStateOfChargePct: bad })
      expect(res.status, String(bad)).toBe(400)
      expect(res.body.data.fields.packStateOfChargePct).toMatch(/State of charge/)
    }
    const [open] = await useTestDb().select().from(tables.chargeSessions).where(eq(tables.chargeSessions.id, on.body.item.id))
    expect(open!.endedAt).toBeNull()
    expect((await chargeOff(on.body.item.id, { packStateOfChargePct: 96 })).status).toBe(200)
    const [ended] = await useTestDb().select().from(tables.chargeSessions).where(eq(tables.chargeSessions.id, on.body.item.id))
    expect(ended!.packStateOfChargePct).toBe(96)
    const history = await tech.get(`/api/history/battery/${li.id}`)
    expect(JSON.stringify(history.body)).toContain('pack display 96 % charged')
  })

  it('needs a charger with a lithium-ion profile: one without is refused (override allowed), one recording no profiles warns', async () => {
    const leadOnly = await roomCharger(siteId, areaId, { chemistryProfiles: ['flooded_lead_acid'] })
    const refused = await chargeOn({ batteryId: (await lithium()).id, chargerId: leadOnly.id })
    expect(refused.status).toBe(409)
    expect(codes(refused.body)).toEqual(['charger_profile_missing'])
    expect(refused.body.data.reasons[0].params).toEqual({ chemistry: 'lithium_ion', chemistries: ['flooded_lead_acid'] })
    expect(refused.body.data.overridable).toBe(true)

    const unrecorded = await lithiumCharger()
    await useTestDb().update(tables.chargers).set({ chemistryProfiles: [] }).where(eq(tables.chargers.id, unrecorded.id))
    const warned = await chargeOn({ batteryId: (await lithium()).id, chargerId: unrecorded.id })
    expect(warned.status, JSON.stringify(warned.body)).toBe(201)
    expect(warned.body.warnings.map((w: { code: string }) => w.code)).toEqual(['charger_profile_unrecorded'])

    const fine = await chargeOn({ batteryId: (await lithium()).id, chargerId: (await lithiumCharger()).id })
    expect(fine.status).toBe(201)
    expect(fine.body.warnings).toEqual([])
  })

  it('its tag page offers no reading, and offers charging in the truck; a flooded battery\'s offers the reading', async () => {
    const li = await lithium()
    const code = await tagFor('battery', li.id, siteId)
    const tag = await tech.get(`/api/tags/${code}`)
    expect(tag.body.asset.chemistry).toBe('lithium_ion')
    const offered = (chemistry: string, state: string) => actionsFor({ kind: 'battery', id: li.id, code, state, outOfService: false, chemistry }, ['technician'], 10).map(a => a.key)
    expect(offered('lithium_ion', 'ready')).not.toContain('reading')
    expect(offered('flooded_lead_acid', 'ready')).toContain('reading')
    expect(offered('lithium_ion', 'in_truck')).toContain('charge-in-truck')
    expect(offered('flooded_lead_acid', 'in_truck')).not.toContain('charge-in-truck')
  })
})
