import type { H3Event } from 'h3'
import type { z } from 'zod'
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core'
import type { Ability } from '#shared/utils/abilities'
import { CORRECTABLE_LABELS, CORRECTION_ABILITIES, type CorrectableKind } from '#shared/utils/correction-schemas'
import { parseSiteSettings } from '#shared/utils/site-settings'
import type { Actor } from './auth'
import type { Transaction } from './db'
import type { SubjectRef } from './due/rules'
import { CORRECTABLE_KIND_TABLES, firstEnteredAt } from './due/effective'

// Corrections of event records, once for every kind: the record is found at one of the person's sites and
// locked, the retry key answers a repeat with the stored correction, the person must be allowed to record
// the kind (and, after the site's correction window, be a lead), the record must still stand (the latest of
// its chain), then the kind's own act builds the new row, which keeps the record's time and names it in
// `corrects_id`. The read models of the subjects of both rows are recomputed in the same transaction.

/** The columns every correctable record has. */
interface CorrectionRow {
  id: string
  siteId: string
  userId: string
  at: Date
  recordedAt: Date
  idempotencyKey: string | null
  correctsId: string | null
  correctionReason: string | null
  note: string
}

interface CorrectableTable {
  id: PgColumnLike
  siteId: PgColumnLike
  idempotencyKey: PgColumnLike
  correctsId: PgColumnLike
}
type PgColumnLike = PgColumn

export interface CorrectionKindSpec<Row extends CorrectionRow> {
  kind: CorrectableKind
  table: PgTable & CorrectableTable
  /** the read-model subjects a row of this kind touches */
  subjects: (row: Row) => SubjectRef[]
}

export interface CorrectionInput { reason: string, idempotencyKey: string, note: string }

export type CorrectionBuilder<Row extends CorrectionRow> = (tx: Transaction, original: Row) => Promise<{
  /** the new row's own values (the kind's columns; the common ones are filled in here) */
  values: Record<string, unknown>
  /** more subjects than the new row's own (e.g. a cylinder the correction takes off a truck) */
  subjects?: SubjectRef[]
  /** writes that go with the new row (cell readings, a cylinder's place) */
  after?: (row: Row) => Promise<void>
}>

const DAY_MS = 86_400_000

/**
 * Whether the actor may still correct a record first entered at `enteredAt` (recorders within the window,
 * leads always). The window counts from when the record reached Bayward, not from its floor time: a record
 * kept on a device through a dead spot and sent days later is still its recorder's to put right.
 */
export function correctionAllowed(actor: Actor, ability: Ability, siteId: string, enteredAt: Date, windowDays: number, now = new Date()): 'yes' | 'late' | 'no' {
  if (!actorCan(actor, ability, siteId)) return 'no'
  if (now.getTime() - enteredAt.getTime() <= windowDays * DAY_MS) return 'yes'
  return actorCan(actor, 'record.correct-late', siteId) ? 'yes' : 'late'
}

async function siteWindowDays(tx: Transaction, siteId: string): Promise<number> {
  const [site] = await tx.select({ settings: tables.sites.settings }).from(tables.sites).where(eq(tables.sites.id, siteId))
  return parseSiteSettings(site?.settings).correctionWindowDays
}

function dedupe(subjects: SubjectRef[]): SubjectRef[] {
  return [...new Map(subjects.map(s => [`${s.kind}:${s.id}`, s])).values()]
}

export async function correctRecord<Row extends CorrectionRow>(
  actor: Actor, spec: CorrectionKindSpec<Row>, id: string, input: CorrectionInput, build: CorrectionBuilder<Row>,
): Promise<{ item: Row, corrects: Row, replayed: boolean }> {
  const noun = CORRECTABLE_LABELS[spec.kind]
  const t = spec.table
  const run = () => useDb().transaction(async (tx) => {
    const [original] = actor.siteIds.length
      ? await tx.select().from(t as PgTable).where(and(eq(t.id, id), inArray(t.siteId, actor.siteIds))).for('update') as unknown as Row[]
      : []
    if (!original) throw codedError(404, 'no_such_record', `No such ${noun}.`)
    const [stored] = await tx.select().from(t as PgTable).where(eq(t.idempotencyKey, input.idempotencyKey)) as unknown as Row[]
    if (stored) {
      if (stored.correctsId !== id || stored.userId !== actor.user.id) throw codedError(409, 'retry_key_taken', 'That retry key belongs to another record; reload the form.')
      return { item: stored, corrects: original, replayed: true }
    }
    const entered = (await firstEnteredAt(tx, CORRECTABLE_KIND_TABLES[spec.kind], [original.id])).get(original.id) ?? original.recordedAt
    const allowed = correctionAllowed(actor, CORRECTION_ABILITIES[spec.kind], original.siteId, entered, await siteWindowDays(tx, original.siteId))
    if (allowed === 'no') requireActorCan(actor, CORRECTION_ABILITIES[spec.kind], original.siteId)
    if (allowed === 'late') {
      const days = await siteWindowDays(tx, original.siteId)
      throw codedError(403, 'correction_late', `This ${noun} is more than ${days} days old; a lead (${roleNames(rolesWith('record.correct-late'))}) corrects it now.`, { params: { days, roles: [...rolesWith('record.correct-late')] } })
    }
    const [later] = await tx.select({ id: t.id }).from(t as PgTable).where(eq(t.correctsId, id)) as unknown as { id: string }[]
    if (later) throw createError({ statusCode: 409, message: `That ${noun} was already corrected; correct the latest one.`, data: { code: 'correction_not_latest', latestId: later.id } })
    const built = await build(tx, original)
    const [row] = await tx.insert(t as PgTable).values({
      ...built.values,
      siteId: original.siteId, userId: actor.user.id, at: original.at, recordedAt: new Date(),
      idempotencyKey: input.idempotencyKey, note: input.note, correctsId: original.id, correctionReason: input.reason,
    }).returning() as unknown as Row[]
    await built.after?.(row!)
    await writeAudit(tx, { actor, siteId: original.siteId, action: 'correct', entity: spec.kind.replace('-', '_'), entityId: row!.id, before: original, after: row, note: input.reason })
    await recomputeSubjects(tx, original.siteId, dedupe([...spec.subjects(original), ...spec.subjects(row!), ...(built.subjects ?? [])]))
    return { item: row!, corrects: original, replayed: false }
  })
  try {
    return await run()
  }
  catch (error) {
    const constraint = pgConstraint(error)
    // the same retry key sent twice at once: the first one stored it
    if (constraint?.endsWith('_idem')) return run()
    if (constraint === 'battery_status_one_per_truck') throw codedError(409, 'correction_two_in_truck', 'That correction would leave two batteries in one truck; correct the later battery changes of that truck first.')
    if (constraint?.endsWith('_corrected_once')) throw codedError(409, 'correction_same_moment', `Someone corrected that ${noun} at the same moment; reload and correct the latest one.`)
    throw error
  }
}

/** A correction route: the id and body from the request, the service, 201 (200 for a repeat). */
export async function correctionRoute<S extends z.ZodType<CorrectionInput>, R extends { replayed: boolean }>(
  event: H3Event, schema: S, service: (actor: Actor, input: z.output<S> & { id: string }) => Promise<R>,
): Promise<R> {
  const { id } = validateParams(event, idParamsSchema)
  const body = await validateBody(event, schema)
  const actor = await requireAbility(event, 'account.self')
  const result = await service(actor, { ...body, id })
  setResponseStatus(event, result.replayed ? 200 : 201)
  return result
}

/**
 * A corrected hour meter must sit between the truck's readings before and after the record (swaps,
 * cylinder changes, completions that stand): a truck's hours only go up, and its hours-based schedules
 * count from them.
 */
export async function hourMeterInOrder(tx: Transaction, truckId: string, recordId: string, at: Date, hourMeter: number) {
  const readings = (table: Parameters<typeof isEffectiveRecord>[0], subject: string) => sql`
    SELECT r.at, r.hour_meter FROM ${sql.raw(table)} r
    WHERE r.${sql.raw(subject)} = ${truckId} AND r.hour_meter IS NOT NULL AND r.id <> ${recordId} AND ${isEffectiveRecord(table, 'r')}`
  const [around] = await tx.execute(sql`
    SELECT max(hour_meter) FILTER (WHERE at <= ${at.toISOString()}::timestamptz) AS before,
           min(hour_meter) FILTER (WHERE at > ${at.toISOString()}::timestamptz) AS after
    FROM (${readings('battery_swaps', 'truck_id')} UNION ALL ${readings('cylinder_exchanges', 'truck_id')} UNION ALL ${readings('schedule_completions', 'subject_id')}) x`) as unknown as { before: number | null, after: number | null }[]
  if (around?.before !== null && around?.before !== undefined && hourMeter < around.before) {
    throw badField('hourMeter', 'hour_meter_below_earlier', `The hour meter read ${around.before} h at an earlier record of this truck; check the reading.`, { meter: around.before })
  }
  if (around?.after !== null && around?.after !== undefined && hourMeter > around.after) {
    throw badField('hourMeter', 'hour_meter_above_later', `The hour meter read ${around.after} h at a later record of this truck; correct that one too, or check the reading.`, { meter: around.after })
  }
}
