import { keptDateFormat } from './intl-formats'
import { addCalendarInterval } from './due-dates'
// The arithmetic of the reports, apart from the SQL that gathers its inputs (tests/unit/report-math.test.ts).

/** Hours a charger spent on charge per day of the range. */
export function hoursOnChargePerDay(hoursOnCharge: number, days: number): number {
  return days > 0 ? hoursOnCharge / days : 0
}

/** Change from `before` to `now` in percent, or null when there was nothing before. */
export function percentChange(now: number, before: number): number | null {
  return before > 0 ? ((now - before) / before) * 100 : null
}

/** "+12 %", "−3 %", "no figure last month" for the headline figures. */
export function changeWords(now: number, before: number, what = 'last month', words: ChangeWords = ENGLISH_CHANGE): string {
  const p = percentChange(now, before)
  if (p === null) return words.nothing(what)
  const rounded = Math.round(p)
  return words.pct(`${rounded > 0 ? '+' : rounded < 0 ? '−' : '±'}${Math.abs(rounded)}`, what)
}

/** How a change is said in a language: the signed percent ("+12") and what it is against. */
export interface ChangeWords { pct: (signed: string, what: string) => string, nothing: (what: string) => string }
const ENGLISH_CHANGE: ChangeWords = { pct: (signed, what) => `${signed} % on ${what}`, nothing: what => `nothing recorded ${what}` }

/** Cycles per day at the battery's recent rate (counted cycles in the window ÷ the window's days). */
export function cyclesPerDay(cyclesInWindow: number, windowDays: number): number {
  return windowDays > 0 ? cyclesInWindow / windowDays : 0
}

/**
 * The day a battery reaches its rated cycles at its recent rate: `asOf` plus (rated − used) ÷ rate days.
 * Already past: `asOf`. No recent use: null (no forecast can be made from its rate).
 */
export function ratedCyclesReachedOn(asOf: string, used: number, rated: number, perDay: number): string | null {
  if (used >= rated) return asOf
  if (perDay <= 0) return null
  const days = Math.ceil((rated - used) / perDay)
  const d = new Date(`${asOf}T00:00:00Z`)
  d.setUTCDate(d.getUTCDate() + days)
  return d.toISOString().slice(0, 10)
}

/**
 * How far ahead the replacement forecast names a day. A battery that its recent rate puts further out than
 * this will be retired for its age or a failed capacity test first (flooded traction batteries are commonly
 * good for about five years in service: common practice, from memory), so a day centuries away is no plan.
 */
export const FORECAST_HORIZON_YEARS = 10

/** Whether the day `isoDate` lies more than `years` calendar years after `asOf` (both 'YYYY-MM-DD'). */
export function beyondYears(asOf: string, isoDate: string, years: number): boolean {
  return isoDate > addCalendarInterval(asOf, years, 'year')
}

/** "2027 Q1" for a YYYY-MM-DD date. */
export function quarterOf(isoDate: string): string {
  const month = Number(isoDate.slice(5, 7))
  return `${isoDate.slice(0, 4)} Q${Math.ceil(month / 3)}`
}

/** The next `n` quarters from the one holding `isoDate`, in order. */
export function nextQuarters(isoDate: string, n: number): string[] {
  let year = Number(isoDate.slice(0, 4))
  let q = Math.ceil(Number(isoDate.slice(5, 7)) / 3)
  const out: string[] = []
  for (let i = 0; i < n; i++) {
    out.push(`${year} Q${q}`)
    q += 1
    if (q > 4) {
      q = 1
      year += 1
    }
  }
  return out
}

export interface BatteryRiskFacts {
  cycles: number
  ratedCycles: number
  weakCell: boolean
  /** the last cell-by-cell spread of corrected specific gravity */
  lastSpread: number | null
  /** Ah returned per counted charge, recent ÷ earlier (below 1: less capacity than before) */
  capacityRatio: number | null
}

// The spread of corrected specific gravity between cells above which a battery is looked at: 0.050 points
// (50 "points") is common practice for flooded lead-acid; 0.030 is a first warning (common practice).
export const SG_SPREAD_WARN = 0.030
export const SG_SPREAD_ACT = 0.050

/**
 * A 0–100 ordering for the fleet table, heaviest first: the share of rated cycles used (up to 60), a weak
 * cell (20), the cell spread (up to 10 at 0.050) and capacity fallen against before (up to 10 at −20 %).
 * Only an ordering for the lead's attention: the battery maker's test decides a replacement.
 */
export function batteryRisk(f: BatteryRiskFacts): number {
  const used = f.ratedCycles > 0 ? Math.min(f.cycles / f.ratedCycles, 1) : 0
  const spread = f.lastSpread === null ? 0 : Math.min(f.lastSpread / SG_SPREAD_ACT, 1)
  const fade = f.capacityRatio === null ? 0 : Math.min(Math.max((1 - f.capacityRatio) / 0.2, 0), 1)
  return Math.round(used * 60 + (f.weakCell ? 20 : 0) + spread * 10 + fade * 10)
}

/** Every month from `from` to `to` as YYYY-MM, so a month without charges shows as zero. */
export function monthsBetween(from: string, to: string): string[] {
  const out: string[] = []
  let y = Number(from.slice(0, 4))
  let m = Number(from.slice(5, 7))
  const end = to.slice(0, 7)
  for (let s = from.slice(0, 7); s <= end; s = `${y}-${String(m).padStart(2, '0')}`) {
    out.push(s)
    m += 1
    if (m > 12) {
      m = 1
      y += 1
    }
  }
  return out
}

/** The same span of last month as `today`'s month so far: its first day to the same day (or its last). */
export function sameDaysLastMonth(today: string): { from: string, to: string } {
  const y = Number(today.slice(0, 4))
  const m = Number(today.slice(5, 7))
  const [ly, lm] = m === 1 ? [y - 1, 12] : [y, m - 1]
  const lastDay = new Date(Date.UTC(ly, lm, 0)).getUTCDate()
  const month = `${ly}-${String(lm).padStart(2, '0')}`
  return { from: `${month}-01`, to: `${month}-${String(Math.min(Number(today.slice(8, 10)), lastDay)).padStart(2, '0')}` }
}

/** A month ('2026-03') as a language names it, short ("Mar 2026", "mar 2026"), for a table or a chart's axis. */
export function monthText(month: string, languageTag: string): string {
  if (!/^\d{4}-\d{2}$/.test(month)) return month
  return keptDateFormat(languageTag, { month: 'short', year: 'numeric', timeZone: 'UTC' }).format(new Date(`${month}-01T00:00:00Z`))
}

/** The months wholly inside from … to that ended before yesterday ('YYYY-MM', in order). */
export function closedMonthsInside(from: string, to: string, today: string): string[] {
  const yesterday = new Date(`${today}T00:00:00Z`)
  yesterday.setUTCDate(yesterday.getUTCDate() - 1)
  const lastDay = (m: string) => {
    const d = new Date(`${m}-01T00:00:00Z`)
    d.setUTCMonth(d.getUTCMonth() + 1)
    d.setUTCDate(0)
    return d.toISOString().slice(0, 10)
  }
  const limit = yesterday.toISOString().slice(0, 10)
  return monthsBetween(from, to).filter(m => `${m}-01` >= from && lastDay(m) <= to && lastDay(m) < limit)
}
