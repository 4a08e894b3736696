import { z } from 'zod'
import { peakPeriodsSchema } from './tariff'

// Site policy: the thresholds the battery room and fuel station apply. Intervals are not here: every
// interval (watering, equalize, inspections, emissions, follow-ups) is a schedule on the Schedules page.
// Defaults carry their source (see DEVELOPERS.md, "Where the numbers come from").
export const siteSettingsSchema = z.object({
  /** 8 h work / 8 h charge / 8 h cool (common practice). */
  coolDownMinutes: z.number().int().min(0).max(24 * 60).default(480),
  /** Specific-gravity reference temperature, °F (US Army TM 5-1185 tables are referenced to 80 °F). */
  sgReferenceTempF: z.number().min(40).max(100).default(80),
  /** Specific-gravity correction per °F (0.004 per 10 °F, published in several battery manuals). */
  sgCorrectionPerDegF: z.number().min(0).max(0.01).default(0.0004),
  /** A cell this far below the battery's mean is flagged weak (0.020, common practice). */
  cellSpreadThreshold: z.number().min(0.005).max(0.1).default(0.02),
  /** Highest electrolyte temperature at the end of a charge, °F (110–115 °F, from memory). */
  maxChargeTempF: z.number().min(80).max(140).default(115),
  /** What a swap does without a current battery-changing qualification. */
  qualificationPolicy: z.enum(['warn', 'block']).default('warn'),
  /** The electricity price per kWh; with peak windows set, the off-peak price. */
  tariffPerKwh: z.number().min(0).max(10).default(0.12),
  /** Time-of-use: the site-local windows billed at peakPerKwh (none: one tariff). See shared/utils/tariff.ts. */
  peakPeriods: peakPeriodsSchema.default([]),
  peakPerKwh: z.number().min(0).max(10).default(0),
  currency: z.string().length(3).default('USD'),
  /** What a US gallon of propane costs the site (0: not entered; the propane report then shows no cost). */
  propanePerGal: z.number().min(0).max(100).default(0),
  fullCylinderReorderAt: z.number().int().min(0).max(1000).default(6),
  /** Minnesota Rules 5205.0116: CO at idle and high idle at most 1 % (LP-gas) and 2 % (gasoline). */
  emissionsMaxCoPctLp: z.number().min(0).max(10).default(1),
  emissionsMaxCoPctGasoline: z.number().min(0).max(10).default(2),
  /** NIOSH REL for carbon monoxide, 35 ppm 8-h TWA. */
  coSiteLimitPpm: z.number().min(1).max(50).default(35),
  /** 49 CFR 180.209: years to the next requalification by method. */
  requalYearsWaterJacket: z.number().int().min(1).max(12).default(12),
  requalYearsProofPressure: z.number().int().min(1).max(12).default(7),
  requalYearsExternalVisual: z.number().int().min(1).max(12).default(5),
  /** Site-local hour (0–23) the daily due-list digest goes to each lead (site policy). */
  digestHour: z.number().int().min(0).max(23).default(6),
  /** Days after a record in which whoever may record it may correct it; later only leads (site policy). */
  correctionWindowDays: z.number().int().min(0).max(366).default(7),
  /** Site-local times each shift begins; a truck in use is due its pre-shift check after each (29 CFR 1910.178(q)(7)). */
  shiftStarts: z.array(z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'A time as HH:MM.')).min(1).max(6).default(['06:00', '14:00', '22:00']),
  /** What inspecting or taking a truck does when the operator holds no current evaluation on its class (1910.178(l)). */
  truckAuthorisationPolicy: z.enum(['warn', 'block']).default('warn'),
})

export type SiteSettings = z.infer<typeof siteSettingsSchema>

export const defaultSiteSettings = (): SiteSettings => siteSettingsSchema.parse({})

/** Stored settings with defaults filled in; a stored value that no longer parses falls back to its default. */
export function parseSiteSettings(stored: unknown): SiteSettings {
  const parsed = siteSettingsSchema.safeParse(stored ?? {})
  if (parsed.success) return parsed.data
  const shape = siteSettingsSchema.shape as Record<string, z.ZodType>
  const valid = stored && typeof stored === 'object'
    ? Object.fromEntries(Object.entries(stored).filter(([k, v]) => shape[k]?.safeParse(v).success))
    : {}
  return { ...defaultSiteSettings(), ...valid }
}
