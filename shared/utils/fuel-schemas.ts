import { z } from 'zod'
import { PREFILL_INSPECTION_ITEMS } from './lp-gas'
import { REQUAL_METHODS } from './asset-schemas'
import { eventTimeField } from './battery-room-schemas'

// Payloads of the fuel-station routes, shared by the forms and the routes. Weights in lb (forms
// convert metric input before sending), dates 'YYYY-MM-DD'.

const isoDate = z.string({ error: 'Enter a date.' })
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2026-03-31.')
  .refine(s => !Number.isNaN(Date.parse(s)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s), 'Not a real date.')
const weight = (label: string) => z.number({ error: `${label} must be a number.` }).min(0, `${label} cannot be below 0.`).max(2000, `${label} above 2,000 lb looks wrong.`)
const idempotencyKey = z.string().trim().min(8, 'Idempotency key too short.').max(100).optional()
const note = z.string().trim().max(1000, 'At most 1,000 characters.').default('')
const inspectionShape = Object.fromEntries(
  PREFILL_INSPECTION_ITEMS.map(item => [item.key, z.enum(['pass', 'fail'], { error: `Mark "${item.label}" pass or fail.` })]),
) as Record<(typeof PREFILL_INSPECTION_ITEMS)[number]['key'], z.ZodEnum<{ pass: 'pass', fail: 'fail' }>>

export const prefillInspectionSchema = z.object(inspectionShape, { error: 'Go through the pre-fill inspection.' })

// The weights may be left out when an inspection item failed (the fill stops before the scale).
export const refillSchema = z.object({
  inspection: prefillInspectionSchema,
  grossBeforeLb: weight('Weight before filling').nullable().default(null),
  grossAfterLb: weight('Weight after filling').nullable().default(null),
  measuredTareLb: weight('Measured tare').nullable().default(null),
  productSg: z.number({ error: 'Specific gravity must be a number.' }).min(0.4, 'Specific gravity between 0.400 and 0.700.').max(0.7, 'Specific gravity between 0.400 and 0.700.').nullable().default(null),
  at: eventTimeField,
  idempotencyKey,
  note,
}).superRefine((v, ctx) => {
  const allPass = Object.values(v.inspection).every(r => r === 'pass')
  if (!allPass) return
  if (v.grossBeforeLb === null) ctx.addIssue({ code: 'custom', path: ['grossBeforeLb'], message: 'Weigh the cylinder before filling.' })
  if (v.grossAfterLb === null) ctx.addIssue({ code: 'custom', path: ['grossAfterLb'], message: 'Weigh the cylinder after filling.' })
})
export type RefillInput = z.infer<typeof refillSchema>

export const quarantineSchema = z.object({
  reason: z.string({ error: 'Say why.' }).trim().min(3, 'Say why the cylinder is quarantined.').max(500),
})

export const exchangeSchema = z.object({
  /** The cylinder going on the truck: its id or its tag code / serial. */
  cylinderOnId: z.uuid('Pick the cylinder going on.').optional(),
  cylinderOnCode: z.string().trim().min(1).max(60).optional(),
  /** The cylinder coming off; must be the truck's current one. Null when the truck has none. */
  cylinderOffId: z.uuid().nullable().default(null),
  /** The truck's hour meter at the change; optional, so records kept on a device before it was asked still go in. */
  hourMeter: z.number({ error: 'Hour meter must be a number.' }).min(0, 'Not below 0.').max(200000, 'Above 200,000 h looks wrong.').nullable().default(null),
  at: eventTimeField,
  idempotencyKey,
  note,
}).refine(v => v.cylinderOnId || v.cylinderOnCode, { path: ['cylinderOnCode'], message: 'Scan or type the cylinder going on.' })
export type ExchangeInput = z.infer<typeof exchangeSchema>

export const requalificationSchema = z.object({
  performedOn: isoDate,
  method: z.enum(REQUAL_METHODS, { error: 'Pick the requalification method.' }),
  marking: z.string().trim().max(40, 'At most 40 characters.').default(''),
  passed: z.boolean({ error: 'Passed or condemned?' }),
  note,
})
export type RequalificationInput = z.infer<typeof requalificationSchema>

const percent = (label: string) => z.number({ error: `${label} must be a number.` }).min(0, `${label} is 0–100 %.`).max(100, `${label} is 0–100 %.`)
const optionalNumber = (label: string, max: number) => z.number({ error: `${label} must be a number.` }).min(0, `${label} cannot be below 0.`).max(max, `${label} above ${max} looks wrong.`).nullable().default(null)

export const emissionsTestSchema = z.object({
  testedOn: isoDate,
  testerName: z.string({ error: 'Who tested?' }).trim().min(2, 'Name who tested.').max(120),
  coIdlePct: percent('CO at idle'),
  coHighIdlePct: percent('CO at high idle'),
  hcPpm: optionalNumber('HC', 100000),
  co2Pct: percent('CO2').nullable().default(null),
  o2Pct: percent('O2').nullable().default(null),
  idleRpm: optionalNumber('Idle rpm', 10000),
  highIdleRpm: optionalNumber('High-idle rpm', 10000),
  certificateUploadId: z.uuid('Upload the certificate again.').nullable().default(null),
  note,
})
export type EmissionsTestInput = z.infer<typeof emissionsTestSchema>

export const coReadingsSchema = z.object({
  siteId: z.uuid('Pick a site.'),
  areaId: z.uuid('Pick an area.'),
  takenOn: isoDate,
  readings: z.array(z.object({
    ppm: z.number({ error: 'CO must be a number.' }).min(0, 'CO cannot be below 0 ppm.').max(20000, 'Above 20,000 ppm looks wrong.'),
    durationHours: z.number({ error: 'Hours must be a number.' }).gt(0, 'Longer than 0 h.').max(24, 'At most 24 h.'),
  }), { error: 'Add the readings.' }).min(1, 'Add at least one reading.').max(48, 'At most 48 readings a day.'),
  note,
}).refine(v => v.readings.reduce((s, r) => s + r.durationHours, 0) <= 24, { path: ['readings'], message: 'The readings add up to more than 24 hours.' })
export type CoReadingsInput = z.infer<typeof coReadingsSchema>

export const fuelSiteQuerySchema = z.object({ siteId: z.uuid('Pick a site.') })
export const cylinderLookupQuerySchema = z.object({
  siteId: z.uuid('Pick a site.'),
  code: z.string({ error: 'Scan or type a cylinder code.' }).trim().min(1, 'Scan or type a cylinder code.').max(60),
})
export const coQuerySchema = z.object({
  siteId: z.uuid('Pick a site.'),
  areaId: z.uuid().optional(),
  days: z.coerce.number().int().min(1).max(366).default(30),
})
