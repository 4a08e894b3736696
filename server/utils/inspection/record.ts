import type { z } from 'zod'
import { localDate } from '#shared/utils/due-dates'
import { criticalFailures, type inspectionBodySchema, type returnToServiceSchema } from '#shared/utils/truck-inspection'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'

type TruckRow = typeof tables.trucks.$inferSelect
export type InspectionInput = z.output<typeof inspectionBodySchema>

const bad = (field: string, code: string, message: string, params?: Record<string, string | number>) => codedError(400, code, message, { params, fields: [field] })

/** The version the form was filled on: the active one, or an older one of the same power (a record sent late). */
async function templateForRecord(tx: DbOrTx, truck: TruckRow, version: number) {
  const active = await ensureInspectionTemplate(tx, truck.siteId, truck.power)
  if (active.version === version) return active
  const t = tables.truckInspectionTemplates
  const [older] = await tx.select().from(t).where(and(eq(t.siteId, truck.siteId), eq(t.power, active.power), eq(t.version, version)))
  if (!older) throw bad('templateVersion', 'checklist_version_unknown', 'This checklist version is not known here; reload the page.')
  return older
}

// A pre-shift inspection in one transaction under the truck's lock: checks the answers against the
// template version, stores the record once, opens a follow-up for any failure, tells the leads when a
// critical item failed, and recomputes the truck's status (a critical failure puts it on hold,
// 29 CFR 1910.178(q)(7)) and its hours-based schedules from the hour meter.
export async function recordInspection(actor: Actor, truck: TruckRow, input: InspectionInput) {
  const ti = tables.truckInspections
  return useDb().transaction(async (tx) => {
    await tx.select({ id: tables.trucks.id }).from(tables.trucks).where(eq(tables.trucks.id, truck.id)).for('update')
    const [earlier] = await tx.select().from(ti).where(eq(ti.idempotencyKey, input.idempotencyKey))
    if (earlier) {
      if (earlier.truckId !== truck.id || earlier.userId !== actor.user.id) throw codedError(409, 'retry_key_taken', 'That retry key belongs to another record; reload the form.')
      return { item: earlier, repeated: true, authorisation: null, followUpId: null }
    }
    const at = eventTime(input.at, 'at')
    const authorisation = await checkTruckAuthorisation(tx, actor, truck)
    const template = await templateForRecord(tx, truck, input.templateVersion)
    const keys = new Set(template.items.map(i => i.key))
    const unknown = input.answers.find(a => !keys.has(a.key))
    if (unknown) throw bad('answers', 'checklist_item_unknown', `"${unknown.key}" is not on this checklist; reload the page.`, { item: unknown.key })
    const answered = new Set(input.answers.map(a => a.key))
    const missing = template.items.filter(i => !answered.has(i.key))
    if (missing.length) throw bad('answers', 'checklist_unanswered', `Not answered yet: ${missing.map(i => i.label).join('; ')}.`, { items: missing.map(i => i.label).join('; ') })
    const photos = [...new Set(input.answers.map(a => a.photoUploadId).filter((v): v is string => !!v))]
    if (photos.length) {
      const found = await tx.select({ id: tables.uploads.id }).from(tables.uploads).where(and(inArray(tables.uploads.id, photos), eq(tables.uploads.siteId, truck.siteId)))
      if (found.length !== photos.length) throw bad('answers', 'photos_again', 'Upload the photos again.')
    }
    const [now] = await tx.select({ hourMeter: tables.truckStatus.hourMeter }).from(tables.truckStatus).where(eq(tables.truckStatus.truckId, truck.id))
    const meter = now?.hourMeter ?? truck.hourMeter
    if (input.hourMeter < meter) throw bad('hourMeter', 'hour_meter_back', `The hour meter last read ${meter} h; check the reading.`, { meter })

    const critical = criticalFailures(template.items, input.answers)
    const failed = template.items.filter(i => input.answers.some(a => a.key === i.key && a.result === 'fail'))
    const [item] = await tx.insert(ti).values({
      siteId: truck.siteId, userId: actor.user.id, at, idempotencyKey: input.idempotencyKey, note: input.note, truckId: truck.id,
      templateId: template.id, hourMeter: input.hourMeter, answers: input.answers, criticalFailed: critical.map(i => i.label), failedCount: failed.length,
    }).returning()
    await writeAudit(tx, { actor, siteId: truck.siteId, action: 'inspect', entity: 'truck_inspection', entityId: item!.id, after: item, note: authorisation?.message })
    let followUpId: string | null = null
    if (failed.length) {
      const [site] = await tx.select({ timeZone: tables.sites.timeZone }).from(tables.sites).where(eq(tables.sites.id, truck.siteId))
      followUpId = await openInspectionFollowUp(tx, actor, truck, item!, failed.map(i => i.label), critical.length > 0, localDate(at, site?.timeZone ?? 'UTC'))
    }
    await recomputeSubjects(tx, truck.siteId, [{ kind: 'truck', id: truck.id }, ...(followUpId ? [{ kind: 'follow_up' as const, id: followUpId }] : [])], { lock: false })
    return { item: item!, repeated: false, authorisation, followUpId }
  })
}

type InspectionRow = typeof tables.truckInspections.$inferSelect

// A failed item opens one follow-up for the shop; a critical one also tells the site's leads at once.
async function openInspectionFollowUp(tx: DbOrTx, actor: Actor, truck: TruckRow, inspection: InspectionRow, labels: string[], critical: boolean, date: string) {
  const title = `Truck ${truck.fleetNumber}: ${labels.join('; ')} — failed pre-shift check on ${date}`
  const [followUp] = await tx.insert(tables.followUps).values({ siteId: truck.siteId, source: 'truck_inspection', sourceId: inspection.id, title: title.slice(0, 300), openedOn: date, titleWords: { code: 'preshift', params: { truck: truck.fleetNumber, items: labels.join('; '), date } } }).returning()
  await writeAudit(tx, { actor, siteId: truck.siteId, action: 'create', entity: 'follow_up', entityId: followUp!.id, after: followUp })
  if (critical) {
    const notes = inspection.answers.filter(a => a.result === 'fail').map(a => `- ${a.note}`).join('\n')
    await queueAlert(tx, {
      siteId: truck.siteId, kind: 'alert:truck_hold', audience: 'notice.truck-hold',
      subject: t => t('mail.truck_hold_subject', { truck: truck.fleetNumber }),
      body: t => [
        t('mail.truck_hold', { who: actor.user.name, truck: truck.fleetNumber, on: date }),
        ...inspection.criticalFailed,
        '',
        t('mail.notes'),
        notes,
        '',
        t('mail.truck_hold_until'),
        appLink(`/trucks/${truck.id}`),
      ].join('\n'),
    })
  }
  return followUp!.id
}

// A truck on an inspection hold back in service, with what was done; the follow-ups of the failed
// checks close with the same words.
export async function returnTruckToService(actor: Actor, truck: TruckRow, input: z.output<typeof returnToServiceSchema>) {
  return useDb().transaction(async (tx) => {
    await tx.select({ id: tables.trucks.id }).from(tables.trucks).where(eq(tables.trucks.id, truck.id)).for('update')
    const [status] = await tx.select().from(tables.truckStatus).where(eq(tables.truckStatus.truckId, truck.id))
    if (!status?.holdInspectionId) throw codedError(409, 'truck_not_on_hold', `Truck ${truck.fleetNumber} is not out of service after an inspection.`, { params: { truck: truck.fleetNumber } })
    const [item] = await tx.insert(tables.truckReturns).values({
      siteId: truck.siteId, userId: actor.user.id, truckId: truck.id, inspectionId: status.holdInspectionId, whatWasDone: input.whatWasDone,
    }).returning()
    await writeAudit(tx, { actor, siteId: truck.siteId, action: 'return_to_service', entity: 'truck', entityId: truck.id, before: { holdReason: status.holdReason }, after: item })
    const f = tables.followUps
    const closed = await tx.update(f).set({ closedAt: new Date(), closedBy: actor.user.id, closingNote: input.whatWasDone })
      .where(and(eq(f.source, 'truck_inspection'), isNull(f.closedAt), inArray(f.sourceId,
        tx.select({ id: tables.truckInspections.id }).from(tables.truckInspections).where(eq(tables.truckInspections.truckId, truck.id)))))
      .returning({ id: f.id })
    await recomputeSubjects(tx, truck.siteId, [{ kind: 'truck', id: truck.id }, ...closed.map(c => ({ kind: 'follow_up' as const, id: c.id }))], { lock: false })
    return { item: item!, closedFollowUps: closed.length }
  })
}
