import type { z } from 'zod'
import {
  DEFAULT_CHECKLIST_ITEMS, DEFAULT_CHECKLIST_TITLES, checklistItemKey, logPeriodStart, weekStartOf,
  type ChecklistAreaKind, type ChecklistCadence, type ChecklistItem, type LogEntriesInput,
  type logCorrectionSchema, type logSignSchema, type templateSaveSchema,
} from '#shared/utils/area-checklists'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'
import type { FollowUpTitleWords } from '#shared/utils/follow-up-words'

export type AreaRow = typeof tables.areas.$inferSelect
export type TemplateRow = typeof tables.checklistTemplates.$inferSelect
export type LogRow = typeof tables.areaLogs.$inferSelect
export type EntryRow = typeof tables.areaLogEntries.$inferSelect

/** An area at the site (not archived), or 400 naming the field. */
export async function areaAtSite(db: DbOrTx, siteId: string, areaId: string, field = 'areaId'): Promise<AreaRow> {
  const [area] = await db.select().from(tables.areas).where(and(eq(tables.areas.id, areaId), eq(tables.areas.siteId, siteId)))
  if (!area) throw badField(field, 'area_missing', 'Pick an area at this site.')
  return area
}

export async function activeTemplate(db: DbOrTx, siteId: string, areaKind: ChecklistAreaKind, cadence: ChecklistCadence): Promise<TemplateRow | null> {
  const [row] = await db.select().from(tables.checklistTemplates)
    .where(and(eq(tables.checklistTemplates.siteId, siteId), eq(tables.checklistTemplates.areaKind, areaKind), eq(tables.checklistTemplates.cadence, cadence), eq(tables.checklistTemplates.active, true)))
    .orderBy(desc(tables.checklistTemplates.version)).limit(1)
  return row ?? null
}

/** The template a new log uses: the active one, or the default items as version 1 (daily only). */
export async function ensureTemplate(tx: DbOrTx, siteId: string, areaKind: ChecklistAreaKind, cadence: ChecklistCadence): Promise<TemplateRow> {
  const found = await activeTemplate(tx, siteId, areaKind, cadence)
  if (found) return found
  if (cadence === 'weekly') throw codedError(409, 'no_weekly_checklist', 'This site has no weekly checklist for that kind of area yet; a lead can add one under Checklists.')
  const [row] = await tx.insert(tables.checklistTemplates).values({
    siteId, areaKind, cadence, title: DEFAULT_CHECKLIST_TITLES[areaKind][cadence], items: [...DEFAULT_CHECKLIST_ITEMS[areaKind]], version: 1, active: true,
  }).returning()
  return row!
}

export interface EffectiveEntry {
  id: string
  itemKey: string
  result: EntryRow['result']
  note: string
  at: Date
  by: string
  /** earlier entries of the item this one replaced, oldest first, with who and why */
  history: { id: string, result: EntryRow['result'], note: string, at: Date, by: string, correctionReason: string | null }[]
  correctionReason: string | null
}

// Per item: the entry that stands (the last one nobody corrected) and the ones before it.
export function effectiveEntries(rows: (EntryRow & { by: string })[]): EffectiveEntry[] {
  const corrected = new Set(rows.map(r => r.correctsId).filter(Boolean))
  const byItem = new Map<string, (EntryRow & { by: string })[]>()
  for (const r of [...rows].sort((a, b) => a.at.getTime() - b.at.getTime() || a.recordedAt.getTime() - b.recordedAt.getTime())) {
    byItem.set(r.itemKey, [...(byItem.get(r.itemKey) ?? []), r])
  }
  const out: EffectiveEntry[] = []
  for (const [itemKey, list] of byItem) {
    const standing = [...list].reverse().find(r => !corrected.has(r.id)) ?? list[list.length - 1]!
    out.push({
      id: standing.id, itemKey, result: standing.result, note: standing.note, at: standing.at, by: standing.by, correctionReason: standing.correctionReason,
      history: list.filter(r => r.id !== standing.id).map(r => ({ id: r.id, result: r.result, note: r.note, at: r.at, by: r.by, correctionReason: r.correctionReason })),
    })
  }
  return out
}

async function entriesOf(db: DbOrTx, logIds: string[]) {
  if (logIds.length === 0) return []
  return db.select({ entry: tables.areaLogEntries, by: tables.users.name }).from(tables.areaLogEntries)
    .innerJoin(tables.users, eq(tables.users.id, tables.areaLogEntries.userId))
    .where(inArray(tables.areaLogEntries.logId, logIds))
}

export interface LogDay {
  date: string
  log: { id: string, cadence: ChecklistCadence, periodStart: string, signedAt: Date | null, signedBy: string | null, templateVersion: number } | null
  title: string
  items: ChecklistItem[]
  entries: EffectiveEntry[]
  followUps: { id: string, title: string, titleWords: FollowUpTitleWords | null, closedAt: Date | null, sourceId: string }[]
}

// The logs of an area for a day, a week, or any range, with the template items each was filled against.
export async function areaLogDays(db: DbOrTx, siteId: string, area: AreaRow, from: string, to: string, cadence: ChecklistCadence = 'daily'): Promise<LogDay[]> {
  const l = tables.areaLogs
  const logs = await db.select({ log: l, template: tables.checklistTemplates, signer: tables.users.name }).from(l)
    .innerJoin(tables.checklistTemplates, eq(tables.checklistTemplates.id, l.templateId))
    .leftJoin(tables.users, eq(tables.users.id, l.signedBy))
    .where(and(eq(l.areaId, area.id), eq(l.siteId, siteId), eq(l.cadence, cadence), gte(l.periodStart, logPeriodStart(from, cadence)), lte(l.periodStart, to)))
    .orderBy(asc(l.periodStart))
  const entries = await entriesOf(db, logs.map(x => x.log.id))
  const entryIds = entries.map(e => e.entry.id)
  const followUps = entryIds.length
    ? await db.select({ id: tables.followUps.id, title: tables.followUps.title, titleWords: tables.followUps.titleWords, closedAt: tables.followUps.closedAt, sourceId: tables.followUps.sourceId })
        .from(tables.followUps).where(and(eq(tables.followUps.source, 'checklist'), inArray(tables.followUps.sourceId, entryIds)))
    : []
  const current = await activeTemplate(db, siteId, area.kind, cadence)
  const days: LogDay[] = []
  const dates = cadence === 'weekly' ? weekStarts(from, to) : eachDay(from, to)
  for (const date of dates) {
    const found = logs.find(x => x.log.periodStart === date)
    const mine = entries.filter(e => e.entry.logId === found?.log.id).map(e => ({ ...e.entry, by: e.by }))
    const ids = new Set(mine.map(e => e.id))
    days.push({
      date,
      log: found ? { id: found.log.id, cadence: found.log.cadence, periodStart: found.log.periodStart, signedAt: found.log.signedAt, signedBy: found.signer, templateVersion: found.template.version } : null,
      title: found?.template.title ?? current?.title ?? DEFAULT_CHECKLIST_TITLES[area.kind][cadence],
      items: found?.template.items ?? current?.items ?? [...DEFAULT_CHECKLIST_ITEMS[area.kind]],
      entries: effectiveEntries(mine),
      followUps: followUps.filter(f => ids.has(f.sourceId)),
    })
  }
  return days
}

function eachDay(from: string, to: string): string[] {
  const out: string[] = []
  for (let d = from; d <= to; d = addCalendarInterval(d, 1, 'day')) out.push(d)
  return out
}

function weekStarts(from: string, to: string): string[] {
  const out: string[] = []
  for (let d = weekStartOf(from); d <= to; d = addCalendarInterval(d, 1, 'week')) out.push(d)
  return out
}

const lockedMessage = 'This log is signed and locked. Add a correction with the reason instead.'

// Checklist entries for an area's day (or week): the log is made on first use; a signed log takes
// no plain entries (409). A failed item opens a follow-up and alerts the site's safety leads, in the
// same transaction.
export async function recordLogEntries(actor: Actor, input: LogEntriesInput, today: string) {
  if (input.date > today) throw badField('date', 'day_not_yet', 'That day has not come yet.')
  const db = useDb()
  const area = await areaAtSite(db, input.siteId, input.areaId)
  if (area.archived) throw badField('areaId', 'area_archived', 'This area is archived.')
  const periodStart = logPeriodStart(input.date, input.cadence)
  const result = await db.transaction(async (tx) => {
    if (input.idempotencyKey) {
      const [earlier] = await tx.select().from(tables.areaLogEntries).where(eq(tables.areaLogEntries.idempotencyKey, `${input.idempotencyKey}:${input.entries[0]!.itemKey}`))
      if (earlier) {
        if (earlier.userId !== actor.user.id) throw codedError(409, 'retry_key_taken', 'That retry key belongs to someone else\'s record; reload the form.')
        return { logId: earlier.logId, entries: [] as EntryRow[], followUps: [] as string[], replayed: true }
      }
    }
    const template = await ensureTemplate(tx, input.siteId, area.kind, input.cadence)
    const findLog = () => tx.select().from(tables.areaLogs)
      .where(and(eq(tables.areaLogs.areaId, area.id), eq(tables.areaLogs.cadence, input.cadence), eq(tables.areaLogs.periodStart, periodStart)))
      .orderBy(asc(tables.areaLogs.createdAt)).limit(1).for('update')
    let [log] = await findLog()
    if (!log) {
      await tx.insert(tables.areaLogs).values({ siteId: input.siteId, areaId: area.id, templateId: template.id, cadence: input.cadence, periodStart })
        .onConflictDoNothing()
      ;[log] = await findLog()
    }
    if (!log) throw codedError(409, 'log_not_opened', 'The log could not be opened; try again.')
    if (log.signedAt) throw createError({ statusCode: 409, message: lockedMessage, data: { reasons: [{ code: 'log_signed', message: lockedMessage }], logId: log.id } })
    const [logTemplate] = await tx.select().from(tables.checklistTemplates).where(eq(tables.checklistTemplates.id, log.templateId))
    const items = new Map((logTemplate?.items ?? template.items).map(i => [i.key, i]))
    const unknown = input.entries.find(e => !items.has(e.itemKey))
    if (unknown) throw codedError(400, 'checklist_item_unknown', `"${unknown.itemKey}" is not on this checklist.`, { params: { item: unknown.itemKey }, fields: ['entries'] })
    const rows = await tx.insert(tables.areaLogEntries).values(input.entries.map(e => ({
      siteId: input.siteId, userId: actor.user.id, logId: log.id, itemKey: e.itemKey, result: e.result, note: e.note,
      idempotencyKey: input.idempotencyKey ? `${input.idempotencyKey}:${e.itemKey}` : null,
    }))).returning()
    const followUps: string[] = []
    for (const row of rows) {
      await writeAudit(tx, { actor, siteId: input.siteId, action: 'create', entity: 'area_log_entry', entityId: row.id, after: row })
      if (row.result === 'fail') followUps.push(await openChecklistFollowUp(tx, actor, area, row, items.get(row.itemKey)!, input.date))
    }
    await recomputeLogSubjects(tx, area, log.id, followUps)
    return { logId: log.id, entries: rows, followUps, replayed: false }
  })
  if (result.followUps.length) deliverMailSoon()
  return result
}

// A correction to an entry: a new row pointing at the one it replaces, with who and why. Allowed on
// signed logs (that is how a signed log changes); the entry it corrects must still stand.
export async function correctLogEntry(actor: Actor, entryId: string, input: z.output<typeof logCorrectionSchema>) {
  const db = useDb()
  const result = await db.transaction(async (tx) => {
    const [found] = await tx.select({ entry: tables.areaLogEntries, log: tables.areaLogs, area: tables.areas }).from(tables.areaLogEntries)
      .innerJoin(tables.areaLogs, eq(tables.areaLogs.id, tables.areaLogEntries.logId))
      .innerJoin(tables.areas, eq(tables.areas.id, tables.areaLogs.areaId))
      .where(and(eq(tables.areaLogEntries.id, entryId), inArray(tables.areaLogEntries.siteId, actor.siteIds)))
      .for('update', { of: tables.areaLogs })
    if (!found) throw codedError(404, 'no_such_log_entry', 'No such log entry.')
    requireActorCan(actor, 'log.record', found.log.siteId)
    const [later] = await tx.select({ id: tables.areaLogEntries.id }).from(tables.areaLogEntries).where(eq(tables.areaLogEntries.correctsId, entryId))
    if (later) throw codedError(409, 'corrected_already', 'That entry was already corrected; correct the latest one.')
    const [row] = await tx.insert(tables.areaLogEntries).values({
      siteId: found.log.siteId, userId: actor.user.id, logId: found.log.id, itemKey: found.entry.itemKey, result: input.result, note: input.note,
      correctsId: entryId, correctionReason: input.reason,
    }).returning()
    await writeAudit(tx, { actor, siteId: found.log.siteId, action: 'correct', entity: 'area_log_entry', entityId: row!.id, before: found.entry, after: row, note: input.reason })
    let followUpId: string | null = null
    if (row!.result === 'fail' && found.entry.result !== 'fail') {
      const [template] = await tx.select().from(tables.checklistTemplates).where(eq(tables.checklistTemplates.id, found.log.templateId))
      const item = template?.items.find(i => i.key === row!.itemKey) ?? { key: row!.itemKey, label: row!.itemKey }
      followUpId = await openChecklistFollowUp(tx, actor, found.area, row!, item, found.log.periodStart)
    }
    await recomputeLogSubjects(tx, found.area, found.log.id, followUpId ? [followUpId] : [])
    return { item: row!, signed: !!found.log.signedAt, followUpId }
  })
  if (result.followUpId) deliverMailSoon()
  return result
}

// The safety lead signs a day's or a week's logs of an area; signed logs are locked.
export async function signAreaLogs(actor: Actor, input: z.output<typeof logSignSchema>, today: string) {
  if (input.date > today) throw badField('date', 'day_not_yet', 'That day has not come yet.')
  const db = useDb()
  const area = await areaAtSite(db, input.siteId, input.areaId)
  const from = input.span === 'week' ? weekStartOf(input.date) : input.date
  const to = input.span === 'week' ? addCalendarInterval(from, 6, 'day') : input.date
  return db.transaction(async (tx) => {
    const l = tables.areaLogs
    const logs = await tx.select().from(l)
      .where(and(eq(l.areaId, area.id), gte(l.periodStart, input.span === 'week' ? from : weekStartOf(from)), lte(l.periodStart, to)))
      .for('update')
    const inSpan = logs.filter(x => (x.cadence === 'weekly' ? x.periodStart >= weekStartOf(from) : x.periodStart >= from) && x.periodStart <= to)
    const counts = inSpan.length
      ? await tx.select({ logId: tables.areaLogEntries.logId, n: count() }).from(tables.areaLogEntries)
          .where(inArray(tables.areaLogEntries.logId, inSpan.map(x => x.id))).groupBy(tables.areaLogEntries.logId)
      : []
    const withEntries = inSpan.filter(x => counts.some(c => c.logId === x.id && Number(c.n) > 0))
    const open = withEntries.filter(x => !x.signedAt)
    if (withEntries.length === 0) throw codedError(409, 'nothing_to_sign', 'There is nothing recorded to sign for that period.')
    if (open.length === 0) throw codedError(409, 'already_signed', 'Already signed.')
    const signedAt = new Date()
    const signed = await tx.update(l).set({ signedBy: actor.user.id, signedAt })
      .where(and(inArray(l.id, open.map(x => x.id)), isNull(l.signedAt))).returning()
    for (const row of signed) {
      await writeAudit(tx, { actor, siteId: input.siteId, action: 'sign', entity: 'area_log', entityId: row.id, before: { signedAt: null }, after: { signedBy: actor.user.id, signedAt }, note: input.note || undefined })
    }
    await recomputeSubjects(tx, input.siteId, signed.map(l => ({ kind: 'log' as const, id: l.id })), { lock: false })
    return { signed: signed.map(s => ({ id: s.id, periodStart: s.periodStart, cadence: s.cadence })), from, to }
  })
}

// A new version of a checklist: items keep their keys (a rename keeps its history), new ones get one.
export async function saveChecklistTemplate(actor: Actor, input: z.output<typeof templateSaveSchema>) {
  const db = useDb()
  return db.transaction(async (tx) => {
    const t = tables.checklistTemplates
    const previous = await tx.select().from(t).where(and(eq(t.siteId, input.siteId), eq(t.areaKind, input.areaKind), eq(t.cadence, input.cadence)))
      .orderBy(desc(t.version)).for('update')
    const current = previous.find(p => p.active) ?? previous[0]
    const known = new Set((current?.items ?? DEFAULT_CHECKLIST_ITEMS[input.areaKind]).map(i => i.key))
    const taken = new Set<string>()
    const items: ChecklistItem[] = input.items.map((i) => {
      const key = i.key && known.has(i.key) && !taken.has(i.key) ? i.key : checklistItemKey(i.label, new Set([...taken, ...known]))
      taken.add(key)
      return i.hint ? { key, label: i.label, hint: i.hint } : { key, label: i.label }
    })
    if (previous.length) await tx.update(t).set({ active: false }).where(and(eq(t.siteId, input.siteId), eq(t.areaKind, input.areaKind), eq(t.cadence, input.cadence)))
    const [row] = await tx.insert(t).values({
      siteId: input.siteId, areaKind: input.areaKind, cadence: input.cadence, title: input.title, items, version: (previous[0]?.version ?? 0) + 1, active: true,
    }).returning()
    await writeAudit(tx, { actor, siteId: input.siteId, action: 'create', entity: 'checklist_template', entityId: row!.id, before: current ? { version: current.version, items: current.items } : null, after: { version: row!.version, items } })
    return row!
  })
}

// A log entry (or its correction) moves the area's checks, its chargers' inspection, the log's review
// and the follow-ups it opened.
async function recomputeLogSubjects(tx: DbOrTx, area: AreaRow, logId: string, followUpIds: string[]) {
  const chargers = await tx.select({ id: tables.chargers.id }).from(tables.chargers).where(eq(tables.chargers.areaId, area.id))
  await recomputeSubjects(tx, area.siteId, [
    { kind: 'area', id: area.id }, ...chargers.map(c => ({ kind: 'charger' as const, id: c.id })),
    { kind: 'log', id: logId }, ...followUpIds.map(id => ({ kind: 'follow_up' as const, id })),
  ])
}

export function entryCsvRows(area: AreaRow, days: LogDay[]) {
  const rows: string[][] = []
  for (const d of days) {
    for (const item of d.items) {
      const e = d.entries.find(x => x.itemKey === item.key)
      rows.push([area.name, d.date, item.label, e?.result ?? '', e?.note ?? '', e?.by ?? '', e ? e.at.toISOString() : '', e?.correctionReason ?? '', d.log?.signedBy ?? '', d.log?.signedAt ? d.log.signedAt.toISOString() : ''])
    }
  }
  return rows
}

export const LOG_CSV_HEADER = ['area', 'date', 'item', 'result', 'note', 'recordedBy', 'recordedAt', 'correctionReason', 'signedBy', 'signedAt']
