import { DUE_KIND_LABELS, type DueKind } from '#shared/utils/due-schedules'
import { followUpTitle } from '#shared/utils/follow-up-words'
import type { Obligation } from './due/list'
import type { MailDay, MailT } from './mail-words'

// A due-list row named in a reader's words away from the screen (the daily digest, the calendar feed), its dates
// as the reader's language writes them (`mailDay`).

/** The subject's name; a follow-up's title in the reader's words when it came with codes. */
export function dueSubjectName(t: MailT, day: MailDay, o: Obligation): string {
  const { label, labelWords, periodStart } = o.subject
  if (o.subject.kind === 'follow_up' && labelWords) return followUpTitle({ title: label, titleWords: labelWords }, { t, has: key => t(key) !== key, day })
  // an area log's day ("North charge room · 2026-11-30") with the day as the reader writes it
  return o.subject.kind === 'log' && periodStart && label.endsWith(` · ${periodStart}`) ? `${label.slice(0, -periodStart.length)}${day(periodStart)}` : label
}

/** A built-in task by its name in the reader's words; a task a lead added keeps the words the lead wrote. */
export function dueTaskName(t: MailT, o: Obligation): string {
  return o.kind !== 'custom' && DUE_KIND_LABELS[o.kind as DueKind] === o.what ? t(`due.kind.${o.kind}`) : o.what
}

/** The row's detail in the reader's words when it came as a code (due.detail.<code>), else as the server wrote it. */
export function dueDetail(t: MailT, day: MailDay, o: Pick<Obligation, 'detail' | 'detailWords'>): string | null {
  const w = o.detailWords
  if (!w || t(`due.detail.${w.code}`) === `due.detail.${w.code}`) return o.detail
  return t(`due.detail.${w.code}`, Object.fromEntries(Object.entries(w.params ?? {}).map(([k, v]) => [k, typeof v === 'string' ? day(v) : v])))
}
