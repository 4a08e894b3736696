import type { SQL } from 'drizzle-orm'
import type { EngineFuel } from '#shared/utils/emissions'
import type { EmissionsTestInput } from '#shared/utils/fuel-schemas'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'

export type EmissionsBucket = 'overdue' | 'failed' | 'due_30' | 'due_60' | 'due_90' | 'current'

// Where a combustion truck stands for its tailpipe test: overdue (or never tested), failed and awaiting
// its retest, due within 30 / 60 / 90 days, or current.
export function emissionsBucket(latest: { passed: boolean, nextDueOn: string } | null, today: string): { bucket: EmissionsBucket, daysLeft: number | null } {
  if (!latest) return { bucket: 'overdue', daysLeft: null }
  const daysLeft = calendarDaysBetween(today, latest.nextDueOn)
  if (daysLeft < 0) return { bucket: 'overdue', daysLeft }
  if (!latest.passed) return { bucket: 'failed', daysLeft }
  if (daysLeft <= 30) return { bucket: 'due_30', daysLeft }
  if (daysLeft <= 60) return { bucket: 'due_60', daysLeft }
  if (daysLeft <= 90) return { bucket: 'due_90', daysLeft }
  return { bucket: 'current', daysLeft }
}

/**
 * latestEmissionsTests' answer for one truck as a JSON value inside another statement (the tag look-up's): the
 * truck whose row is `table`'s there; its passed, testedOn and nextDueOn, or null when it has none. Keep the two alike.
 */
export const latestEmissionsTestJson = (table: SQL) => sql`(SELECT json_build_object('passed', e.passed, 'testedOn', e.tested_on::text,
    'nextDueOn', coalesce((SELECT o.due_on FROM obligations o WHERE o.site_id = ${table}.site_id AND o.rule_key = 'emissions_test'
      AND o.subject_kind = 'truck' AND o.subject_id = ${table}.id LIMIT 1), e.next_due_on)::text)
  FROM emissions_tests e WHERE e.truck_id = ${table}.id AND ${isEffectiveRecord('emissions_tests', 'e')}
  ORDER BY e.tested_on DESC, e.recorded_at DESC LIMIT 1)`

/** Each truck's latest effective emissions test, with its next due date as the emissions schedule gives it now. */
export async function latestEmissionsTests(db: DbOrTx, truckIds: string[]) {
  if (truckIds.length === 0) return new Map<string, typeof tables.emissionsTests.$inferSelect>()
  const e = tables.emissionsTests
  const [rows, dues] = await Promise.all([
    db.selectDistinctOn([e.truckId]).from(e)
      .where(and(inArray(e.truckId, truckIds), sql`${isEffectiveRecord('emissions_tests', 'emissions_tests')}`))
      .orderBy(e.truckId, desc(e.testedOn), desc(e.recordedAt)),
    db.select({ truckId: tables.obligations.subjectId, dueOn: tables.obligations.dueOn }).from(tables.obligations)
      .where(and(inArray(tables.obligations.subjectId, truckIds), eq(tables.obligations.ruleKey, 'emissions_test'))),
  ])
  const due = new Map(dues.map(d => [d.truckId, d.dueOn]))
  return new Map(rows.map(r => [r.truckId, { ...r, nextDueOn: due.get(r.truckId) ?? r.nextDueOn }]))
}

// The facilities view: every combustion truck at the given sites with its last test and bucket.
export async function emissionsOverview(siteIds: string[]) {
  const db = useDb()
  const sites = await Promise.all(siteIds.map(id => fuelSiteFacts(db, id)))
  const trucks = siteIds.length
    ? await db.select().from(tables.trucks)
        .where(and(inArray(tables.trucks.siteId, siteIds), inArray(tables.trucks.power, [...COMBUSTION_POWERS])))
        .orderBy(asc(natural(tables.trucks.fleetNumber)))
    : []
  const latest = await latestEmissionsTests(db, trucks.map(t => t.id))
  return {
    sites: sites.sort((a, b) => a.name.localeCompare(b.name)).map(s => ({
      id: s.id,
      name: s.name,
      today: s.today,
      policy: emissionsPolicyFromSettings(s.settings),
      trucks: trucks.filter(t => t.siteId === s.id).map((t) => {
        const last = latest.get(t.id) ?? null
        return {
          id: t.id, fleetNumber: t.fleetNumber, power: t.power, model: t.model, outOfService: t.outOfService,
          lastTest: last && { id: last.id, testedOn: last.testedOn, passed: last.passed, nextDueOn: last.nextDueOn, testerName: last.testerName, coIdlePct: last.coIdlePct, coHighIdlePct: last.coHighIdlePct, reasons: last.reasons, certificateUploadId: last.certificateUploadId },
          ...emissionsBucket(last, s.today),
        }
      }),
    })),
  }
}

// A yearly tailpipe test of a combustion truck: pass or fail against the site's CO caps; the next test
// is due one emissions-schedule interval on, or within its retest window after a fail.
export async function recordEmissionsTest(actor: Actor, truck: FuelTruckRow, body: EmissionsTestInput) {
  const db = useDb()
  const facts = await fuelSiteFacts(db, truck.siteId)
  if (body.testedOn > facts.today) throw createError({ statusCode: 400, message: 'The test date is in the future.', data: { code: 'future_date', fields: { testedOn: 'Not after today.' } } })
  if (body.certificateUploadId) {
    const [upload] = await db.select({ id: tables.uploads.id }).from(tables.uploads)
      .where(and(eq(tables.uploads.id, body.certificateUploadId), eq(tables.uploads.siteId, truck.siteId)))
    if (!upload) throw createError({ statusCode: 400, message: 'Upload the certificate again.', data: { code: 'certificate_missing', fields: { certificateUploadId: 'No such file at this site.' } } })
  }
  const policy = emissionsPolicyFromSettings(facts.settings)
  const verdict = assessEmissionsTest({
    fuel: truck.power as EngineFuel, coIdlePercent: body.coIdlePct, coHighIdlePercent: body.coHighIdlePct,
    hcPpm: body.hcPpm, co2Percent: body.co2Pct, o2Percent: body.o2Pct,
  }, policy)
  const result = await db.transaction(async (tx) => {
    await tx.select({ id: tables.trucks.id }).from(tables.trucks).where(eq(tables.trucks.id, truck.id)).for('no key update')
    const schedule = (await loadSiteSchedules(tx, truck.siteId)).find(s => s.kind === 'emissions_test')!
    const nextDueOn = emissionsNextDue(body.testedOn, verdict.pass, schedule)
    const [item] = await tx.insert(tables.emissionsTests).values({
      ...body, siteId: truck.siteId, userId: actor.user.id, truckId: truck.id, passed: verdict.pass, reasons: verdict.reasons, nextDueOn,
    }).returning()
    await writeAudit(tx, { actor, siteId: truck.siteId, action: verdict.pass ? 'emissions_passed' : 'emissions_failed', entity: 'emissions_test', entityId: item!.id, after: item })
    await recomputeSubjects(tx, truck.siteId, [{ kind: 'truck', id: truck.id }], { lock: false })
    if (!verdict.pass) {
      await notifyFailedEmissionsTest(tx, { siteId: truck.siteId, truckId: truck.id, fleetNumber: truck.fleetNumber, testedOn: body.testedOn, reasons: verdict.findings, retestBy: nextDueOn })
    }
    return { item: item!, verdict, policy, source: EMISSIONS_POLICY_SOURCE }
  })
  if (!verdict.pass) deliverMailSoon()
  return result
}
