import { z } from 'zod'
import { CHARGE_OUTCOMES, ELECTROLYTE_LEVELS, READING_SCOPES, cellReadingSchema } from './battery-room-schemas'
import { REQUAL_METHODS } from './asset-schemas'
import { emissionsTestSchema } from './fuel-schemas'
import type { Ability } from './abilities'

// Payloads of the correction routes, shared by the "Correct this" forms and the routes. A correction is a
// new record that stands in place of the one it names, with the reason; it keeps the record's time, so a
// time sent with it is refused.

/** The records that take corrections, in the words the routes and the history use. */
export const CORRECTABLE_KINDS = [
  'battery-swap', 'charge-session', 'electrolyte-check', 'cylinder-refill',
  'cylinder-exchange', 'requalification', 'emissions-test', 'co-reading',
] as const
export type CorrectableKind = typeof CORRECTABLE_KINDS[number]

export const CORRECTABLE_LABELS: Record<CorrectableKind, string> = {
  'battery-swap': 'battery change',
  'charge-session': 'charge',
  'electrolyte-check': 'electrolyte check',
  'cylinder-refill': 'cylinder refill',
  'cylinder-exchange': 'cylinder change',
  'requalification': 'requalification',
  'emissions-test': 'emissions test',
  'co-reading': 'CO reading',
}

/** Where each kind's corrections are posted (`<path>/<id>/corrections`). */
export const CORRECTION_PATHS: Record<CorrectableKind, string> = {
  'battery-swap': '/api/battery-room/swaps',
  'charge-session': '/api/battery-room/charges',
  'electrolyte-check': '/api/battery-room/checks',
  'cylinder-refill': '/api/fuel/refills',
  'cylinder-exchange': '/api/fuel/cylinder-exchanges',
  'requalification': '/api/fuel/requalifications',
  'emissions-test': '/api/fuel/emissions-tests',
  'co-reading': '/api/fuel/co-readings',
}

/** Who corrects each kind: whoever may record it (within the site's correction window; later, leads). */
export const CORRECTION_ABILITIES = {
  'battery-swap': 'swap.record',
  'charge-session': 'charge.record',
  'electrolyte-check': 'reading.record',
  'cylinder-refill': 'refill.record',
  'cylinder-exchange': 'cylinder.exchange',
  'requalification': 'cylinder.requalify',
  'emissions-test': 'emissions.record',
  'co-reading': 'co.record',
} as const satisfies Record<CorrectableKind, Ability>

export const CORRECTION_REASON_MIN_LENGTH = 5
const keepsTime = z.never({ error: 'A correction keeps the record\'s time. Record a new entry if it happened at another time.' }).optional()
const note = z.string().trim().max(1000, 'At most 1,000 characters.').default('')

/** What every correction carries: why, a retry key, and no new time. */
const base = {
  reason: z.string({ error: 'Say why it is corrected.' }).trim()
    .min(CORRECTION_REASON_MIN_LENGTH, `Say why it is corrected (at least ${CORRECTION_REASON_MIN_LENGTH} characters).`).max(500, 'At most 500 characters.'),
  idempotencyKey: z.uuid('A retry key from the form is missing.'),
  note,
  at: keepsTime,
}
const hourMeter = z.number({ error: 'Hour meter must be a number.' }).min(0, 'Not below 0.').max(200000, 'Above 200,000 h looks wrong.')
const weight = (label: string) => z.number({ error: `${label} must be a number.` }).min(0, `${label} cannot be below 0.`).max(2000, `${label} above 2,000 lb looks wrong.`).nullable()

export const swapCorrectionSchema = z.object({
  ...base,
  truckId: z.uuid('Pick the truck.'),
  batteryOutId: z.uuid('Pick the battery coming out.').nullable().default(null),
  batteryInId: z.uuid('Pick the battery going in.'),
  hourMeter,
}).refine(v => v.batteryOutId !== v.batteryInId, { path: ['batteryInId'], message: 'The battery going in is the one coming out.' })

export const chargeCorrectionSchema = z.object({
  ...base,
  endedAt: keepsTime,
  ampHoursReturned: z.number({ error: 'Amp-hours must be a number.' }).min(0, 'Not below 0.').max(5000, 'Above 5,000 Ah looks wrong.'),
  endTempF: z.number({ error: 'Temperature must be a number.' }).min(0, 'Below 0 °F looks wrong.').max(200, 'Above 200 °F looks wrong.'),
  equalize: z.boolean().default(false),
  outcome: z.enum(CHARGE_OUTCOMES, { error: 'Complete or interrupted?' }),
})

export const electrolyteCorrectionSchema = z.object({
  ...base,
  level: z.enum(ELECTROLYTE_LEVELS, { error: 'Pick the electrolyte level.' }),
  waterAddedGal: z.number({ error: 'Water added must be a number.' }).min(0, 'Not below 0.').max(20, 'Above 20 gal looks wrong.').default(0),
  /** Left out together with `cells`: the readings stay as recorded. */
  scope: z.enum(READING_SCOPES).nullable().optional(),
  cells: z.array(cellReadingSchema).max(60).optional(),
}).superRefine((v, ctx) => {
  if (v.cells === undefined) return
  if (!v.scope && v.cells.length) ctx.addIssue({ code: 'custom', path: ['scope'], message: 'Say whether these are the pilot cell or every cell.' })
  if (v.scope === 'pilot_cell' && v.cells.length !== 1) ctx.addIssue({ code: 'custom', path: ['cells'], message: 'A pilot-cell reading is one cell.' })
  if (v.scope === 'every_cell' && v.cells.length === 0) ctx.addIssue({ code: 'custom', path: ['cells'], message: 'Enter a reading for every cell.' })
  if (new Set(v.cells.map(c => c.cellNumber)).size !== v.cells.length) ctx.addIssue({ code: 'custom', path: ['cells'], message: 'A cell is entered twice.' })
})

export const refillCorrectionSchema = z.object({
  ...base,
  grossBeforeLb: weight('Weight before filling'),
  grossAfterLb: weight('Weight after filling'),
  measuredTareLb: weight('Measured tare').default(null),
  productSg: z.number({ error: 'Specific gravity must be a number.' }).min(0.4, 'Specific gravity between 0.400 and 0.700.').max(0.7, 'Specific gravity between 0.400 and 0.700.').nullable().default(null),
})

export const exchangeCorrectionSchema = z.object({
  ...base,
  cylinderOnId: z.uuid('Pick the cylinder that went on.'),
  hourMeter: hourMeter.nullable().default(null),
})

export const requalificationCorrectionSchema = z.object({
  ...base,
  performedOn: keepsTime,
  method: z.enum(REQUAL_METHODS, { error: 'Pick the requalification method.' }),
  marking: z.string().trim().max(40, 'At most 40 characters.').default(''),
  /** Sent back as recorded; a different value is refused (pass or fail is not corrected). */
  passed: z.boolean().optional(),
})

export const emissionsCorrectionSchema = emissionsTestSchema.omit({ testedOn: true, note: true }).extend({ ...base, testedOn: keepsTime })

export const coReadingCorrectionSchema = z.object({
  ...base,
  takenOn: keepsTime,
  ppm: z.number({ error: 'CO must be a number.' }).min(0, 'CO cannot be below 0 ppm.').max(20000, 'Above 20,000 ppm looks wrong.'),
  durationHours: z.number({ error: 'Hours must be a number.' }).gt(0, 'Longer than 0 h.').max(24, 'At most 24 h.'),
})

export type SwapCorrection = z.output<typeof swapCorrectionSchema>
export type ChargeCorrection = z.output<typeof chargeCorrectionSchema>
export type ElectrolyteCorrection = z.output<typeof electrolyteCorrectionSchema>
export type RefillCorrection = z.output<typeof refillCorrectionSchema>
export type ExchangeCorrection = z.output<typeof exchangeCorrectionSchema>
export type RequalificationCorrection = z.output<typeof requalificationCorrectionSchema>
export type EmissionsCorrection = z.output<typeof emissionsCorrectionSchema>
export type CoReadingCorrection = z.output<typeof coReadingCorrectionSchema>
