import { calendarDaysBetween, isIsoCalendarDate, lastDayOfMonth } from './due-dates'

export type RequalificationMethod = 'water_jacket' | 'proof_pressure' | 'external_visual'
export type RequalificationStatus = 'current' | 'due_soon' | 'overdue'

export const REQUALIFICATION_SOURCE = '49 CFR 180.209 (DOT-4BW / DOT-4E cylinders in LP-gas service)'

/** A cylinder must be requalified within this many years of its manufacture month (49 CFR 180.209). */
export const FIRST_REQUALIFICATION_YEARS = 12

// 49 CFR 180.209: 12 years by water jacket and 5 years by external visual inspection are from the
// published text; 7 years by proof pressure is from memory and not checked against the official text.
export const DEFAULT_REQUALIFICATION_YEARS: Readonly<Record<RequalificationMethod, number>> = {
  water_jacket: 12,
  proof_pressure: 7,
  external_visual: 5,
}

// Letter stamped after the requalification date: 'E' for external visual is published (49 CFR 180.209);
// the marks for the other methods are not confirmed, so they stay null rather than guessed.
export const REQUALIFICATION_MARK_SUFFIX: Readonly<Record<RequalificationMethod, string | null>> = {
  water_jacket: null,
  proof_pressure: null,
  external_visual: 'E',
}

export const REQUALIFICATION_METHOD_LABELS: Readonly<Record<RequalificationMethod, string>> = {
  water_jacket: 'Water jacket test',
  proof_pressure: 'Proof pressure test',
  external_visual: 'External visual inspection',
}

/** A month as stamped on a cylinder (manufacture or requalification mark). */
export interface StampMonth {
  year: number
  /** 1–12 */
  month: number
}

// Cylinder marks carry only month and year, so a period "within N years" runs to the last day of
// that month N years on: a cylinder stamped 03-14 (March 2014) is due by 2026-03-31.
export function firstRequalificationDue(manufactureYear: number, manufactureMonth: number): string {
  return lastDayOfMonth(manufactureYear + FIRST_REQUALIFICATION_YEARS, manufactureMonth)
}

function toStampMonth(lastDate: string | StampMonth): StampMonth {
  if (typeof lastDate !== 'string') return lastDate
  const monthOnly = /^(\d{4})-(\d{2})$/.exec(lastDate)
  if (monthOnly) return { year: Number(monthOnly[1]), month: Number(monthOnly[2]) }
  if (!isIsoCalendarDate(lastDate)) throw new RangeError(`requalification date must be 'YYYY-MM' or 'YYYY-MM-DD', got '${lastDate}'`)
  return { year: Number(lastDate.slice(0, 4)), month: Number(lastDate.slice(5, 7)) }
}

// Next due date after a requalification: end of the stamped month plus the method's period.
export function nextRequalificationDue(
  lastDate: string | StampMonth,
  method: RequalificationMethod,
  table: Readonly<Record<RequalificationMethod, number>> = DEFAULT_REQUALIFICATION_YEARS,
): string {
  const { year, month } = toStampMonth(lastDate)
  const years = table[method]
  if (!Number.isInteger(years) || years <= 0) throw new RangeError(`requalification period for ${method} must be a whole number of years`)
  return lastDayOfMonth(year + years, month)
}

export interface RequalificationStanding {
  status: RequalificationStatus
  /** Days from today to the due date; negative once overdue. A cylinder is still in date on its due date. */
  daysLeft: number
}

export function requalificationStatus(due: string, today: string, soonDays = 90): RequalificationStanding {
  if (!Number.isFinite(soonDays) || soonDays < 0) throw new RangeError(`due-soon window must be 0 or more days, got ${soonDays}`)
  const daysLeft = calendarDaysBetween(today, due)
  if (daysLeft < 0) return { status: 'overdue', daysLeft }
  if (daysLeft <= soonDays) return { status: 'due_soon', daysLeft }
  return { status: 'current', daysLeft }
}
