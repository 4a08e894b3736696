import { z } from 'zod'
import { ROLES, type Role } from '../types/auth'
import { addCalendarInterval, nextDueByCount, obligationState, type IntervalUnit, type ObligationState } from './due-dates'
import type { SiteSettings } from './site-settings'

// The recurring obligations Bayward tracks, their default rules and where each rule comes from.

export const DUE_KINDS = [
  'area_checklist', 'eyewash_activation', 'extinguisher_visual', 'battery_watering', 'battery_equalize',
  'electrolyte_full_check', 'charger_inspection', 'emissions_test', 'co_monitoring', 'cylinder_requalification',
  'operator_evaluation', 'log_review', 'follow_up',
] as const
export type DueKind = typeof DUE_KINDS[number]

export const SCHEDULE_RULES = ['days', 'charges', 'hours', 'date_rule'] as const
export type ScheduleRule = typeof SCHEDULE_RULES[number]

export type DueSubjectKind = 'battery' | 'charger' | 'area' | 'truck' | 'cylinder' | 'person' | 'log' | 'follow_up'

export interface ScheduleDefinition {
  kind: DueKind
  title: string
  /** what the obligation is about, in words: "Flooded batteries", "Charging areas" */
  appliesTo: string
  rule: ScheduleRule
  /** the interval count: days/weeks/months/years for a day rule, charges or hours for a count rule */
  every: number | null
  everyUnit: IntervalUnit | null
  /** for count rules: also due this many days after the last time, whichever comes first */
  withinDays: number | null
  dueSoonDays: number
  responsibleRole: Role
  source: string
  active: boolean
}

export const DUE_KIND_SUBJECTS: Readonly<Record<DueKind, DueSubjectKind>> = {
  area_checklist: 'area',
  eyewash_activation: 'area',
  extinguisher_visual: 'area',
  battery_watering: 'battery',
  battery_equalize: 'battery',
  electrolyte_full_check: 'battery',
  charger_inspection: 'charger',
  emissions_test: 'truck',
  co_monitoring: 'area',
  cylinder_requalification: 'cylinder',
  operator_evaluation: 'person',
  log_review: 'log',
  follow_up: 'follow_up',
}

// Defaults for a site; watering, equalize and the checks that are site policy read the site's settings.
export function defaultSchedules(settings: Pick<SiteSettings,
  'wateringEveryCharges' | 'wateringEveryDays' | 'equalizeEveryCharges' | 'equalizeEveryDays' | 'dueSoonDays'
  | 'chargerInspectionEveryDays' | 'fullCellCheckEveryDays'>): ScheduleDefinition[] {
  const d = (s: Omit<ScheduleDefinition, 'active' | 'withinDays'> & { withinDays?: number | null }): ScheduleDefinition =>
    ({ withinDays: null, active: true, ...s })
  return [
    d({ kind: 'area_checklist', title: 'Daily area checklist', appliesTo: 'Charging areas and fuel stations', rule: 'days', every: 1, everyUnit: 'day', dueSoonDays: 0, responsibleRole: 'technician', source: 'Site policy: daily checklist of the 29 CFR 1910.178(g) charging-area provisions and the fuel-station items (common practice)' }),
    d({ kind: 'eyewash_activation', title: 'Eyewash activation', appliesTo: 'Charging areas', rule: 'days', every: 1, everyUnit: 'week', dueSoonDays: 1, responsibleRole: 'technician', source: 'ANSI/ISEA Z358.1-2014: plumbed eyewash activated weekly' }),
    d({ kind: 'extinguisher_visual', title: 'Extinguisher visual check', appliesTo: 'Charging areas and fuel stations', rule: 'days', every: 31, everyUnit: 'day', dueSoonDays: 7, responsibleRole: 'technician', source: '29 CFR 1910.157(e)(2) monthly visual check; NFPA 10: "monthly" is at most 31 days' }),
    d({ kind: 'battery_watering', title: 'Battery watering', appliesTo: 'Flooded lead-acid batteries', rule: 'charges', every: settings.wateringEveryCharges, everyUnit: null, withinDays: settings.wateringEveryDays, dueSoonDays: 1, responsibleRole: 'technician', source: 'Common practice; follow the battery maker. Water after charging (battery care guides).' }),
    d({ kind: 'battery_equalize', title: 'Equalize charge', appliesTo: 'Flooded lead-acid batteries', rule: 'charges', every: settings.equalizeEveryCharges, everyUnit: null, withinDays: settings.equalizeEveryDays, dueSoonDays: 1, responsibleRole: 'technician', source: 'Weekly or every 5th cycle, per the battery maker (common practice)' }),
    d({ kind: 'electrolyte_full_check', title: 'Every-cell specific gravity', appliesTo: 'Flooded lead-acid batteries', rule: 'days', every: settings.fullCellCheckEveryDays, everyUnit: 'day', dueSoonDays: 3, responsibleRole: 'technician', source: 'Common practice: a full-cell hydrometer reading monthly; follow the battery maker' }),
    d({ kind: 'charger_inspection', title: 'Charger and cable inspection', appliesTo: 'Chargers', rule: 'days', every: settings.chargerInspectionEveryDays, everyUnit: 'day', dueSoonDays: 7, responsibleRole: 'technician', source: 'Site policy (common practice); chargers protected from truck damage, 29 CFR 1910.178(g)(2)' }),
    d({ kind: 'emissions_test', title: 'Emissions test', appliesTo: 'Combustion trucks', rule: 'days', every: 1, everyUnit: 'year', dueSoonDays: 30, responsibleRole: 'facilities_lead', source: 'Site policy; Minnesota Rules 5205.0116 as the published example (no federal rule requires yearly tailpipe tests)' }),
    d({ kind: 'co_monitoring', title: 'Indoor CO monitoring', appliesTo: 'Areas where combustion trucks run', rule: 'days', every: 3, everyUnit: 'month', dueSoonDays: 14, responsibleRole: 'safety_lead', source: 'Minnesota Rules 5205.0116: indoor CO monitoring at least quarterly (site policy elsewhere)' }),
    d({ kind: 'cylinder_requalification', title: 'Cylinder requalification', appliesTo: 'LP-gas cylinders', rule: 'date_rule', every: null, everyUnit: null, dueSoonDays: 90, responsibleRole: 'facilities_lead', source: '49 CFR 180.209: within 12 years of manufacture, then by method (12 years water jacket, 5 years external visual)' }),
    d({ kind: 'operator_evaluation', title: 'Operator evaluation', appliesTo: 'Operators', rule: 'days', every: 3, everyUnit: 'year', dueSoonDays: 60, responsibleRole: 'safety_lead', source: '29 CFR 1910.178(l)(4)(iii): evaluation at least once every three years' }),
    d({ kind: 'log_review', title: 'Sign the area log', appliesTo: 'Area logs with entries', rule: 'days', every: 1, everyUnit: 'day', dueSoonDays: 0, responsibleRole: 'safety_lead', source: 'Site policy: the safety lead reviews and signs each day\'s log' }),
    d({ kind: 'follow_up', title: 'Follow-up', appliesTo: 'Failed checklist items and incidents', rule: 'days', every: 3, everyUnit: 'day', dueSoonDays: 1, responsibleRole: 'safety_lead', source: 'Site policy: a failed item or an incident is followed up within 3 days' }),
  ]
}

/** A stored schedule row as the engine reads it (the columns it needs). */
export interface StoredSchedule {
  kind: string
  title: string
  appliesTo: string
  rule: ScheduleRule
  every: number | null
  everyUnit: string | null
  withinDays: number | null
  dueSoonDays: number
  responsibleRole: Role
  source: string
  active: boolean
}

export const INTERVAL_UNITS = ['day', 'week', 'month', 'year'] as const

// The site's schedules: the defaults, each replaced by the site's own row of the same kind.
export function effectiveSchedules(defaults: readonly ScheduleDefinition[], stored: readonly StoredSchedule[]): ScheduleDefinition[] {
  const byKind = new Map(stored.map(s => [s.kind, s]))
  return defaults.map((def) => {
    const own = byKind.get(def.kind)
    if (!own) return def
    const unit = (INTERVAL_UNITS as readonly string[]).includes(own.everyUnit ?? '') ? own.everyUnit as IntervalUnit : def.everyUnit
    return { ...def, title: own.title, appliesTo: own.appliesTo, rule: def.rule === 'date_rule' ? def.rule : own.rule, every: own.every ?? def.every, everyUnit: unit, withinDays: own.withinDays, dueSoonDays: own.dueSoonDays, responsibleRole: own.responsibleRole, source: own.source || def.source, active: own.active }
  })
}

export interface RuleProgress {
  /** site-local date the work was last recorded, or null when never */
  lastDoneOn: string | null
  /** the date counting starts from when never done (the asset's registration or in-service date) */
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

/** The state of an open obligation; a count rule reached today is due today even without a date. */
export function obligationStateFor(next: NextDue, today: string, dueSoonDays: number): Exclude<ObligationState, 'done'> {
  if (next.dueOn === null) return next.remaining !== null && next.remaining <= 0 ? 'due_soon' : 'upcoming'
  return obligationState(next.dueOn, today, dueSoonDays)
}

export const DUE_KIND_LABELS: Readonly<Record<DueKind, string>> = Object.fromEntries(
  defaultSchedules({ wateringEveryCharges: 5, wateringEveryDays: 7, equalizeEveryCharges: 5, equalizeEveryDays: 7, dueSoonDays: 14, chargerInspectionEveryDays: 30, fullCellCheckEveryDays: 30 })
    .map(s => [s.kind, s.title]),
) as Record<DueKind, string>

export interface DueSubject {
  kind: DueSubjectKind
  id: string
  label: string
  tagCode: string | null
  /** the area of a log, or the area an area-scoped task is for */
  areaId?: string | null
  /** a log's period start, for log_review */
  periodStart?: string | null
}

// Where one tap goes to record the work that closes an obligation.
export function obligationActionPath(kind: DueKind, subject: DueSubject): { label: string, to: string } {
  const code = subject.tagCode ? encodeURIComponent(subject.tagCode) : null
  switch (kind) {
    case 'battery_watering': return { label: 'Water and check', to: code ? `/check?battery=${code}` : '/check' }
    case 'electrolyte_full_check': return { label: 'Take every-cell reading', to: code ? `/check?battery=${code}&scope=every_cell` : '/check' }
    case 'battery_equalize': return { label: 'Put on equalize', to: code ? `/charge?battery=${code}` : '/charge' }
    case 'charger_inspection': return { label: 'Fill in the area log', to: subject.areaId ? `/logs?area=${subject.areaId}` : '/logs' }
    case 'area_checklist':
    case 'eyewash_activation':
    case 'extinguisher_visual': return { label: 'Fill in the area log', to: `/logs?area=${subject.id}` }
    case 'log_review': return { label: 'Review and sign', to: `/logs?area=${subject.areaId ?? ''}&date=${subject.periodStart ?? ''}&review=1` }
    case 'follow_up': return { label: 'Close the follow-up', to: `/logs?followUp=${subject.id}` }
    case 'emissions_test': return { label: 'Record the test', to: `/emissions?truck=${subject.id}` }
    case 'co_monitoring': return { label: 'Record CO readings', to: `/co?area=${subject.id}` }
    case 'cylinder_requalification': return { label: 'Record requalification', to: `/cylinders/${subject.id}` }
    case 'operator_evaluation': return { label: 'Record the evaluation', to: '/people' }
  }
}

export const OBLIGATION_STATES = ['overdue', 'due_soon', 'upcoming', 'done'] as const
export const DUE_SORTS = ['due', 'kind', 'subject', 'role'] as const

const csv = <T extends string>(values: readonly T[]) => z.string().optional().transform((v, ctx) => {
  if (!v) return undefined
  const parts = v.split(',').map(p => p.trim()).filter(Boolean)
  const bad = parts.find(p => !(values as readonly string[]).includes(p))
  if (bad) {
    ctx.addIssue({ code: 'custom', message: `Unknown value "${bad}".` })
    return z.NEVER
  }
  return parts as T[]
})

/** How many obligations the due list answers at first; the page asks for more as the user scrolls on. */
export const DUE_PAGE_SIZE = 200

export const dueQuerySchema = z.object({
  siteId: z.uuid({ error: 'Pick a site.' }),
  role: z.enum([...ROLES, 'all']).optional(),
  state: csv(OBLIGATION_STATES),
  kind: csv(DUE_KINDS),
  sort: z.enum(DUE_SORTS).default('due'),
  limit: z.coerce.number().int().min(1).max(20_000).default(DUE_PAGE_SIZE),
})
export type DueQuery = z.output<typeof dueQuerySchema>

export const scheduleUpdateSchema = z.object({
  siteId: z.uuid(),
  title: z.string().trim().min(3).max(120).optional(),
  every: z.number().int().min(1).max(1000).nullable().optional(),
  everyUnit: z.enum(INTERVAL_UNITS).nullable().optional(),
  withinDays: z.number().int().min(1).max(365).nullable().optional(),
  dueSoonDays: z.number().int().min(0).max(365).optional(),
  responsibleRole: z.enum(ROLES).optional(),
  source: z.string().trim().max(300).optional(),
  active: z.boolean().optional(),
})

export const DUE_STATE_TONES: Readonly<Record<ObligationState, 'danger' | 'caution' | 'neutral' | 'safe'>> = {
  overdue: 'danger',
  due_soon: 'caution',
  upcoming: 'neutral',
  done: 'safe',
}
