import { z } from 'zod'
import { isoDateSchema } from './iso-date'

// Pre-shift truck inspection: the default checklist per power type, the payloads of its routes, and the
// rule that says whether a truck stands on an inspection hold.
// 29 CFR 1910.178(q)(7): trucks are examined before being placed in service, at least daily (after each
// shift where they run round the clock); a truck found defective is taken out of service until repaired.
// Item wording is Bayward's own.

export const INSPECTION_GROUPS = ['key_off', 'key_on'] as const
export type InspectionGroup = typeof INSPECTION_GROUPS[number]
export const INSPECTION_GROUP_LABELS: Readonly<Record<InspectionGroup, string>> = {
  key_off: 'Key off — walk round',
  key_on: 'Key on — seat, controls and moving',
}

export const INSPECTION_POWERS = ['electric', 'lp_gas'] as const
export type InspectionPower = typeof INSPECTION_POWERS[number]

export const inspectionItemSchema = z.object({
  key: z.string().regex(/^[a-z][a-z0-9_]{1,59}$/, 'Lower-case letters, digits and _ only.'),
  label: z.string().trim().min(3).max(120),
  group: z.enum(INSPECTION_GROUPS),
  critical: z.boolean(),
  hint: z.string().trim().max(200).optional(),
})
export type InspectionItem = z.infer<typeof inspectionItemSchema>

const item = (group: InspectionGroup, key: string, label: string, critical: boolean, hint?: string): InspectionItem =>
  ({ key, label, group, critical, ...(hint ? { hint } : {}) })

const COMMON_KEY_OFF: InspectionItem[] = [
  item('key_off', 'leaks_under_truck', 'No hydraulic oil or fluid pooling under the truck', true),
  item('key_off', 'tyres_wheels', 'Tyres whole: no chunks out, no flat spots, wheel nuts on', true),
  item('key_off', 'forks_carriage', 'Forks straight and uncracked, locking pins in, carriage sound', true),
  item('key_off', 'mast_chains', 'Mast rails and lift chains: no cracks, kinks or missing links', true),
  item('key_off', 'overhead_guard', 'Overhead guard in place and undamaged', true),
  item('key_off', 'load_backrest', 'Load backrest fitted and undamaged', false),
  item('key_off', 'data_plate', 'Capacity and data plates on and readable', false, 'The plate says what the truck may lift (29 CFR 1910.178(a)(4)).'),
  item('key_off', 'extinguisher', 'Extinguisher where fitted: present, pinned, gauge in the green', false),
]

const ELECTRIC_KEY_OFF: InspectionItem[] = [
  item('key_off', 'battery_connector_cables', 'Battery plug and cables: no cracks, burns or bare copper', true),
  item('key_off', 'battery_restraint', 'Battery held down: restraint or gate in place', true),
  item('key_off', 'electrolyte_vent_caps', 'Vent caps on; electrolyte above the plates where you can see it', false),
  item('key_off', 'compartment_cover', 'Battery compartment cover closes and latches', false),
]

const LP_KEY_OFF: InspectionItem[] = [
  item('key_off', 'cylinder_secured', 'Cylinder strapped down in its bracket', true),
  item('key_off', 'cylinder_pin_aligned', 'Cylinder locating pin through its hole', true),
  item('key_off', 'relief_valve_up', 'Relief valve pointing up, in the vapour space', true, 'A horizontal cylinder is mounted so its relief valve sits in the vapour space (NFPA 58).'),
  item('key_off', 'hose_fittings', 'Fuel hose and fittings: no cracks, frost or wear', true),
  item('key_off', 'no_gas_smell', 'No smell of gas around the cylinder or engine', true),
]

const COMMON_KEY_ON: InspectionItem[] = [
  item('key_on', 'seat_belt', 'Seat belt latches and pulls out freely', true),
  item('key_on', 'horn', 'Horn sounds', true),
  item('key_on', 'lights', 'Headlights and warning lights work', false),
  item('key_on', 'travel_alarm', 'Reverse alarm or travel beeper sounds', false),
  item('key_on', 'steering', 'Steering turns smoothly without extra play', true),
  item('key_on', 'service_brake', 'Service brake stops the truck smoothly', true),
  item('key_on', 'parking_brake', 'Parking brake holds the truck', true),
  item('key_on', 'hydraulic_controls', 'Lift, lower and tilt work smoothly; no leaks at the cylinders', true),
  item('key_on', 'gauges', 'Hour meter and gauges read; no warning lamps left on', false),
]

export const DEFAULT_INSPECTION_ITEMS: Readonly<Record<InspectionPower, readonly InspectionItem[]>> = {
  electric: [...COMMON_KEY_OFF, ...ELECTRIC_KEY_OFF, ...COMMON_KEY_ON],
  lp_gas: [...COMMON_KEY_OFF, ...LP_KEY_OFF, ...COMMON_KEY_ON],
}

export const DEFAULT_INSPECTION_TITLES: Readonly<Record<InspectionPower, string>> = {
  electric: 'Electric truck — pre-shift check',
  lp_gas: 'LP-gas truck — pre-shift check',
}

/** Trucks of other powers (gasoline, diesel) use the LP list less its cylinder items. */
export function inspectionPowerOf(power: string): InspectionPower {
  return power === 'electric' ? 'electric' : 'lp_gas'
}

export const INSPECTION_RESULTS = ['pass', 'fail', 'not_applicable'] as const
export const inspectionAnswerSchema = z.object({
  key: z.string().min(1).max(60),
  result: z.enum(INSPECTION_RESULTS),
  note: z.string().trim().max(500).default(''),
  photoUploadId: z.string().uuid().nullish(),
})
export type InspectionAnswer = z.infer<typeof inspectionAnswerSchema>

export const inspectionBodySchema = z.object({
  idempotencyKey: z.string().min(8).max(100),
  /** when Save was pressed, for a record sent late */
  at: z.string().datetime({ offset: true }).optional(),
  hourMeter: z.number().min(0).max(1_000_000),
  templateVersion: z.number().int().min(1),
  answers: z.array(inspectionAnswerSchema).min(1).max(80),
  note: z.string().trim().max(500).default(''),
}).superRefine((b, ctx) => {
  b.answers.forEach((a, i) => {
    if (a.result === 'fail' && a.note.length < 3) ctx.addIssue({ code: 'custom', path: ['answers', i, 'note'], message: 'Say what is wrong.' })
  })
})

export const returnToServiceSchema = z.object({
  whatWasDone: z.string().trim().min(5, 'Say what was done to put it right.').max(1000),
})

export const RETRAINING_REASONS = ['incident', 'near_miss', 'new_truck_type', 'unsafe_operation', 'failed_evaluation'] as const
export type RetrainingReason = typeof RETRAINING_REASONS[number]
export const RETRAINING_REASON_LABELS: Readonly<Record<RetrainingReason, string>> = {
  incident: 'Involved in an incident',
  near_miss: 'Involved in a near miss',
  new_truck_type: 'Assigned a different type of truck',
  unsafe_operation: 'Seen driving unsafely',
  failed_evaluation: 'Evaluation showed the truck is not driven safely',
}

// 29 CFR 1910.178(l)(4)(ii): refresher training and evaluation follow these events.
export const retrainingSchema = z.object({
  reason: z.enum(RETRAINING_REASONS),
  truckClass: z.number().int().min(1).max(7).nullish(),
  happenedOn: isoDateSchema,
  note: z.string().trim().max(500).default(''),
})

export const inspectionTemplateSaveSchema = z.object({
  power: z.enum(INSPECTION_POWERS),
  title: z.string().trim().min(3).max(120),
  items: z.array(inspectionItemSchema).min(1).max(60)
    .refine(items => new Set(items.map(i => i.key)).size === items.length, 'Each item needs its own key.'),
})

/** The hold an inspection record places: the critical items it failed, in words. */
export function criticalFailures(items: readonly InspectionItem[], answers: readonly InspectionAnswer[]): InspectionItem[] {
  const failed = new Set(answers.filter(a => a.result === 'fail').map(a => a.key))
  return items.filter(i => i.critical && failed.has(i.key))
}

export interface InspectionFact {
  id: string
  at: Date
  userId: string
  userName: string
  /** the critical items failed, in words; empty when none */
  criticalFailed: string[]
}

export interface HoldFact {
  inspectionId: string
  since: Date
  byUserId: string
  reason: string
}

/**
 * A truck stands on an inspection hold from its latest inspection with a failed critical item until a
 * return to service recorded after it (29 CFR 1910.178(q)(7): out of service until repaired).
 */
export function inspectionHold(inspections: readonly InspectionFact[], lastReturnAt: Date | null): HoldFact | null {
  const failing = inspections.filter(i => i.criticalFailed.length > 0 && (!lastReturnAt || i.at > lastReturnAt))
  const first = failing.sort((a, b) => a.at.getTime() - b.at.getTime())[0]
  if (!first) return null
  return { inspectionId: first.id, since: first.at, byUserId: first.userId, reason: `Failed its pre-shift check (${first.userName}): ${first.criticalFailed.join('; ')}` }
}

/** The parts of a hold reason worded by inspectionHold (who checked, the failed items), to say it in another language; null for other words. */
export function holdReasonParts(reason: string): { name: string, items: string[] } | null {
  const m = /^Failed its pre-shift check \((.*?)\): (.*)$/s.exec(reason)
  return m ? { name: m[1]!, items: m[2]!.split('; ') } : null
}

/** "Truck 14 is out of service since …: reason. A technician or lead returns it to service." */
export function holdRefusal(fleetNumber: string, reason: string): string {
  return `Truck ${fleetNumber} is out of service after its inspection. ${reason}. A technician or lead returns it to service once it is put right.`
}
