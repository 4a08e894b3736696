import type { Role } from '../types/auth'
import { addCalendarInterval, localDate, nextDueByCount, obligationState, type IntervalUnit, type ObligationState } from './due-dates'
import { scheduleRuleKey, type DueKind, type DueSubjectKind, type ScheduleDefinition } from './due-schedules'

// The rule module's core: when a schedule falls due for one subject, and what state an obligation is
// in on a given day. The write path (server/utils/due/rules.ts), `npm run rebuild-state` and the tests
// all compute obligations with these functions; nothing else decides a due date.
//
// One rule for every obligation, watering included: it falls due on its due date — the day its days run
// out, or the day of the record that brought its count (charges, hours) to the interval, whichever is
// first — shows as Due soon from its schedule's window before that day (and on the day), and is Overdue
// from the next day on. The Bay board refuses a battery whose watering is Overdue.

export interface RuleProgress {
  /** site-local date the work was last recorded, or null when never */
  lastDoneOn: string | null
  /** the date counting starts from when never done (the subject's registration, or when the schedule was added) */
  startOn: string
  /** for count rules: charges or hours counted since it was last done */
  countSinceDone?: number
  /** for count rules: the site-local date the count reached the interval, when it has */
  countReachedOn?: string | null
  /** for date rules: the date the rule gives (e.g. 49 CFR 180.209) */
  ruleDueOn?: string
}

export interface NextDue {
  /** null: a count rule with no days cap that has not been reached yet */
  dueOn: string | null
  /** for count rules: charges or hours left (0 or below: due) */
  remaining: number | null
}

// When a schedule next falls due: a day rule adds its interval to the last time (month ends clamp);
// a count rule is due when the count is reached or the days cap passes, whichever is first.
export function nextDueOn(schedule: Pick<ScheduleDefinition, 'rule' | 'every' | 'everyUnit' | 'withinDays'>, progress: RuleProgress): NextDue {
  const base = progress.lastDoneOn ?? progress.startOn
  if (schedule.rule === 'date_rule') {
    if (!progress.ruleDueOn) throw new RangeError('a date rule needs the date its rule gives')
    return { dueOn: progress.ruleDueOn, remaining: null }
  }
  if (schedule.every === null || schedule.every <= 0) throw new RangeError('a schedule needs an interval above zero')
  if (schedule.rule === 'days') {
    return { dueOn: addCalendarInterval(base, schedule.every, schedule.everyUnit ?? 'day'), remaining: null }
  }
  const { remaining } = nextDueByCount(0, progress.countSinceDone ?? 0, schedule.every)
  const capped = schedule.withinDays ? addCalendarInterval(base, schedule.withinDays, 'day') : null
  const reached = remaining <= 0 ? (progress.countReachedOn ?? null) : null
  const dates = [capped, reached].filter((v): v is string => v !== null).sort()
  return { dueOn: dates[0] ?? null, remaining }
}

/** The state of an open obligation; a count rule reached without a date is due now. */
export function obligationStateFor(next: NextDue, today: string, dueSoonDays: number): Exclude<ObligationState, 'done'> {
  if (next.dueOn === null) return next.remaining !== null && next.remaining <= 0 ? 'due_soon' : 'upcoming'
  return obligationState(next.dueOn, today, dueSoonDays)
}

export type CountUnit = 'charges' | 'hours'

/** One row of the obligations read model: what is due, for what, and from which schedule. */
export interface ObligationRecord {
  /** the schedule's kind, or 'custom:<schedule id>' */
  ruleKey: string
  kind: DueKind
  scheduleId: string | null
  subjectKind: DueSubjectKind
  subjectId: string
  label: string
  tagCode: string | null
  areaId: string | null
  personId: string | null
  periodStart: string | null
  /** the schedule's title */
  what: string
  dueOn: string | null
  /** for count rules: the count (charges since, or the hour meter) at which it falls due, and the count now */
  dueAtCount: number | null
  countNow: number | null
  countUnit: CountUnit | null
  dueSoonDays: number
  responsibleRole: Role
  lastDoneOn: string | null
  detail: string | null
  /** the detail as a code and its values (due.detail.<code>), said in the reader's language; null when it is a name */
  detailWords: DetailWords | null
}

/** An obligation's detail as words to say: `due.detail.<code>` with its values. */
export interface DetailWords { code: string, params?: Record<string, string | number> }

/** What an obligation is about, as its row shows it. */
export interface ObligationSubject {
  kind: DueSubjectKind
  id: string
  label: string
  tagCode: string | null
  areaId: string | null
  personId?: string | null
  periodStart?: string | null
}

/** Charges or hours counted for one schedule and one subject. */
export interface CountProgress {
  unit: CountUnit
  /** the count when last done (0 for charges; the hour meter for hours) */
  atDone: number
  /** the count now */
  now: number
  /** the site-local date the count reached `atDone + every`, when it has */
  reachedOn: string | null
}

// The obligation one schedule makes for one subject, from the subject's progress against it.
export function scheduleObligation(schedule: ScheduleDefinition, subject: ObligationSubject, p: {
  lastDoneOn: string | null
  startOn: string
  count?: CountProgress
  ruleDueOn?: string
  /** a due date the record itself carries (an emissions retest, a follow-up's own date) */
  dueOnOverride?: string | null
  detail?: string | null
  detailWords?: DetailWords | null
}): ObligationRecord {
  const counted = schedule.rule === 'charges' || schedule.rule === 'hours'
  const next = p.dueOnOverride
    ? { dueOn: p.dueOnOverride, remaining: null }
    : nextDueOn(schedule, {
        lastDoneOn: p.lastDoneOn, startOn: p.startOn, ruleDueOn: p.ruleDueOn,
        // a meter read lower than at the last completion (a back-dated record) counts as no hours since, not an error
        countSinceDone: p.count ? Math.max(0, p.count.now - p.count.atDone) : undefined, countReachedOn: p.count?.reachedOn ?? null,
      })
  return {
    ruleKey: scheduleRuleKey(schedule),
    kind: schedule.kind,
    scheduleId: schedule.id,
    subjectKind: subject.kind,
    subjectId: subject.id,
    label: subject.label,
    tagCode: subject.tagCode,
    areaId: subject.areaId,
    personId: subject.personId ?? null,
    periodStart: subject.periodStart ?? null,
    what: schedule.title,
    dueOn: next.dueOn,
    dueAtCount: counted && p.count ? p.count.atDone + (schedule.every ?? 0) : null,
    countNow: counted && p.count ? p.count.now : null,
    countUnit: counted && p.count ? p.count.unit : null,
    dueSoonDays: schedule.dueSoonDays,
    responsibleRole: schedule.responsibleRole,
    lastDoneOn: p.lastDoneOn,
    detail: p.detail ?? null,
    detailWords: p.detailWords ?? null,
  }
}

/** The state of a stored obligation on `today` (site-local): read time, never stored. */
export function obligationStateAt(o: Pick<ObligationRecord, 'dueOn' | 'dueAtCount' | 'countNow' | 'dueSoonDays'>, today: string): Exclude<ObligationState, 'done'> {
  const remaining = o.dueAtCount !== null && o.countNow !== null ? o.dueAtCount - o.countNow : null
  return obligationStateFor({ dueOn: o.dueOn, remaining }, today, o.dueSoonDays)
}

/** Charges or hours left before it falls due (0 or below: due), for count rules. */
export function obligationRemaining(o: Pick<ObligationRecord, 'dueAtCount' | 'countNow'>): number | null {
  return o.dueAtCount !== null && o.countNow !== null ? Math.round((o.dueAtCount - o.countNow) * 10) / 10 : null
}

// Charges since a moment: how many ended after it, and the site-local day the `every`-th of them ended.
export function chargesProgress(ends: readonly Date[], since: Date | null, every: number, timeZone: string): CountProgress {
  const after = since ? ends.filter(e => e.getTime() > since.getTime()) : [...ends]
  const reached = after.length >= every ? after[every - 1]! : null
  return { unit: 'charges', atDone: 0, now: after.length, reachedOn: reached ? localDate(reached, timeZone) : null }
}

export interface HourReading { at: Date, hours: number }

/** The hour meter as of a moment: the latest reading at or before it, else `fallback`. */
export function hoursAsOf(readings: readonly HourReading[], at: Date | null, fallback: number): number {
  let value = fallback
  for (const r of readings) {
    if (at && r.at.getTime() > at.getTime()) break
    value = r.hours
  }
  return value
}

// Hours of use since a count: due `every` hours on; the day it falls due is the day of the first
// reading that moved the meter to or past that count.
export function hoursProgress(readings: readonly HourReading[], atDone: number, now: number, every: number, after: Date | null, timeZone: string): CountProgress {
  const target = atDone + every
  const hit = readings.find(r => (!after || r.at.getTime() > after.getTime()) && r.hours >= target)
  return { unit: 'hours', atDone, now, reachedOn: hit && now >= target ? localDate(hit.at, timeZone) : null }
}

/** The later of two site-local dates. */
export const laterDate = (a: string, b: string) => (a > b ? a : b)

/** One calendar day before a date (an obligation never done since registration falls due on that day). */
export const dayBefore = (isoDate: string) => addCalendarInterval(isoDate, -1, 'day')

export function plusInterval(isoDate: string, every: number, unit: IntervalUnit | null): string {
  return addCalendarInterval(isoDate, every, unit ?? 'day')
}
