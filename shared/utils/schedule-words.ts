import type { IntervalUnit } from './due-dates'
import { DUE_KIND_SUBJECTS, INTERVAL_UNITS, type CustomSubjectKind, type DueKind, type DueSubjectKind, type ScheduleDefinition } from './due-schedules'
import type { CustomIntervalUnit } from './schedule-schemas'

// Schedules in words for the schedule editor: the interval, the due-soon window, the subject groups.

/** The calendar units a day rule can count in, in the order the editor offers them. */
const UNIT_LABELS: Readonly<Record<IntervalUnit, string>> = { day: 'Days', week: 'Weeks', month: 'Months', year: 'Years' }
export const SCHEDULE_UNIT_CHOICES: readonly { value: IntervalUnit, label: string }[] = INTERVAL_UNITS.map(value => ({ value, label: UNIT_LABELS[value] }))

const ONCE_A: Readonly<Record<IntervalUnit, string>> = { day: 'daily', week: 'weekly', month: 'monthly', year: 'yearly' }

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`

/** "daily", "every 31 days", "every 3 months", "every 5 charges or 7 days", "on the date its rule gives". */
export function scheduleIntervalWords(s: Pick<ScheduleDefinition, 'rule' | 'every' | 'everyUnit' | 'withinDays'>): string {
  if (s.rule === 'date_rule') return 'on the date its rule gives'
  if (s.every === null || s.every < 1) return 'no interval set'
  if (s.rule === 'days') {
    const unit = s.everyUnit ?? 'day'
    return s.every === 1 ? ONCE_A[unit] : `every ${plural(s.every, unit)}`
  }
  const count = s.rule === 'charges'
    ? (s.every === 1 ? 'every charge' : `every ${plural(s.every, 'charge')}`)
    : (s.every === 1 ? 'every hour of use' : `every ${plural(s.every, 'hour')}`)
  return s.withinDays ? `${count} or ${plural(s.withinDays, 'day')}` : count
}

/** When the due list starts showing it as due soon: "on the day", "1 day before", "30 days before". */
export function dueSoonWords(days: number): string {
  return days <= 0 ? 'on the day' : `${plural(days, 'day')} before`
}

/** What the count of a count rule is in: "charges", "hours"; null for day and date rules. */
export function scheduleCountUnit(rule: ScheduleDefinition['rule']): string | null {
  return rule === 'charges' ? 'charges' : rule === 'hours' ? 'hours' : null
}

export type ScheduleGroupKey = 'battery' | 'charger' | 'truck' | 'cylinder' | 'area' | 'person'

export const SCHEDULE_GROUP_LABELS: Readonly<Record<ScheduleGroupKey, string>> = {
  battery: 'Batteries',
  charger: 'Chargers',
  truck: 'Trucks',
  cylinder: 'LP cylinders',
  area: 'Areas and logs',
  person: 'People',
}

const GROUP_OF_SUBJECT: Readonly<Record<DueSubjectKind, ScheduleGroupKey>> = {
  battery: 'battery', charger: 'charger', truck: 'truck', cylinder: 'cylinder',
  area: 'area', log: 'area', follow_up: 'area', person: 'person', site: 'area',
}

/** The group a schedule shows in: by what it is about (a lead-added one by its subject kind). */
export function scheduleGroupOf(s: { kind: DueKind, subjectKind?: DueSubjectKind }): ScheduleGroupKey {
  const subject = s.kind === 'custom' ? s.subjectKind ?? 'site' : DUE_KIND_SUBJECTS[s.kind]
  return GROUP_OF_SUBJECT[subject]
}

/** Schedules by subject, in the group order above, each group keeping the order it was given; empty groups left out. */
export function groupSchedules<T extends { kind: DueKind, subjectKind?: DueSubjectKind }>(items: readonly T[]): { key: ScheduleGroupKey, label: string, items: T[] }[] {
  return (Object.keys(SCHEDULE_GROUP_LABELS) as ScheduleGroupKey[])
    .map(key => ({ key, label: SCHEDULE_GROUP_LABELS[key], items: items.filter(i => scheduleGroupOf(i) === key) }))
    .filter(g => g.items.length > 0)
}

/** The units a lead-added schedule counts in, as the form offers them. */
export const CUSTOM_UNIT_LABELS: Readonly<Record<CustomIntervalUnit, string>> = {
  day: 'Days', week: 'Weeks', month: 'Months', year: 'Years', charges: 'Charges (batteries)', hours: 'Hours of use (trucks)',
}

export const CUSTOM_SUBJECT_LABELS: Readonly<Record<CustomSubjectKind, string>> = {
  area: 'Each area', charger: 'Each charger', truck: 'Each truck', battery: 'Each battery', cylinder: 'Each LP cylinder', site: 'The site as a whole',
}

/** The "every N <unit>" of a lead-added schedule, as its form shows it. */
export function customUnitOf(s: Pick<ScheduleDefinition, 'rule' | 'everyUnit'>): CustomIntervalUnit {
  return s.rule === 'charges' || s.rule === 'hours' ? s.rule : s.everyUnit ?? 'day'
}
