import { z } from 'zod'
import { isoDateSchema, withDayRange } from './iso-date'
import { addCalendarInterval, calendarDaysBetween } from './due-dates'

// Area log checklists: the default items per area kind, the item keys the due list reads, the
// cautions the form shows, and the payloads of the log routes.

export interface ChecklistItem {
  key: string
  label: string
  hint?: string
}

export type ChecklistAreaKind = 'charging_area' | 'fuel_station'
export type ChecklistCadence = 'daily' | 'weekly'

/** Item keys the due list reads as the record of a recurring check. */
export const EYEWASH_ITEM_KEY = 'eyewash_flushed_reachable'
export const EXTINGUISHER_ITEM_KEY = 'extinguisher_present_charged'
export const CHARGER_ITEM_KEY = 'chargers_cables_undamaged'

export const DEFAULT_CHECKLIST_ITEMS: Readonly<Record<ChecklistAreaKind, readonly ChecklistItem[]>> = {
  charging_area: [
    { key: EYEWASH_ITEM_KEY, label: 'Eyewash flushed and reachable', hint: 'Activated weekly, reachable within 10 seconds (ANSI/ISEA Z358.1-2014).' },
    { key: 'spill_kit_neutralizer_stocked', label: 'Spill kit and neutralizer stocked', hint: 'Flushing and neutralizing spilled electrolyte (29 CFR 1910.178(g)(2)).' },
    { key: 'ppe_stocked', label: 'PPE stocked: goggles, face shield, acid-resistant gloves and apron', hint: '29 CFR 1910.133' },
    { key: 'ventilation_running', label: 'Ventilation running', hint: '29 CFR 1910.178(g)(2)' },
    { key: 'no_smoking_signs_posted', label: 'No-smoking signs up', hint: '29 CFR 1910.178(g)(10)' },
    { key: EXTINGUISHER_ITEM_KEY, label: 'Extinguisher present and charged', hint: 'Monthly visual check (29 CFR 1910.157(e)(2)).' },
    { key: CHARGER_ITEM_KEY, label: 'Chargers and cables undamaged', hint: 'Chargers protected from truck damage (29 CFR 1910.178(g)(2)).' },
    { key: 'no_combustibles_near_chargers', label: 'No combustibles near chargers' },
    { key: 'battery_handling_equipment_ok', label: 'Battery handling equipment in order', hint: 'Hoist, conveyor or equivalent (29 CFR 1910.178(g)(4)).' },
    { key: 'floor_clean_dry', label: 'Floor clean and dry' },
  ],
  fuel_station: [
    { key: 'cage_locked', label: 'Cage locked' },
    { key: 'cylinders_upright_relief_up', label: 'Cylinders upright with relief valve up', hint: 'Relief valve in the vapour space (NFPA 58).' },
    { key: 'no_leaks_or_odour', label: 'No leaks or gas odour' },
    { key: 'signage_posted', label: 'Signage posted: propane, no smoking' },
    { key: EXTINGUISHER_ITEM_KEY, label: 'Extinguisher present and charged', hint: 'Monthly visual check (29 CFR 1910.157(e)(2)).' },
    { key: 'no_ignition_sources', label: 'No ignition sources near the cage' },
  ],
}

export const DEFAULT_CHECKLIST_TITLES: Readonly<Record<ChecklistAreaKind, Record<ChecklistCadence, string>>> = {
  charging_area: { daily: 'Charging area — daily check', weekly: 'Charging area — weekly check' },
  fuel_station: { daily: 'Fuel station — daily check', weekly: 'Fuel station — weekly check' },
}

/** The cautions the checklist form shows for each area kind (product.md "Cautions shown in context"). */
export const AREA_LOG_CAUTIONS: Readonly<Record<ChecklistAreaKind, readonly string[]>> = {
  charging_area: [
    'Eyewash within reach before you touch a battery; flush for the full 15 minutes if electrolyte gets in an eye.',
    'PPE for electrolyte: goggles and face shield, acid-resistant gloves and apron.',
    'No smoking, flames or sparks in the charging area.',
  ],
  fuel_station: [
    'No smoking or ignition sources near the cage.',
    'Gloves and eye protection: liquid propane causes cold burns.',
    'Smell gas? Do not operate switches; leave the area and report it.',
  ],
}

export const CHECK_RESULTS = ['pass', 'fail', 'not_applicable'] as const
export type CheckResult = typeof CHECK_RESULTS[number]
export const CHECK_RESULT_LABELS: Readonly<Record<CheckResult, string>> = { pass: 'Pass', fail: 'Fail', not_applicable: 'N/A' }

/** The Monday that starts the ISO week of a date. */
export function weekStartOf(isoDate: string): string {
  const dow = new Date(`${isoDate}T00:00:00Z`).getUTCDay()
  return addCalendarInterval(isoDate, -((dow + 6) % 7), 'day')
}

/** The first day of the period a log covers: the day itself (daily) or its week's Monday (weekly). */
export function logPeriodStart(isoDate: string, cadence: ChecklistCadence): string {
  return cadence === 'weekly' ? weekStartOf(isoDate) : isoDate
}

/** Days in a date range, both ends included. */
export function daysInRange(from: string, to: string): number {
  return calendarDaysBetween(from, to) + 1
}

// A stable key for a new item from its label: lower case, words joined by underscores.
export function checklistItemKey(label: string, taken: ReadonlySet<string>): string {
  const stem = label.normalize('NFKD').toLowerCase().replace(/[^a-z0-9]+/g, '_').replace(/^_+|_+$/g, '').slice(0, 48) || 'item'
  let key = stem
  for (let n = 2; taken.has(key); n++) key = `${stem}_${n}`
  return key
}

const note = z.string().trim().max(1000).default('')

export const logEntriesSchema = z.object({
  siteId: z.uuid(),
  areaId: z.uuid({ error: 'Pick an area.' }),
  date: isoDateSchema,
  cadence: z.enum(['daily', 'weekly']).default('daily'),
  idempotencyKey: z.string().trim().min(8).max(100).optional(),
  entries: z.array(z.object({
    itemKey: z.string().trim().min(1).max(60),
    result: z.enum(CHECK_RESULTS, { error: 'Pass, fail or N/A.' }),
    note,
  }).superRefine((e, ctx) => {
    if (e.result === 'fail' && e.note.length < 3) ctx.addIssue({ code: 'custom', path: ['note'], message: 'Say what is wrong.' })
  })).min(1, 'Mark at least one item.').max(60),
})
export type LogEntriesInput = z.output<typeof logEntriesSchema>

export const logCorrectionSchema = z.object({
  result: z.enum(CHECK_RESULTS),
  note,
  reason: z.string().trim().min(5, 'Say why it is corrected (at least 5 characters).').max(500),
})

export const logSignSchema = z.object({
  siteId: z.uuid(),
  areaId: z.uuid({ error: 'Pick an area.' }),
  date: isoDateSchema,
  span: z.enum(['day', 'week']).default('day'),
  note: z.string().trim().max(500).default(''),
})

export const logViewQuerySchema = z.object({
  siteId: z.uuid(),
  areaId: z.uuid(),
  /** the site's today when left out */
  date: isoDateSchema.optional(),
  span: z.enum(['day', 'week']).default('day'),
  cadence: z.enum(['daily', 'weekly']).default('daily'),
})

export const logRangeQuerySchema = withDayRange(z.object({
  siteId: z.uuid(),
  areaId: z.uuid().optional(),
  from: isoDateSchema,
  to: isoDateSchema,
}))

export const templateSaveSchema = z.object({
  siteId: z.uuid(),
  areaKind: z.enum(['charging_area', 'fuel_station']),
  cadence: z.enum(['daily', 'weekly']),
  title: z.string().trim().min(3).max(120),
  items: z.array(z.object({
    key: z.string().trim().max(60).optional(),
    label: z.string().trim().min(3, 'Name the item.').max(200),
    hint: z.string().trim().max(300).optional(),
  })).min(1, 'Keep at least one item.').max(60),
})

export const followUpCloseSchema = z.object({
  note: z.string().trim().min(3, 'Say what was done.').max(1000),
})
