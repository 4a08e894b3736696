// When the outbox tries a message again, and when a site's daily digest is due.

import { keptDateFormat } from './intl-formats'

/** First retry after this many seconds; each later one waits twice as long. */
export const MAIL_RETRY_BASE_SECONDS = 30
/** Never wait longer than an hour between tries. */
export const MAIL_RETRY_MAX_SECONDS = 3600
/** After this many tries the message stays failed until an admin retries it. */
export const MAIL_MAX_ATTEMPTS = 10

// Exponential backoff: 30 s, 60 s, 120 s … capped at one hour; null once the tries are used up.
export function mailRetryDelaySeconds(attempts: number): number | null {
  if (!Number.isInteger(attempts) || attempts < 1) throw new RangeError(`attempts must be a whole number of 1 or more, got ${attempts}`)
  if (attempts >= MAIL_MAX_ATTEMPTS) return null
  return Math.min(MAIL_RETRY_MAX_SECONDS, MAIL_RETRY_BASE_SECONDS * 2 ** (attempts - 1))
}

/** The hour (0–23) an instant falls in at a site, from the platform's time-zone data. */
export function localHour(instant: Date, timeZone: string): number {
  const hour = keptDateFormat('en-GB', { timeZone, hour: '2-digit', hourCycle: 'h23' }).format(instant)
  return Number(hour)
}

/** The digest goes once a day, during the site's digest hour (a server down all that hour skips the day). */
export function digestDue(instant: Date, timeZone: string, digestHour: number, alreadySentToday: boolean): boolean {
  return !alreadySentToday && localHour(instant, timeZone) === digestHour
}
