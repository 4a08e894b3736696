import { localDate } from './due-dates'
import type { ScheduleDefinition } from './due-schedules'
import { chargesProgress, hoursAsOf, hoursProgress, laterDate, scheduleObligation, type HourReading, type ObligationRecord, type ObligationSubject } from './due-rules'

// Obligations of the schedules a lead adds (yearly extinguisher maintenance, charger service every N
// months, truck service every N hours …), closed by a completion record ("Record it done").

/** A completion record as the rules read it (effective rows only). */
export interface CompletionFact {
  scheduleId: string
  subjectId: string
  doneOn: string
  at: Date
  hourMeter: number | null
}

export interface CustomCounters {
  /** effective charge ends of the battery, oldest first (batteries) */
  chargeEnds?: readonly Date[]
  /** effective hour-meter readings, oldest first, and the meter as registered (trucks) */
  readings?: readonly HourReading[]
  registeredHours?: number
}

/** The latest completion of each schedule for one subject. */
export function latestCompletions(completions: readonly CompletionFact[]): Map<string, CompletionFact> {
  const latest = new Map<string, CompletionFact>()
  for (const c of completions) {
    const seen = latest.get(c.scheduleId)
    if (!seen || c.doneOn > seen.doneOn || (c.doneOn === seen.doneOn && c.at > seen.at)) latest.set(c.scheduleId, c)
  }
  return latest
}

// Counting starts at the later of the subject's registration and the schedule's creation, until the
// first completion. A count rule counts from the completion's moment (hours: its meter reading, or the
// meter as of that moment).
export function customObligations(
  schedules: readonly ScheduleDefinition[],
  subject: ObligationSubject,
  registeredAt: Date,
  completions: readonly CompletionFact[],
  counters: CustomCounters,
  timeZone: string,
): ObligationRecord[] {
  const latest = latestCompletions(completions)
  const out: ObligationRecord[] = []
  for (const s of schedules) {
    if (s.kind !== 'custom' || !s.active || s.subjectKind !== subject.kind || s.id === null || !s.every) continue
    const done = latest.get(s.id) ?? null
    const addedAt = s.createdAt ? new Date(s.createdAt) : registeredAt
    const startAt = addedAt > registeredAt ? addedAt : registeredAt
    const startOn = laterDate(localDate(registeredAt, timeZone), localDate(addedAt, timeZone))
    const since = done ? done.at : startAt
    if (s.rule === 'charges') {
      const count = chargesProgress(counters.chargeEnds ?? [], since, s.every, timeZone)
      out.push(scheduleObligation(s, subject, { lastDoneOn: done?.doneOn ?? null, startOn, count, detail: `${count.now} of ${s.every} charges since last done`, detailWords: { code: 'charges_since_done', params: { now: count.now, every: s.every } } }))
    }
    else if (s.rule === 'hours') {
      const readings = counters.readings ?? []
      const registered = counters.registeredHours ?? 0
      const atDone = done?.hourMeter ?? hoursAsOf(readings, since, registered)
      const now = hoursAsOf(readings, null, registered)
      const count = hoursProgress(readings, atDone, now, s.every, since, timeZone)
      out.push(scheduleObligation(s, subject, { lastDoneOn: done?.doneOn ?? null, startOn, count, detail: `${Math.round((now - atDone) * 10) / 10} of ${s.every} h since last done`, detailWords: { code: 'hours_since_done', params: { now: Math.round((now - atDone) * 10) / 10, every: s.every } } }))
    }
    else {
      out.push(scheduleObligation(s, subject, { lastDoneOn: done?.doneOn ?? null, startOn }))
    }
  }
  return out
}
