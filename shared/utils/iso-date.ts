import { z } from 'zod'
import { calendarDaysBetween } from './due-dates'

/** A real calendar date written YYYY-MM-DD (2024-02-30 and year 0 are refused). */
export function isRealIsoDate(s: string): boolean {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(s)) return false
  const year = Number(s.slice(0, 4))
  const d = new Date(`${s}T00:00:00Z`)
  return year >= 1900 && year <= 2200 && !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s
}

// a day written right that is not on the calendar is the issue a date written wrong is (invalid_format, date),
// so a screen in another language words it (field_issue.date) on the client and from the server's answer alike
export const isoDateSchema = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2026-03-31.').superRefine((s, ctx) => {
  if (!isRealIsoDate(s)) ctx.addIssue({ code: 'invalid_format', format: 'date', input: s, message: 'Not a real date.' })
})

/**
 * A query's range of days (`from`, `to`, either left out where the route has a default): the end not before the
 * start, and at most `maxDays` days, both ends included.
 */
export function withDayRange<T extends z.ZodType<{ from?: string, to?: string }>>(schema: T, maxDays = 400) {
  return schema
    .refine(q => !q.from || !q.to || q.from <= q.to, { path: ['to'], message: 'The end is before the start.' })
    .refine(q => !q.from || !q.to || calendarDaysBetween(q.from, q.to) + 1 <= maxDays, { path: ['to'], message: `At most ${maxDays} days at a time.` })
}
