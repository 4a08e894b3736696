import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setup } from '@nuxt/test-utils/e2e'
import { and, eq } from 'drizzle-orm'
import { builtServer, signIn, type Client } from '../support/http'
import { area, battery, closeTestDb, refreshReadModels, site, tables, user, useTestDb } from '../support/db'
import { fittedTruck, putInTruck, qualify, readyBattery, roomCharger, tagFor } from '../support/battery-room'
import { freshCylinder, fuelStation, lpTruck } from '../support/fuel'
import { answers, classQualification, followUpsOf, inspect, sitePolicy, truckStatusOf } from '../support/inspection'
import { DEFAULT_INSPECTION_ITEMS } from '../../shared/utils/truck-inspection'

process.env.BAYWARD_MAIL_TICK_SECONDS = '0'
await setup(builtServer)

// Pre-shift truck inspection: 29 CFR 1910.178(q)(7) (examined before use, defective trucks out of service
// until repaired) and 1910.178(l)(4)(iii) (operators evaluated at least every three years).

describe('pre-shift truck inspection', () => {
  let siteId: string
  let chargerId: string
  let techId: string
  let operator: Client
  let operatorId: string
  let tech: Client
  let safety: Client
  let safetyEmail: string

  beforeAll(async () => {
    siteId = (await site()).id
    const areaId = (await area({ siteId })).id
    chargerId = (await roomCharger(siteId, areaId)).id
    const op = await user({ siteId, roles: ['operator'] })
    operatorId = op.id
    await qualify(op.id)
    await classQualification(op.id, 1)
    await classQualification(op.id, 5)
    const te = await user({ siteId, roles: ['technician'] })
    techId = te.id
    await qualify(te.id)
    const sl = await user({ siteId, roles: ['safety_lead'] })
    safetyEmail = sl.email
    ;[operator, tech, safety] = await Promise.all([signIn(op), signIn(te), signIn(sl)])
  })
  afterAll(closeTestDb)

  const swapOnto = async (truckId: string, c = operator) => {
    const fresh = await readyBattery({ siteId, userId: techId, chargerId })
    const [inTruck] = await useTestDb().select({ id: tables.batteryStatus.batteryId }).from(tables.batteryStatus).where(eq(tables.batteryStatus.truckId, truckId))
    return c.post('/api/battery-room/swaps', { truckId, batteryOutId: inTruck?.id ?? null, batteryInId: fresh.id, hourMeter: 1300, idempotencyKey: randomUUID() })
  }

  it('an inspection that passes is stored once, keeps its template version and moves the hour meter', async () => {
    const t = await fittedTruck(siteId, { hourMeter: 1100 })
    const code = await tagFor('truck', t.id, siteId)
    // the tag page's flag carries the time for the reader's words (bay.flag.inspection_last / _none)
    expect((await operator.get(`/api/tags/${code}`)).body.status.flags).toContainEqual(expect.objectContaining({ key: 'inspection_none', tone: 'caution' }))
    const form = await operator.get(`/api/trucks/${t.id}/inspection`)
    expect(form.status).toBe(200)
    expect(form.body.template).toMatchObject({ version: 1 })
    expect(form.body.template.items.map((i: { key: string }) => i.key)).toContain('battery_restraint')
    expect(form.body.template.items.map((i: { group: string }) => i.group).indexOf('key_on')).toBeGreaterThan(form.body.template.items.findLastIndex((i: { group: string }) => i.group === 'key_off'))
    expect(form.body.authorisation).toBeNull()
    const idempotencyKey = randomUUID()
    const first = await inspect(operator, t.id, { answers: answers('electric'), hourMeter: 1234, idempotencyKey })
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    expect(first.body.item).toMatchObject({ criticalFailed: [], failedCount: 0 })
    const again = await inspect(operator, t.id, { answers: answers('electric'), hourMeter: 1234, idempotencyKey })
    expect(again.status).toBe(200)
    expect(again.body.item.id).toBe(first.body.item.id)
    const status = await truckStatusOf(t.id)
    expect(status).toMatchObject({ hourMeter: 1234, holdReason: null })
    expect(status.lastInspectionAt).not.toBeNull()
    expect(await followUpsOf(first.body.item.id)).toEqual([])
    expect((await operator.get(`/api/tags/${code}`)).body.status.flags).toContainEqual(expect.objectContaining({ key: 'inspection_last', params: { at: new Date(status.lastInspectionAt!).toISOString() } }))
  })

  it('a failed item asks for a note; an unanswered item is named', async () => {
    const t = await fittedTruck(siteId)
    const noNote = await inspect(operator, t.id, { answers: answers('electric', { horn: '' }) })
    expect(noNote.status).toBe(400)
    expect(JSON.stringify(noNote.body.data.fields)).toContain('Say what is wrong')
    const missing = await inspect(operator, t.id, { answers: answers('electric').slice(1) })
    expect(missing.status).toBe(400)
    expect(missing.body.message).toContain(DEFAULT_INSPECTION_ITEMS.electric[0]!.label)
  })

  it('a critical failure takes the truck out of service: swaps are refused with the reason until a technician returns it', async () => {
    const t = await fittedTruck(siteId)
    const spanishLead = await user({ siteId, roles: ['safety_lead'] })
    await useTestDb().update(tables.users).set({ language: 'es' }).where(eq(tables.users.id, spanishLead.id))
    const res = await inspect(operator, t.id, { answers: answers('electric', { service_brake: 'Pedal goes to the floor' }) })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.item.criticalFailed).toEqual(['Service brake stops the truck smoothly'])
    const status = await truckStatusOf(t.id)
    expect(status.holdReason).toContain('Service brake')
    expect(status.holdBy).toBe(operatorId)
    const [followUp] = await followUpsOf(res.body.item.id)
    expect(followUp).toMatchObject({ source: 'truck_inspection', closedAt: null })
    const mail = await useTestDb().select().from(tables.mailMessages).where(and(eq(tables.mailMessages.siteId, siteId), eq(tables.mailMessages.kind, 'alert:truck_hold')))
    expect(mail.map(m => m.toAddress)).toContain(safetyEmail)
    const held = mail.find(m => m.toAddress === safetyEmail)!
    expect(held.subject).toContain(`Truck ${t.fleetNumber} out of service after its pre-shift check`)
    expect(held.body).toContain('until a technician or lead returns it (29 CFR 1910.178(q)(7))')
    const spanishMail = mail.find(m => m.toAddress === spanishLead.email)!
    expect(spanishMail.subject).toContain(`Montacargas ${t.fleetNumber} fuera de servicio tras su inspección antes del turno`)
    expect(spanishMail.body).toContain('sigue fuera de servicio hasta que un técnico o un líder lo regrese al servicio')
    expect(spanishMail.body).not.toContain('stays out of service')

    const refused = await swapOnto(t.id)
    expect(refused.status).toBe(409)
    expect(refused.body.data.reasons[0]).toMatchObject({ code: 'inspection_hold' })
    expect(refused.body.message).toContain('Service brake')
    const form = await operator.get(`/api/trucks/${t.id}/inspection`)
    expect(form.body.hold.reason).toContain('Service brake')
    expect(form.body.mayReturn).toBe(false)

    expect((await operator.post(`/api/trucks/${t.id}/return-to-service`, { whatWasDone: 'Bled the brake lines' })).status).toBe(403)
    expect((await tech.post(`/api/trucks/${t.id}/return-to-service`, { whatWasDone: '' })).status).toBe(400)
    const back = await tech.post(`/api/trucks/${t.id}/return-to-service`, { whatWasDone: 'Bled the brake lines, road-tested' })
    expect(back.status, JSON.stringify(back.body)).toBe(201)
    expect(back.body.closedFollowUps).toBe(1)
    expect((await truckStatusOf(t.id)).holdReason).toBeNull()
    expect((await tech.post(`/api/trucks/${t.id}/return-to-service`, { whatWasDone: 'Again, by mistake' })).status).toBe(409)
    const swapped = await swapOnto(t.id)
    expect(swapped.status, JSON.stringify(swapped.body)).toBe(201)
  })

  it('a critical failure on an LP truck blocks a cylinder change with the reason', async () => {
    const station = (await fuelStation(siteId, 500)).id
    const t = await lpTruck(siteId, { hourMeter: 800 })
    const full = await freshCylinder(siteId, { areaId: station, status: 'full' })
    const form = await operator.get(`/api/trucks/${t.id}/inspection`)
    expect(form.body.template.items.map((i: { key: string }) => i.key)).toContain('relief_valve_up')
    const res = await inspect(operator, t.id, { answers: answers('lp_gas', { no_gas_smell: 'Smell of gas at the regulator' }), hourMeter: 810 })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const refused = await operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: full.id, cylinderOffId: null, hourMeter: 811, idempotencyKey: randomUUID() })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toContain('No smell of gas')
    await tech.post(`/api/trucks/${t.id}/return-to-service`, { whatWasDone: 'Replaced the regulator O-ring, leak-tested' })
    const ok = await operator.post(`/api/trucks/${t.id}/cylinder-exchanges`, { cylinderOnId: full.id, cylinderOffId: null, hourMeter: 811, idempotencyKey: randomUUID() })
    expect(ok.status, JSON.stringify(ok.body)).toBe(201)
  })

  it('a non-critical failure opens a follow-up and leaves the truck in service', async () => {
    const t = await fittedTruck(siteId)
    const b = await battery({ siteId })
    await putInTruck(b.id, t.id)
    const res = await inspect(operator, t.id, { answers: answers('electric', { lights: 'Left headlight out' }) })
    expect(res.status).toBe(201)
    expect(res.body.item).toMatchObject({ criticalFailed: [], failedCount: 1 })
    const [followUp] = await followUpsOf(res.body.item.id)
    expect(followUp).toBeDefined()
    expect((await truckStatusOf(t.id)).holdReason).toBeNull()
    // the due list names it by its stored title and carries the codes the reader's words are made from
    const due = await safety.get(`/api/due?siteId=${siteId}&kind=follow_up&limit=1000`)
    expect(due.status).toBe(200)
    const item = due.body.items.find((i: { subject: { id: string } }) => i.subject.id === followUp!.id)
    expect(item.subject).toMatchObject({ kind: 'follow_up', label: followUp!.title, labelWords: { code: 'preshift', params: { truck: t.fleetNumber, items: 'Headlights and warning lights work', date: followUp!.openedOn } } })
    expect((await swapOnto(t.id)).status).toBe(201)
  })

  it('an operator not authorised for the class is refused under the block policy, allowed once a lead records it', async () => {
    const s = (await site()).id
    await sitePolicy(s, { truckAuthorisationPolicy: 'block' })
    const newcomer = await user({ siteId: s, roles: ['operator'] })
    const lead = await signIn(await user({ siteId: s, roles: ['safety_lead'] }))
    const c = await signIn(newcomer)
    const t = await fittedTruck(s, { truckClass: 2 })
    const form = await c.get(`/api/trucks/${t.id}/inspection`)
    expect(form.body.authorisation).toMatchObject({ policy: 'block', problem: { code: 'truck_class_not_authorised', params: { variant: 'no_training', class: 2 } } })
    const refused = await inspect(c, t.id, { answers: answers('electric') })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toContain('not authorised for class 2 trucks')
    // coded, so the screen says it in the reader's language (refusal.truck_class_not_authorised_no_training)
    expect(refused.body.data.reasons).toEqual([expect.objectContaining({ code: 'truck_class_not_authorised', params: { variant: 'no_training', class: 2 } })])
    const recorded = await lead.post(`/api/users/${newcomer.id}/qualifications`, { kind: 'truck_class_2', trainedOn: '2026-01-05', evaluatedOn: '2026-01-06', expiresOn: '2029-01-06' })
    expect(recorded.status).toBe(201)
    expect((await inspect(c, t.id, { answers: answers('electric') })).status).toBe(201)
  })

  it('under the warn policy the record is kept and the reason comes back in words', async () => {
    const newcomer = await user({ siteId, roles: ['operator'] })
    const t = await fittedTruck(siteId, { truckClass: 3 })
    const res = await inspect(await signIn(newcomer), t.id, { answers: answers('electric') })
    expect(res.status).toBe(201)
    expect(res.body.authorisation).toMatchObject({ code: 'truck_class_not_authorised', params: { variant: 'no_training', class: 3 } })
    expect(res.body.authorisation.message).toContain('class 3')
  })

  it('a lapsed evaluation is refused under the block policy and shows in the due list', async () => {
    const s = (await site()).id
    await sitePolicy(s, { truckAuthorisationPolicy: 'block' })
    const lapsed = await user({ siteId: s, roles: ['operator'] })
    await classQualification(lapsed.id, 1, 3 * 365 + 30)
    // an operator here for four years (a new member's first evaluation is not due before they joined)
    await useTestDb().update(tables.memberships).set({ createdAt: new Date(Date.now() - 4 * 365 * 86_400_000) }).where(eq(tables.memberships.userId, lapsed.id))
    await refreshReadModels(s, [{ kind: 'person', id: lapsed.id }])
    const lead = await signIn(await user({ siteId: s, roles: ['safety_lead'] }))
    const t = await fittedTruck(s)
    const refused = await inspect(await signIn(lapsed), t.id, { answers: answers('electric') })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toContain('lapsed')
    expect(refused.body.data.reasons[0].params).toMatchObject({ variant: 'lapsed', class: 1, due: expect.stringMatching(/^\d{4}-\d{2}-\d{2}$/) })
    const due = await lead.get(`/api/due?siteId=${s}&role=all`)
    const item = due.body.items.find((o: { kind: string, subject: { id: string } }) => o.kind === 'operator_evaluation' && o.subject.id === lapsed.id)
    expect(item).toMatchObject({ state: 'overdue' })
  })

  it('a retraining trigger recorded by a safety lead makes the evaluation due and refuses under block', async () => {
    const s = (await site()).id
    await sitePolicy(s, { truckAuthorisationPolicy: 'block' })
    const op = await user({ siteId: s, roles: ['operator'] })
    await classQualification(op.id, 1, 100)
    const lead = await user({ siteId: s, roles: ['safety_lead'] })
    const leadClient = await signIn(lead)
    const opClient = await signIn(op)
    const t = await fittedTruck(s)
    expect((await inspect(opClient, t.id, { answers: answers('electric') })).status).toBe(201)
    expect((await opClient.post(`/api/users/${op.id}/retraining`, { reason: 'near_miss', happenedOn: '2026-01-01' })).status).toBe(403)
    expect((await leadClient.post(`/api/users/${lead.id}/retraining`, { reason: 'near_miss', happenedOn: '2026-01-01' })).status).toBe(403)
    const today = new Date().toISOString().slice(0, 10)
    const res = await leadClient.post(`/api/users/${op.id}/retraining`, { reason: 'near_miss', truckClass: 1, happenedOn: today, note: 'Clipped a rack upright' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const refused = await inspect(opClient, t.id, { answers: answers('electric') })
    expect(refused.status).toBe(409)
    expect(refused.body.message).toContain('Retraining was called for')
    const due = await leadClient.get(`/api/due?siteId=${s}&role=all`)
    const item = due.body.items.find((o: { kind: string, subject: { id: string } }) => o.kind === 'operator_evaluation' && o.subject.id === op.id)
    expect(item.dueOn <= today).toBe(true)
  })

  it('the shift list names trucks used today and not checked since the shift began, and held trucks with their age; the board shows each truck\'s check', async () => {
    const s = (await site()).id
    await sitePolicy(s, { shiftStarts: ['00:00'] })
    const op = await user({ siteId: s, roles: ['operator'] })
    const c = await signIn(op)
    const [used, checked, held, idle] = [await fittedTruck(s), await fittedTruck(s), await fittedTruck(s), await fittedTruck(s)]
    const b = await battery({ siteId: s })
    await putInTruck(b.id, used.id, op.id)
    // used a moment ago, not an hour ago: an hour ago is yesterday when the suite runs just after the site's midnight
    await useTestDb().update(tables.batterySwaps).set({ at: new Date(Date.now() - 1000) }).where(eq(tables.batterySwaps.truckId, used.id))
    expect((await inspect(c, checked.id, { answers: answers('electric') })).status).toBe(201)
    expect((await inspect(c, held.id, { answers: answers('electric', { parking_brake: 'Rolls on the ramp' }) })).status).toBe(201)
    const res = await c.get(`/api/inspection/shift?siteId=${s}`)
    expect(res.status).toBe(200)
    expect(res.body.unchecked.map((t: { id: string }) => t.id)).toEqual([used.id])
    expect(res.body.held).toMatchObject([{ id: held.id, hours: 0 }])
    expect(res.body.stateOf).toMatchObject({ [used.id]: 'unchecked', [checked.id]: 'checked', [held.id]: 'held', [idle.id]: 'unchecked' })
    const board = await c.get(`/api/battery-room/board?siteId=${s}`)
    expect(board.body.trucks.find((t: { id: string }) => t.id === held.id).inspection).toBe('held')
    expect(board.body.trucks.find((t: { id: string }) => t.id === checked.id).inspection).toBe('checked')
  })

  it('a lead saves a new checklist version; records keep the version they were made on', async () => {
    const t = await fittedTruck(siteId)
    const old = await inspect(operator, t.id, { answers: answers('electric') })
    expect(old.status).toBe(201)
    const items = [...DEFAULT_INSPECTION_ITEMS.electric, { key: 'blue_spot_light', label: 'Blue spot light shines ahead', group: 'key_on', critical: false }]
    expect((await operator.put('/api/inspection-templates/electric', { siteId, title: 'Electric v2', items })).status).toBe(403)
    const saved = await safety.put('/api/inspection-templates/electric', { siteId, title: 'Electric v2', items })
    expect(saved.status, JSON.stringify(saved.body)).toBe(201)
    expect(saved.body.item.version).toBe(2)
    const form = await operator.get(`/api/trucks/${t.id}/inspection`)
    expect(form.body.template).toMatchObject({ version: 2, title: 'Electric v2' })
    // a record filled on version 1 and sent late is kept on version 1
    const late = await inspect(operator, t.id, { answers: answers('electric'), templateVersion: 1 })
    expect(late.status, JSON.stringify(late.body)).toBe(201)
    const rows = await useTestDb().select({ id: tables.truckInspections.id, version: tables.truckInspectionTemplates.version }).from(tables.truckInspections)
      .innerJoin(tables.truckInspectionTemplates, eq(tables.truckInspectionTemplates.id, tables.truckInspections.templateId)).where(eq(tables.truckInspections.truckId, t.id))
    expect(rows.map(r => r.version)).toEqual([1, 1])
    const v2 = await inspect(operator, t.id, { answers: [...answers('electric'), { key: 'blue_spot_light', result: 'pass' }], templateVersion: 2 })
    expect(v2.status, JSON.stringify(v2.body)).toBe(201)
    expect((await inspect(operator, t.id, { answers: answers('electric'), templateVersion: 7 })).status).toBe(400)
  })
})
