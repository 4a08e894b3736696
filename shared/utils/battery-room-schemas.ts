import { z } from 'zod'
import { isoDateSchema, withDayRange } from './iso-date'
import { cellSpread, correctedSpecificGravity, stateOfChargeFromSpecificGravity, type SpecificGravityPolicy } from './specific-gravity'

// Payloads of the battery-room routes, shared by the floor forms and the server.

/** Shortest written reason a technician or lead gives to override a refused check. */
export const OVERRIDE_REASON_MIN_LENGTH = 10
/** How far back a record sent late from the floor may be dated, hours. */
export const BACKDATE_LIMIT_HOURS = 24
/** A charge "has just finished" for watering when it ended this recently and the battery has rested since (Bayward's choice). */
export const WATERING_AFTER_CHARGE_HOURS = 12
export const ELECTROLYTE_LEVELS = ['low', 'ok', 'high'] as const
export const READING_SCOPES = ['pilot_cell', 'every_cell'] as const
export const CHARGE_OUTCOMES = ['complete', 'interrupted'] as const

export const ELECTROLYTE_LEVEL_LABELS: Record<typeof ELECTROLYTE_LEVELS[number], string> = {
  low: 'Low', ok: 'OK', high: 'High',
}

/** Battery-care guides: water after charging, not before, unless plates are exposed; then just enough to cover them. */
export const WATER_AFTER_CHARGE_CAUTION = 'Water after charging, not before, unless plates are exposed; then add just enough to cover them.'

const uuid = (what: string) => z.uuid(`Pick the ${what}.`)
const idempotencyKey = z.uuid('A retry key from the form is missing.')
/** A floor record's time as the device saw it (sent by the outbox for records kept while offline). */
export const eventTimeField = z.iso.datetime({ offset: true, message: 'Use a date and time like 2026-03-31T06:00:00Z.' }).optional()
const overrideReason = z.string().trim().max(1000, 'At most 1,000 characters.').optional()
  .refine(v => v === undefined || v === '' || v.length >= OVERRIDE_REASON_MIN_LENGTH, `Write the reason in at least ${OVERRIDE_REASON_MIN_LENGTH} characters.`)
  .transform(v => (v ? v : undefined))

export const swapBodySchema = z.object({
  truckId: uuid('truck'),
  batteryOutId: uuid('battery coming out').nullable().default(null),
  batteryInId: uuid('battery going in'),
  hourMeter: z.number({ error: 'Hour meter must be a number.' }).min(0, 'Not below 0.').max(200000, 'Above 200,000 h looks wrong.'),
  overrideReason,
  idempotencyKey,
  at: eventTimeField,
  note: z.string().trim().max(1000).default(''),
}).refine(v => v.batteryOutId !== v.batteryInId, { path: ['batteryInId'], message: 'The battery going in is the one coming out.' })
export type SwapBody = z.input<typeof swapBodySchema>

export const chargeStartSchema = z.object({
  batteryId: uuid('battery'),
  chargerId: uuid('charger'),
  overrideReason,
  idempotencyKey,
  at: eventTimeField,
  note: z.string().trim().max(1000).default(''),
})

export const chargeEndSchema = z.object({
  ampHoursReturned: z.number({ error: 'Amp-hours must be a number.' }).min(0, 'Not below 0.').max(5000, 'Above 5,000 Ah looks wrong.'),
  endTempF: z.number({ error: 'Temperature must be a number.' }).min(0, 'Below 0 °F looks wrong.').max(200, 'Above 200 °F looks wrong.'),
  equalize: z.boolean().default(false),
  outcome: z.enum(CHARGE_OUTCOMES, { error: 'Complete or interrupted?' }),
  /** A lithium-ion pack's state of charge, %, as its display shows it (no hydrometer on sealed cells). */
  packStateOfChargePct: z.number({ error: 'State of charge must be a number.' }).min(0, 'State of charge is 0–100 %.').max(100, 'State of charge is 0–100 %.').nullable().default(null),
  /** Carried for the device outbox; a charge ends once, so a repeat is recognised by the same user and readings. */
  idempotencyKey: idempotencyKey.optional(),
  endedAt: eventTimeField,
  note: z.string().trim().max(1000).default(''),
})

export const cellReadingSchema = z.object({
  cellNumber: z.number().int().min(1, 'Cells count from 1.').max(60),
  specificGravity: z.number({ error: 'Specific gravity must be a number.' }).min(1, 'Specific gravity 1.000–1.400.').max(1.4, 'Specific gravity 1.000–1.400.'),
  temperatureF: z.number({ error: 'Temperature must be a number.' }).min(-20, 'Below −20 °F looks wrong.').max(160, 'Above 160 °F looks wrong.'),
})

export const electrolyteCheckSchema = z.object({
  batteryId: uuid('battery'),
  level: z.enum(ELECTROLYTE_LEVELS, { error: 'Pick the electrolyte level.' }),
  waterAddedGal: z.number({ error: 'Water added must be a number.' }).min(0, 'Not below 0.').max(20, 'Above 20 gal looks wrong.').default(0),
  scope: z.enum(READING_SCOPES).nullable().default(null),
  cells: z.array(cellReadingSchema).max(60).default([]),
  idempotencyKey,
  at: eventTimeField,
  note: z.string().trim().max(1000).default(''),
}).superRefine((v, ctx) => {
  if (v.scope === null && v.cells.length) ctx.addIssue({ code: 'custom', path: ['scope'], message: 'Say whether these are the pilot cell or every cell.' })
  if (v.scope === 'pilot_cell' && v.cells.length !== 1) ctx.addIssue({ code: 'custom', path: ['cells'], message: 'A pilot-cell reading is one cell.' })
  if (v.scope === 'every_cell' && v.cells.length === 0) ctx.addIssue({ code: 'custom', path: ['cells'], message: 'Enter a reading for every cell.' })
  const seen = new Set<number>()
  v.cells.forEach((c, i) => {
    if (seen.has(c.cellNumber)) ctx.addIssue({ code: 'custom', path: ['cells', i, 'cellNumber'], message: `Cell ${c.cellNumber} is entered twice.` })
    seen.add(c.cellNumber)
  })
})

export const boardQuerySchema = z.object({
  siteId: z.uuid('Pick a site.'),
  areaId: z.uuid('Pick a charging area.').optional(),
  truckId: z.uuid('Pick a truck.').optional(),
})

export const lookupQuerySchema = z.object({
  siteId: z.uuid('Pick a site.'),
  code: z.string().trim().min(1, 'Scan or type a code.').max(60),
})

export const siteQuerySchema = z.object({ siteId: z.uuid('Pick a site.') })

/** The overrides page: a site and, optionally, a range of the site's days (the last 90 days unless given). */
export const overridesQuerySchema = withDayRange(z.object({
  siteId: z.uuid('Pick a site.'),
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
}))

/** One cell as entered and corrected to the reference temperature. */
export interface CorrectedCell {
  cellNumber: number
  specificGravity: number
  temperatureF: number
  correctedSg: number
  low: boolean
}

export interface ElectrolyteReadingSummary {
  cells: CorrectedCell[]
  meanCorrectedSg: number | null
  /** Highest minus lowest corrected reading; null for fewer than two cells. */
  spread: number | null
  lowCells: number[]
  stateOfChargePct: number | null
}

/** Corrects each reading, then the mean, spread, low cells and state of charge, as the form previews and the server stores. */
export function summarizeElectrolyteReadings(
  readings: ReadonlyArray<{ cellNumber: number, specificGravity: number, temperatureF: number }>,
  policy: SpecificGravityPolicy,
  lowCellThreshold: number,
): ElectrolyteReadingSummary {
  const ordered = [...readings].sort((a, b) => a.cellNumber - b.cellNumber)
  const corrected = ordered.map(r => correctedSpecificGravity(r.specificGravity, r.temperatureF, policy))
  const stats = cellSpread(corrected, lowCellThreshold)
  const lowCells = ordered.length > 1 && stats ? stats.lowCells.map(i => ordered[i - 1]!.cellNumber) : []
  return {
    cells: ordered.map((r, i) => ({ ...r, correctedSg: corrected[i]!, low: lowCells.includes(r.cellNumber) })),
    meanCorrectedSg: stats ? stats.mean : null,
    spread: stats && ordered.length > 1 ? stats.spread : null,
    lowCells,
    stateOfChargePct: stats ? stateOfChargeFromSpecificGravity(stats.mean) : null,
  }
}

export interface WateringTimingFacts {
  waterAddedGal: number
  chargeOpen: boolean
  lastChargeEndedAt: Date | null
  /** When the battery last went into a truck, or null. */
  lastInstalledAt: Date | null
}

/** True when a charge ended within the window and the battery has not been on charge or in a truck since. */
export function justFinishedCharge(facts: Omit<WateringTimingFacts, 'waterAddedGal'>, now: Date, windowHours = WATERING_AFTER_CHARGE_HOURS): boolean {
  const ended = facts.lastChargeEndedAt
  if (facts.chargeOpen || ended === null) return false
  if (facts.lastInstalledAt !== null && facts.lastInstalledAt.getTime() > ended.getTime()) return false
  const age = now.getTime() - ended.getTime()
  return age >= 0 && age <= windowHours * 3_600_000
}

/** Whether logging water now calls for the "water after charging, not before" caution. */
export function wateringBeforeChargeCaution(facts: WateringTimingFacts, now: Date, windowHours = WATERING_AFTER_CHARGE_HOURS): boolean {
  return facts.waterAddedGal > 0 && !justFinishedCharge(facts, now, windowHours)
}
