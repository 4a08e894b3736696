import type { Role } from '../types/auth'
import type { IntervalUnit } from './due-dates'
import type { FollowUpTitleWords } from './follow-up-words'

// The recurring obligations Bayward tracks, their default rules and where each rule comes from.
// The Schedules page is the one source of every interval: the defaults below, each replaced by the
// site's own row of its kind, plus the schedules a lead adds (kind 'custom').

export const DUE_KINDS = [
  'area_checklist', 'eyewash_activation', 'extinguisher_visual', 'battery_watering', 'battery_equalize',
  'electrolyte_full_check', 'charger_inspection', 'emissions_test', 'co_monitoring', 'cylinder_requalification',
  'operator_evaluation', 'log_review', 'follow_up', 'custom',
] as const
export type DueKind = typeof DUE_KINDS[number]
/** The kinds Bayward knows by itself (everything but the schedules a lead adds). */
export type BuiltInDueKind = Exclude<DueKind, 'custom'>
export const BUILT_IN_DUE_KINDS = DUE_KINDS.filter((k): k is BuiltInDueKind => k !== 'custom')

export const SCHEDULE_RULES = ['days', 'charges', 'hours', 'date_rule'] as const
export type ScheduleRule = typeof SCHEDULE_RULES[number]

export type DueSubjectKind = 'battery' | 'charger' | 'area' | 'truck' | 'cylinder' | 'person' | 'log' | 'follow_up' | 'site'

/** What a lead-added schedule can be about. */
export const CUSTOM_SUBJECT_KINDS = ['area', 'charger', 'truck', 'battery', 'cylinder', 'site'] as const
export type CustomSubjectKind = typeof CUSTOM_SUBJECT_KINDS[number]

export const INTERVAL_UNITS = ['day', 'week', 'month', 'year'] as const

export interface ScheduleDefinition {
  /** the site's stored row, when it has one (a default nobody changed has none) */
  id: string | null
  kind: DueKind
  title: string
  /** what the obligation is about, in words: "Flooded batteries", "Charging areas" */
  appliesTo: string
  subjectKind: DueSubjectKind
  rule: ScheduleRule
  /** the interval count: days/weeks/months/years for a day rule, charges or hours for a count rule */
  every: number | null
  everyUnit: IntervalUnit | null
  /** for count rules: also due this many days after the last time, whichever comes first */
  withinDays: number | null
  /** for the emissions test: due again this many days after a failed test */
  afterFailDays: number | null
  dueSoonDays: number
  responsibleRole: Role
  source: string
  active: boolean
  /** when a lead added it (counting starts then for subjects never done); null for the defaults */
  createdAt: string | null
}

export const DUE_KIND_SUBJECTS: Readonly<Record<BuiltInDueKind, DueSubjectKind>> = {
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

type DefaultInput = Omit<ScheduleDefinition, 'id' | 'active' | 'withinDays' | 'afterFailDays' | 'subjectKind' | 'createdAt' | 'kind'>
  & { kind: BuiltInDueKind, withinDays?: number | null, afterFailDays?: number | null }

// Every built-in schedule with its default rule and its source.
export function defaultSchedules(): ScheduleDefinition[] {
  const d = (s: DefaultInput): ScheduleDefinition =>
    ({ id: null, withinDays: null, afterFailDays: null, active: true, createdAt: null, subjectKind: DUE_KIND_SUBJECTS[s.kind], ...s })
  return [
    d({ kind: 'area_checklist', title: 'Daily area checklist', appliesTo: 'Charging areas and fuel stations', rule: 'days', every: 1, everyUnit: 'day', dueSoonDays: 0, responsibleRole: 'technician', source: 'Site policy: daily checklist of the 29 CFR 1910.178(g) charging-area provisions and the fuel-station items (common practice)' }),
    d({ kind: 'eyewash_activation', title: 'Eyewash activation', appliesTo: 'Charging areas', rule: 'days', every: 1, everyUnit: 'week', dueSoonDays: 1, responsibleRole: 'technician', source: 'ANSI/ISEA Z358.1-2014: plumbed eyewash activated weekly' }),
    d({ kind: 'extinguisher_visual', title: 'Extinguisher visual check', appliesTo: 'Charging areas and fuel stations', rule: 'days', every: 31, everyUnit: 'day', dueSoonDays: 7, responsibleRole: 'technician', source: '29 CFR 1910.157(e)(2) monthly visual check; NFPA 10: "monthly" is at most 31 days' }),
    d({ kind: 'battery_watering', title: 'Battery watering', appliesTo: 'Flooded lead-acid batteries', rule: 'charges', every: 5, everyUnit: null, withinDays: 7, dueSoonDays: 1, responsibleRole: 'technician', source: 'Common practice; follow the battery maker. Water after charging (battery care guides).' }),
    d({ kind: 'battery_equalize', title: 'Equalize charge', appliesTo: 'Flooded lead-acid batteries', rule: 'charges', every: 5, everyUnit: null, withinDays: 7, dueSoonDays: 1, responsibleRole: 'technician', source: 'Weekly or every 5th cycle, per the battery maker (common practice)' }),
    d({ kind: 'electrolyte_full_check', title: 'Every-cell specific gravity', appliesTo: 'Flooded lead-acid batteries', rule: 'days', every: 30, everyUnit: 'day', dueSoonDays: 3, responsibleRole: 'technician', source: 'Common practice: a full-cell hydrometer reading monthly; follow the battery maker' }),
    d({ kind: 'charger_inspection', title: 'Charger and cable inspection', appliesTo: 'Chargers', rule: 'days', every: 30, everyUnit: 'day', dueSoonDays: 7, responsibleRole: 'technician', source: 'Site policy (common practice); chargers protected from truck damage, 29 CFR 1910.178(g)(2)' }),
    d({ kind: 'emissions_test', title: 'Emissions test', appliesTo: 'Combustion trucks', rule: 'days', every: 1, everyUnit: 'year', afterFailDays: 30, dueSoonDays: 30, responsibleRole: 'facilities_lead', source: 'Site policy; Minnesota Rules 5205.0116 as the published example (no federal rule requires yearly tailpipe tests)' }),
    d({ kind: 'co_monitoring', title: 'Indoor CO monitoring', appliesTo: 'Areas where combustion trucks run', rule: 'days', every: 3, everyUnit: 'month', dueSoonDays: 14, responsibleRole: 'safety_lead', source: 'Minnesota Rules 5205.0116: indoor CO monitoring at least quarterly (site policy elsewhere)' }),
    d({ kind: 'cylinder_requalification', title: 'Cylinder requalification', appliesTo: 'LP-gas cylinders', rule: 'date_rule', every: null, everyUnit: null, dueSoonDays: 90, responsibleRole: 'facilities_lead', source: '49 CFR 180.209: within 12 years of manufacture, then by method (12 years water jacket, 5 years external visual)' }),
    d({ kind: 'operator_evaluation', title: 'Operator evaluation', appliesTo: 'Operators', rule: 'days', every: 3, everyUnit: 'year', dueSoonDays: 60, responsibleRole: 'safety_lead', source: '29 CFR 1910.178(l)(4)(iii): evaluation at least once every three years' }),
    d({ kind: 'log_review', title: 'Sign the area log', appliesTo: 'Area logs with entries', rule: 'days', every: 1, everyUnit: 'day', dueSoonDays: 0, responsibleRole: 'safety_lead', source: 'Site policy: the safety lead reviews and signs each day\'s log' }),
    d({ kind: 'follow_up', title: 'Follow-up', appliesTo: 'Failed checklist items and incidents', rule: 'days', every: 3, everyUnit: 'day', dueSoonDays: 1, responsibleRole: 'safety_lead', source: 'Site policy: a failed item or an incident is followed up within 3 days' }),
  ]
}

/** A stored schedule row as the rule module reads it. */
export interface StoredSchedule {
  id: string
  kind: string
  title: string
  appliesTo: string
  subjectKind: string | null
  rule: ScheduleRule
  every: number | null
  everyUnit: string | null
  withinDays: number | null
  afterFailDays: number | null
  dueSoonDays: number
  responsibleRole: Role
  source: string
  active: boolean
  createdAt: Date | string | null
}

const asUnit = (v: string | null): IntervalUnit | null => ((INTERVAL_UNITS as readonly string[]).includes(v ?? '') ? v as IntervalUnit : null)
const asIso = (v: Date | string | null) => (v === null ? null : v instanceof Date ? v.toISOString() : v)

// The site's schedules: the defaults, each replaced by the site's own row of the same kind (its rule
// stays the default's: watering counts charges whatever a row says), then the schedules a lead added.
export function effectiveSchedules(defaults: readonly ScheduleDefinition[], stored: readonly StoredSchedule[]): ScheduleDefinition[] {
  const byKind = new Map(stored.filter(s => s.kind !== 'custom').map(s => [s.kind, s]))
  const builtIn = defaults.map((def) => {
    const own = byKind.get(def.kind)
    if (!own) return def
    return {
      ...def, id: own.id, title: own.title, appliesTo: own.appliesTo, every: def.rule === 'date_rule' ? null : own.every ?? def.every,
      everyUnit: def.rule === 'days' ? asUnit(own.everyUnit) ?? def.everyUnit : def.everyUnit,
      withinDays: def.rule === 'charges' || def.rule === 'hours' ? own.withinDays : null,
      afterFailDays: def.kind === 'emissions_test' ? own.afterFailDays ?? def.afterFailDays : null,
      dueSoonDays: own.dueSoonDays, responsibleRole: own.responsibleRole, source: own.source || def.source, active: own.active,
    }
  })
  const custom = stored.filter(s => s.kind === 'custom').map((s): ScheduleDefinition => ({
    id: s.id, kind: 'custom', title: s.title, appliesTo: s.appliesTo, subjectKind: (s.subjectKind ?? 'site') as DueSubjectKind,
    rule: s.rule, every: s.every, everyUnit: s.rule === 'days' ? asUnit(s.everyUnit) ?? 'day' : null, withinDays: null, afterFailDays: null,
    dueSoonDays: s.dueSoonDays, responsibleRole: s.responsibleRole, source: s.source, active: s.active, createdAt: asIso(s.createdAt),
  }))
  custom.sort((a, b) => a.title.localeCompare(b.title))
  return [...builtIn, ...custom]
}

/** The key of a schedule's obligations: its kind, or 'custom:<id>' for one a lead added. */
export function scheduleRuleKey(s: Pick<ScheduleDefinition, 'kind' | 'id'>): string {
  return s.kind === 'custom' ? `custom:${s.id}` : s.kind
}

export const DUE_KIND_LABELS: Readonly<Record<DueKind, string>> = {
  ...Object.fromEntries(defaultSchedules().map(s => [s.kind, s.title])) as Record<BuiltInDueKind, string>,
  custom: 'Added by a lead',
}

export interface DueSubject {
  kind: DueSubjectKind
  id: string
  label: string
  tagCode: string | null
  /** the area of a log, or the area an area-scoped task is for */
  areaId?: string | null
  /** a log's period start, for log_review */
  periodStart?: string | null
  /** a follow-up's title as codes, for the reader's words (its label is the title as stored, in English) */
  labelWords?: FollowUpTitleWords | null
}

// Where one tap goes to record the work that closes an obligation.
export function obligationActionPath(kind: DueKind, subject: DueSubject, scheduleId: string | null = null): { label: string, to: string } {
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
    case 'custom': return { label: 'Record it done', to: `/schedules/${scheduleId ?? ''}/done?subject=${subject.id}` }
  }
}

export const OBLIGATION_STATES = ['overdue', 'due_soon', 'upcoming', 'done'] as const
export const DUE_SORTS = ['due', 'kind', 'subject', 'role'] as const

/** How many obligations the due list answers at first; the page asks for more as the user scrolls on. */
export const DUE_PAGE_SIZE = 200

export const DUE_STATE_TONES = {
  overdue: 'danger',
  due_soon: 'caution',
  upcoming: 'neutral',
  done: 'safe',
} as const
