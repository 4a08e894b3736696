import { z } from 'zod'
import { isoDateSchema } from './iso-date'
import { daysInRange } from './area-checklists'
import { LANGUAGES } from './languages'

/** The longest range one report covers (days): three years of monthly figures. */
export const REPORT_MAX_DAYS = 3 * 366

/** The year to `today` ('YYYY-MM-DD', the reader's site's day; UTC's when not given), as YYYY-MM-DD: the range a report opens on. */
export function defaultReportRange(today: string = new Date().toISOString().slice(0, 10)): { from: string, to: string } {
  const back = new Date(`${today}T00:00:00Z`)
  back.setUTCFullYear(back.getUTCFullYear() - 1)
  back.setUTCDate(back.getUTCDate() + 1)
  return { from: back.toISOString().slice(0, 10), to: today }
}

// ?siteId=<uuid>|all&from=YYYY-MM-DD&to=YYYY-MM-DD&format=json|csv&section=<key>&lang=en|es (the page's language)
export const reportQuerySchema = z.object({
  siteId: z.union([z.literal('all'), z.uuid()], 'Pick a site, or "all" for all of yours.'),
  from: isoDateSchema.optional(),
  to: isoDateSchema.optional(),
  format: z.enum(['json', 'csv'], 'Use format=json or format=csv.').default('json'),
  section: z.string().regex(/^[a-z][a-z-]{0,40}$/, 'Not a section of this report.').optional(),
  lang: z.enum(LANGUAGES, 'Use lang=en or lang=es.').optional(),
}).transform((q, ctx) => {
  const range = defaultReportRange()
  const from = q.from ?? (q.to ? defaultReportRange(q.to).from : range.from)
  const to = q.to ?? range.to
  if (from > to) ctx.addIssue({ code: 'custom', path: ['from'], message: 'The start date is after the end date.' })
  else if (daysInRange(from, to) > REPORT_MAX_DAYS) ctx.addIssue({ code: 'custom', path: ['to'], message: 'A report covers at most three years.' })
  return { ...q, from, to }
})
export type ReportQuery = z.output<typeof reportQuerySchema>
