import { keptDateFormat } from './intl-formats'

// When the current shift began at a site: the latest of the site's shift start times (site-local HH:MM)
// at or before `now`, today or, before the first start of the day, yesterday's last one. A truck is
// examined before it is placed in service each day, and after each shift where trucks run round the clock
// (29 CFR 1910.178(q)(7)), so "checked this shift" means a check at or after this instant.

function localParts(instant: Date, timeZone: string) {
  const parts = keptDateFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' })
    .formatToParts(instant)
  const get = (type: string) => Number(parts.find(p => p.type === type)?.value)
  return { year: get('year'), month: get('month'), day: get('day'), hour: get('hour'), minute: get('minute'), second: get('second') }
}

/** The instant a site-local day (YYYY-MM-DD) begins. */
export function localDayStart(isoDate: string, timeZone: string): Date {
  const [y, m, d] = isoDate.split('-').map(Number) as [number, number, number]
  return zonedInstant(y, m, d, 0, 0, timeZone)
}

/** The instant a site-local wall time falls on (the offset read at that moment, so daylight saving is right). */
export function zonedInstant(year: number, month: number, day: number, hour: number, minute: number, timeZone: string): Date {
  const guess = Date.UTC(year, month - 1, day, hour, minute)
  const seen = localParts(new Date(guess), timeZone)
  const offset = Date.UTC(seen.year, seen.month - 1, seen.day, seen.hour, seen.minute) - guess
  return new Date(guess - offset)
}

export function shiftStartedAt(now: Date, shiftStarts: readonly string[], timeZone: string): Date {
  const local = localParts(now, timeZone)
  const starts = shiftStarts.map(s => s.split(':').map(Number) as [number, number]).sort((a, b) => a[0] - b[0] || a[1] - b[1])
  const minutesNow = local.hour * 60 + local.minute
  const today = starts.filter(([h, m]) => h * 60 + m <= minutesNow).at(-1)
  if (today) return zonedInstant(local.year, local.month, local.day, today[0], today[1], timeZone)
  const [h, m] = starts.at(-1)!
  const yesterday = new Date(Date.UTC(local.year, local.month - 1, local.day - 1))
  return zonedInstant(yesterday.getUTCFullYear(), yesterday.getUTCMonth() + 1, yesterday.getUTCDate(), h, m, timeZone)
}
