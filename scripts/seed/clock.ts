import dayjs from 'dayjs'
import utc from 'dayjs/plugin/utc'
import timezone from 'dayjs/plugin/timezone'
import { addCalendarInterval, localDate } from '../../shared/utils/due-dates'

dayjs.extend(utc)
dayjs.extend(timezone)

export const SITE_TIME_ZONE = 'America/Chicago'
export const MINUTE_MS = 60_000
export const HOUR_MS = 60 * MINUTE_MS
export const DAY_MS = 24 * HOUR_MS

// Every date in the demo is placed relative to the moment the seed runs.
export class Clock {
  readonly now: Date
  readonly today: string

  constructor(now: Date) {
    this.now = now
    this.today = localDate(now, SITE_TIME_ZONE)
  }

  hoursAgo(hours: number): Date {
    return new Date(this.now.getTime() - hours * HOUR_MS)
  }

  daysAgo(days: number): Date {
    return new Date(this.now.getTime() - days * DAY_MS)
  }

  /** The site's calendar date of an instant. */
  dateOf(instant: Date): string {
    return localDate(instant, SITE_TIME_ZONE)
  }

  /** A calendar date some days before today. */
  dateDaysAgo(days: number): string {
    return addCalendarInterval(this.today, -days, 'day')
  }

  /** An instant at a local wall-clock time on a site calendar date. */
  at(isoDate: string, hour: number, minute = 0): Date {
    const hh = String(hour).padStart(2, '0')
    const mm = String(Math.floor(minute)).padStart(2, '0')
    return dayjs.tz(`${isoDate} ${hh}:${mm}`, SITE_TIME_ZONE).toDate()
  }

  /** Monday of the current local week. */
  weekStart(): string {
    const day = dayjs.tz(this.now, SITE_TIME_ZONE).day()
    return this.dateDaysAgo((day + 6) % 7)
  }
}

export function addMinutes(instant: Date, minutes: number): Date {
  return new Date(instant.getTime() + minutes * MINUTE_MS)
}

export function addHours(instant: Date, hours: number): Date {
  return new Date(instant.getTime() + hours * HOUR_MS)
}
