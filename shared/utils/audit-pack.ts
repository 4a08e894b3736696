import { z } from 'zod'
import { isoDateSchema } from './iso-date'
import { assessCoExposure, CO_LIMITS, type CoReading } from './co-exposure'

// The audit pack: one PDF (and a ZIP of CSVs and certificates) of a site's records over a date range.
// The pure parts live here: the request's rules, the words on every page, and how a corrected record reads.

/** At most three years in one pack (366 × 3 + 1 days covers any three calendar years). */
export const AUDIT_PACK_MAX_DAYS = 3 * 366

const dayNumber = (iso: string) => Date.parse(`${iso}T00:00:00Z`) / 86_400_000

export const auditPackRequestSchema = z.object({
  siteId: z.uuid(),
  from: isoDateSchema,
  to: isoDateSchema,
}).superRefine((v, ctx) => {
  if (dayNumber(v.to) < dayNumber(v.from)) ctx.addIssue({ code: 'custom', path: ['to'], message: 'The range ends before it starts: choose a "to" day on or after the "from" day.' })
  else if (dayNumber(v.to) - dayNumber(v.from) + 1 > AUDIT_PACK_MAX_DAYS) ctx.addIssue({ code: 'custom', path: ['to'], message: 'A pack covers at most three years; make one pack per period.' })
})
export type AuditPackRequest = z.infer<typeof auditPackRequestSchema>

export interface AuditPackStamp {
  siteName: string
  from: string
  to: string
  /** when the pack was made, already written in the site's time ("2026-12-02 10:15") */
  madeAt: string
  madeBy: string
}

/** Words by dotted key from the locale files (audit_pack.pdf.*), in the language of the person who asked. */
export type PackWords = (key: string, params?: Record<string, string | number>) => string

/** The line at the top of every page. */
export function pageHeaderText(s: AuditPackStamp, t: PackWords): string {
  return t('audit_pack.pdf.header', { site: s.siteName, from: s.from, to: s.to, at: s.madeAt, by: s.madeBy })
}

/** The line at the foot of every page. */
export function pageNumberText(page: number, pages: number, t: PackWords): string {
  return t('audit_pack.pdf.page', { page, pages })
}

/** What a row carries about corrections (the record it corrects, the record that replaced it). */
export interface CorrectionFacts {
  correctsId: string | null
  correctionReason: string | null
  recordedBy: string
  recordedAt: string
  correctedById: string | null
  correctedBy: string | null
  correctedAt: string | null
}

export type CorrectionRole = 'standing' | 'corrected' | 'correction'

/** A record replaced by a later one reads as corrected (struck through); a correction says whose, when and why. */
export function correctionRole(r: Pick<CorrectionFacts, 'correctsId' | 'correctedById'>): CorrectionRole {
  if (r.correctedById) return 'corrected'
  return r.correctsId ? 'correction' : 'standing'
}

export function correctionText(r: CorrectionFacts, t: PackWords): string {
  const parts: string[] = []
  if (r.correctsId) parts.push(t('audit_pack.pdf.correction_by', { by: r.recordedBy, at: r.recordedAt, reason: r.correctionReason ?? '' }).trim())
  if (r.correctedById) parts.push(t('audit_pack.pdf.replaced_by', { by: r.correctedBy ?? t('audit_pack.pdf.word.someone'), at: r.correctedAt ?? '' }))
  return parts.join(' · ')
}

/**
 * Counts a section's records so that a corrected record counts once: the row that stands (the original
 * when uncorrected, else its latest correction) counts; a replaced row does not.
 */
export class StandingTally {
  standing = 0
  corrections = 0
  replaced = 0
  add(r: Pick<CorrectionFacts, 'correctsId' | 'correctedById'>) {
    if (r.correctsId) this.corrections++
    if (r.correctedById) this.replaced++
    else this.standing++
  }
}

export interface CoTwaRow {
  area: string
  day: string
  readings: number
  sampledHours: number
  twaPpm: number
  peakPpm: number
  siteLimitPpm: number
  overSiteLimit: boolean
  overOshaPel: boolean
}

/** One area's day of standing CO readings → its 8-hour TWA row (29 CFR 1910.1000(d)(1)(i), E = Σ(C·T)/8). */
export function coTwaRow(area: string, day: string, readings: readonly CoReading[], siteLimitPpm: number): CoTwaRow {
  const a = assessCoExposure(readings, { siteLimitPpm })
  return {
    area, day, readings: readings.length, sampledHours: a.totalHours, twaPpm: a.twaPpm, peakPpm: a.peakPpm,
    siteLimitPpm, overSiteLimit: a.overSiteLimit, overOshaPel: a.overOshaPel,
  }
}

/** The check column of a TWA row, naming the limits it is read against. */
export function coTwaVerdict(r: CoTwaRow, t: PackWords): string {
  if (r.overOshaPel) return t('audit_pack.pdf.over_pel', { ppm: CO_LIMITS.oshaPel.ppm })
  if (r.overSiteLimit) return t('audit_pack.pdf.over_site', { ppm: r.siteLimitPpm })
  return t('audit_pack.pdf.within')
}

/** Groups readings streamed in (area, day) order into TWA rows; `push` answers the row of a group just closed. */
export class CoTwaGrouper {
  private key = ''
  private area = ''
  private day = ''
  private readings: CoReading[] = []
  constructor(private readonly siteLimitPpm: number) {}
  push(area: string, day: string, reading: CoReading | null): CoTwaRow | null {
    const key = `${area}\u0000${day}`
    const closed = key !== this.key ? this.flush() : null
    if (key !== this.key) {
      this.key = key
      this.area = area
      this.day = day
    }
    if (reading) this.readings.push(reading)
    return closed
  }

  flush(): CoTwaRow | null {
    const row = this.readings.length ? coTwaRow(this.area, this.day, this.readings, this.siteLimitPpm) : null
    this.readings = []
    return row
  }
}

/** Numbers in a table cell: up to `digits` decimals, no trailing zeros; blank for none. */
export function cellNumber(n: number | null | undefined, digits = 2): string {
  if (n === null || n === undefined || !Number.isFinite(n)) return ''
  return String(Number(n.toFixed(digits)))
}
