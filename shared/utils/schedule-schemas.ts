import { z } from 'zod'
import { ROLES } from '../types/auth'
import { CUSTOM_SUBJECT_KINDS, DUE_KINDS, DUE_PAGE_SIZE, DUE_SORTS, INTERVAL_UNITS, OBLIGATION_STATES } from './due-schedules'

// The payloads of the due list, the Schedules page and "Record it done", shared by the forms and the routes.

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

export const dueQuerySchema = z.object({
  siteId: z.uuid({ error: 'Pick a site.' }),
  role: z.enum([...ROLES, 'all']).optional(),
  state: csv(OBLIGATION_STATES),
  kind: csv(DUE_KINDS),
  /** one lead-added schedule's obligations (a group of the due page) */
  schedule: z.uuid({ error: 'No such schedule.' }).optional(),
  sort: z.enum(DUE_SORTS).default('due'),
  /** 0: the counts and groups only (the due page's summary) */
  limit: z.coerce.number().int().min(0).max(20_000).default(DUE_PAGE_SIZE),
})
export type DueQuery = z.output<typeof dueQuerySchema>

export const scheduleUpdateSchema = z.object({
  siteId: z.uuid(),
  title: z.string().trim().min(3).max(120).optional(),
  every: z.number().int().min(1).max(1000).nullable().optional(),
  everyUnit: z.enum(INTERVAL_UNITS).nullable().optional(),
  withinDays: z.number().int().min(1).max(365).nullable().optional(),
  afterFailDays: z.number().int().min(1).max(365).nullable().optional(),
  dueSoonDays: z.number().int().min(0).max(365).optional(),
  responsibleRole: z.enum(ROLES).optional(),
  source: z.string().trim().max(300).optional(),
  active: z.boolean().optional(),
})
export type ScheduleUpdate = z.output<typeof scheduleUpdateSchema>

/** How a lead-added schedule counts: calendar units, or charges (batteries) or hours of use (trucks). */
export const CUSTOM_INTERVAL_UNITS = [...INTERVAL_UNITS, 'charges', 'hours'] as const
export type CustomIntervalUnit = typeof CUSTOM_INTERVAL_UNITS[number]

const customFields = {
  title: z.string().trim().min(3, 'At least 3 characters.').max(120, 'At most 120 characters.'),
  subjectKind: z.enum(CUSTOM_SUBJECT_KINDS, { error: 'Pick what it is about.' }),
  every: z.number({ error: 'A whole number from 1 to 100,000.' }).int('A whole number.').min(1, 'At least 1.').max(100_000, 'At most 100,000.'),
  unit: z.enum(CUSTOM_INTERVAL_UNITS, { error: 'Pick a unit.' }),
  dueSoonDays: z.number({ error: 'A whole number of days.' }).int().min(0, 'Not below 0.').max(365, 'At most 365.'),
  responsibleRole: z.enum(ROLES, { error: 'Pick a role.' }),
  source: z.string().trim().max(300, 'At most 300 characters.').default(''),
}

// Charges are counted on batteries and hours on trucks' hour meters; nothing else has either count.
function unitFitsSubject(v: { unit?: CustomIntervalUnit, subjectKind?: string }, ctx: z.RefinementCtx) {
  if (v.unit === 'charges' && v.subjectKind !== 'battery') ctx.addIssue({ code: 'custom', path: ['unit'], message: 'Only batteries count charges.' })
  if (v.unit === 'hours' && v.subjectKind !== 'truck') ctx.addIssue({ code: 'custom', path: ['unit'], message: 'Only trucks have an hour meter.' })
}

export const scheduleCreateSchema = z.object({ siteId: z.uuid('Pick a site.'), ...customFields }).superRefine(unitFitsSubject)
export type ScheduleCreate = z.output<typeof scheduleCreateSchema>

/** A lead-added schedule's edit: its subject kind stays what it was. */
export const customScheduleUpdateSchema = z.object({
  siteId: z.uuid(),
  title: customFields.title.optional(),
  every: customFields.every.optional(),
  unit: customFields.unit.optional(),
  dueSoonDays: customFields.dueSoonDays.optional(),
  responsibleRole: customFields.responsibleRole.optional(),
  source: z.string().trim().max(300).optional(),
  active: z.boolean().optional(),
})

/** "Record it done": the day it was done, a note, an optional certificate and (trucks) the hour meter then. */
export const completionSchema = z.object({
  subjectId: z.uuid('Pick what was done.'),
  doneOn: z.iso.date('A date as YYYY-MM-DD.'),
  note: z.string().trim().max(2000, 'At most 2,000 characters.').default(''),
  certificateUploadId: z.uuid().nullable().default(null),
  hourMeter: z.number({ error: 'Hour meter must be a number.' }).min(0, 'Not below 0.').max(200_000, 'Above 200,000 h looks wrong.').nullable().default(null),
  idempotencyKey: z.uuid().optional(),
})
export type CompletionInput = z.output<typeof completionSchema>

/** The interval columns of a schedule row from a lead's "every N <unit>". */
export function customRuleColumns(every: number, unit: CustomIntervalUnit) {
  if (unit === 'charges' || unit === 'hours') return { rule: unit, every, everyUnit: null }
  return { rule: 'days' as const, every, everyUnit: unit }
}
