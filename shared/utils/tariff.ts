import dayjs from 'dayjs'
import utc from 'dayjs/plugin/utc.js'
import timezone from 'dayjs/plugin/timezone.js'
import { z } from 'zod'

dayjs.extend(utc)
dayjs.extend(timezone)

// Time-of-use tariffs: a site's peak windows (site-local clock times on ISO weekdays, 1 = Monday … 7 = Sunday)
// are billed at the peak price per kWh, every other hour at the site's tariff (the off-peak price). A window
// ends after it starts on the same day (one across midnight is two windows). Windows of a day may not overlap.

const clock = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'A time as HH:MM.')

export const peakPeriodSchema = z.object({
  days: z.array(z.number().int().min(1).max(7)).min(1, 'Pick at least one day.').max(7),
  start: clock,
  end: clock,
}).refine(p => p.start < p.end, { message: 'The peak ends before it starts; split a window across midnight in two.', path: ['end'] })
export type PeakPeriod = z.infer<typeof peakPeriodSchema>

/** Windows that share a day must not overlap (an hour would be counted twice). */
export const peakPeriodsSchema = z.array(peakPeriodSchema).max(8).superRefine((periods, ctx) => {
  periods.forEach((a, i) => periods.slice(i + 1).forEach((b) => {
    if (a.days.some(d => b.days.includes(d)) && a.start < b.end && b.start < a.end) ctx.addIssue({ code: 'custom', message: 'Two peak windows overlap on the same day.' })
  }))
})

/** PUT /api/sites/:id/tariff: the off-peak (or only) price, the peak price and the peak windows. */
export const siteTariffSchema = z.object({
  tariffPerKwh: z.number('Enter the price per kWh.').min(0).max(10),
  peakPerKwh: z.number('Enter the peak price per kWh.').min(0).max(10),
  peakPeriods: peakPeriodsSchema,
}).strict()
export type SiteTariff = z.infer<typeof siteTariffSchema>

/**
 * Hours of [start, end) inside the peak windows, in the site's time zone. The SQL of the energy report
 * restates this for speed (server/utils/reports/tariff-split.ts); an e2e test compares the two.
 */
export function peakHours(start: Date, end: Date, periods: readonly PeakPeriod[], timeZone: string): number {
  if (!(end > start) || periods.length === 0) return 0
  let ms = 0
  const lastDay = dayjs(end).tz(timeZone).format('YYYY-MM-DD')
  for (let day = dayjs(start).tz(timeZone).format('YYYY-MM-DD'); day <= lastDay; day = dayjs.utc(day).add(1, 'day').format('YYYY-MM-DD')) {
    const weekday = dayjs.utc(day).day() || 7
    for (const p of periods) {
      if (!p.days.includes(weekday)) continue
      const from = dayjs.tz(`${day} ${p.start}`, timeZone).valueOf()
      const to = dayjs.tz(`${day} ${p.end}`, timeZone).valueOf()
      ms += Math.max(0, Math.min(end.getTime(), to) - Math.max(start.getTime(), from))
    }
  }
  return ms / 3_600_000
}

/** What drawing `peakKwh` off-peak instead would have saved: peak kWh × (peak − off-peak price). */
export function offPeakSaving(peakKwh: number, peakPerKwh: number, offPeakPerKwh: number): number {
  return peakKwh * (peakPerKwh - offPeakPerKwh)
}
