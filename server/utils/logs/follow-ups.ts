import { checklistItemName } from '#shared/utils/follow-up-words'
import type { ChecklistItem } from '#shared/utils/area-checklists'
import type { DbOrTx } from '../db'
import type { Actor } from '../auth'

type AreaRow = typeof tables.areas.$inferSelect
type EntryRow = typeof tables.areaLogEntries.$inferSelect
type FollowUpRow = typeof tables.followUps.$inferSelect

// Follow-ups: opened by a failed checklist item or an incident on the day it happened, due the follow-up
// schedule's interval later (the Schedules page), closed by their owner or a lead.

/** When a follow-up opened on `openedOn` is due at the site now. */
export async function followUpDueAt(tx: DbOrTx, siteId: string, openedOn: string): Promise<string> {
  const schedule = (await loadSiteSchedules(tx, siteId)).find(s => s.kind === 'follow_up')!
  return followUpDueOn(openedOn, schedule)
}

export async function openChecklistFollowUp(tx: DbOrTx, actor: Actor, area: AreaRow, entry: EntryRow, item: ChecklistItem, date: string): Promise<string> {
  const title = `${area.name}: ${item.label} — failed on ${date}`
  const [followUp] = await tx.insert(tables.followUps).values({
    siteId: area.siteId, source: 'checklist', sourceId: entry.id, title: title.slice(0, 300), openedOn: date,
    titleWords: { code: 'checklist', params: { area: area.name, item: item.label, date } },
  }).returning()
  await writeAudit(tx, { actor, siteId: area.siteId, action: 'create', entity: 'follow_up', entityId: followUp!.id, after: followUp })
  const dueOn = await followUpDueAt(tx, area.siteId, date)
  // in each recipient's language; a default item in their words, one a lead wrote as written
  await queueAlert(tx, {
    siteId: area.siteId, kind: 'alert:checklist_failed', audience: 'notice.checklist-failed',
    subject: t => t('mail.item_failed_subject', { area: area.name, item: checklistItemName(item.label, { t, has: key => t(key) !== key }) }),
    body: t => [
      t('mail.item_failed', { who: actor.user.name, item: checklistItemName(item.label, { t, has: key => t(key) !== key }), area: area.name, on: date }),
      t('mail.note', { note: entry.note || '—' }),
      '',
      t('mail.follow_up_open', { on: dueOn }),
      appLink(`/logs?area=${area.id}&date=${date}`),
    ].join('\n'),
  })
  return followUp!.id
}

// Close a follow-up with what was done; its obligation goes with it.
export async function closeFollowUp(actor: Actor, found: FollowUpRow, note: string) {
  if (found.closedAt) throw codedError(409, 'follow_up_closed', 'This follow-up is closed already.')
  const f = tables.followUps
  return useDb().transaction(async (tx) => {
    const [row] = await tx.update(f).set({ closedAt: new Date(), closedBy: actor.user.id, closingNote: note }).where(and(eq(f.id, found.id), isNull(f.closedAt))).returning()
    if (!row) throw codedError(409, 'follow_up_closed', 'This follow-up is closed already.')
    await writeAudit(tx, { actor, siteId: found.siteId, action: 'close', entity: 'follow_up', entityId: found.id, before: found, after: row })
    await recomputeSubjects(tx, found.siteId, [{ kind: 'follow_up', id: found.id }], { lock: false })
    return { item: row }
  })
}
