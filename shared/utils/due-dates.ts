import dayjs from 'dayjs'
import utc from 'dayjs/plugin/utc.js'
import timezone from 'dayjs/plugin/timezone.js'

dayjs.extend(utc)
dayjs.extend(timezone)

export type IntervalUnit = 'day' | 'week' | 'month' | 'year'
export type ObligationState = 'upcoming' | 'due_soon' | 'overdue' | 'done'
/** The states a date rule can put an open obligation in ('done' comes from a completion record). */
export type OpenObligationState = Exclude<ObligationState, 'done'>

export const OBLIGATION_STATE_LABELS: Readonly<Record<ObligationState, string>> = {
  upcoming: 'Upcoming',
  due_soon: 'Due soon',
  overdue: 'Overdue',
  done: 'Done',
}

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/

/** Days since 1970-01-01 of a 'YYYY-MM-DD', or NaN when it is not a real calendar date (2026-02-30). */
function epochDay(value: string): number {
  if (!ISO_DATE.test(value)) return Number.NaN
  const y = Number(value.slice(0, 4))
  const m = Number(value.slice(5, 7))
  const d = Number(value.slice(8, 10))
  const t = Date.UTC(y, m - 1, d)
  const back = new Date(t)
  return back.getUTCFullYear() === y && back.getUTCMonth() === m - 1 && back.getUTCDate() === d ? t / 86_400_000 : Number.NaN
}

/** True for a real calendar date written 'YYYY-MM-DD' (rejects 2026-02-30). */
export function isIsoCalendarDate(value: string): boolean {
  return !Number.isNaN(epochDay(value))
}

function parseIsoDate(value: string, name: string): dayjs.Dayjs {
  if (!isIsoCalendarDate(value)) throw new RangeError(`${name} must be a calendar date 'YYYY-MM-DD', got '${value}'`)
  return dayjs.utc(value)
}

// Adds whole days, weeks, months or years; a month-end that does not exist clamps to the last day
// (Jan 31 + 1 month = Feb 28 or 29; Feb 29 + 1 year = Feb 28).
export function addCalendarInterval(isoDate: string, n: number, unit: IntervalUnit): string {
  if (!Number.isInteger(n)) throw new RangeError(`interval count must be a whole number, got ${n}`)
  return parseIsoDate(isoDate, 'date').add(n, unit).format('YYYY-MM-DD')
}

/** Whole calendar days from one date to another (negative when `to` is earlier). */
export function calendarDaysBetween(fromIsoDate: string, toIsoDate: string): number {
  const to = epochDay(toIsoDate)
  const from = epochDay(fromIsoDate)
  if (Number.isNaN(to)) throw new RangeError(`to must be a calendar date 'YYYY-MM-DD', got '${toIsoDate}'`)
  if (Number.isNaN(from)) throw new RangeError(`from must be a calendar date 'YYYY-MM-DD', got '${fromIsoDate}'`)
  return to - from
}

/** Last day of a month, as 'YYYY-MM-DD' (month 1–12). */
export function lastDayOfMonth(year: number, month: number): string {
  if (!Number.isInteger(year) || year < 1000 || year > 9999) throw new RangeError(`year must be four digits, got ${year}`)
  if (!Number.isInteger(month) || month < 1 || month > 12) throw new RangeError(`month must be 1–12, got ${month}`)
  return dayjs.utc(Date.UTC(year, month - 1, 1)).endOf('month').format('YYYY-MM-DD')
}

// The calendar date an instant falls on in the site's time zone (23:30 in Chicago stays that day).
export function localDate(instant: Date, timeZone: string): string {
  if (Number.isNaN(instant.getTime())) throw new RangeError('instant is not a valid date')
  let format = DAY_FORMATS.get(timeZone)
  if (!format) {
    format = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' })
    DAY_FORMATS.set(timeZone, format)
  }
  const day = format.format(instant)
  // en-CA writes YYYY-MM-DD; anything else (an Intl without that locale) takes the slower path
  return ISO_DATE.test(day) ? day : dayjs(instant).tz(timeZone).format('YYYY-MM-DD')
}

// One formatter per time zone: making one is slow, using one is fast, and the rules call this per record.
const DAY_FORMATS = new Map<string, Intl.DateTimeFormat>()

export interface CountDue {
  /** The counter reading (charges, hours) at which the task falls due. */
  dueAtCount: number
  /** Counts left before it is due; zero or negative means due now or overdue by that many. */
  remaining: number
}

// Count-based schedules such as "every 5th charge" or "every 250 hours".
export function nextDueByCount(lastDoneCount: number, currentCount: number, everyN: number): CountDue {
  if (!Number.isFinite(everyN) || everyN <= 0) throw new RangeError(`interval must be greater than zero, got ${everyN}`)
  if (!Number.isFinite(lastDoneCount) || !Number.isFinite(currentCount)) throw new RangeError('counts must be numbers')
  if (currentCount < lastDoneCount) throw new RangeError('current count is lower than the count when last done')
  const dueAtCount = lastDoneCount + everyN
  return { dueAtCount, remaining: dueAtCount - currentCount }
}

// Due on the due date itself is 'due_soon' (still on time that day); the day after is 'overdue'.
export function obligationState(dueDate: string, today: string, dueSoonDays: number): OpenObligationState {
  if (!Number.isFinite(dueSoonDays) || dueSoonDays < 0) throw new RangeError(`due-soon window must be 0 or more days, got ${dueSoonDays}`)
  const daysLeft = calendarDaysBetween(today, dueDate)
  if (daysLeft < 0) return 'overdue'
  if (daysLeft <= dueSoonDays) return 'due_soon'
  return 'upcoming'
}

/** NFPA 10 treats "monthly" as at intervals of at most 31 days, not the same date next month. */
export const MONTHLY_MAX_DAYS = 31

/** Latest date for the next "monthly" check (fire extinguishers): last done + 31 days. */
export function monthlyAtMost31Days(lastDone: string): string {
  return addCalendarInterval(lastDone, MONTHLY_MAX_DAYS, 'day')
}
