import { describe, expect, it } from 'vitest'
import dayjs from 'dayjs'
import utc from 'dayjs/plugin/utc'
import quarterOfYear from 'dayjs/plugin/quarterOfYear'
import {
  batteryRisk, beyondYears, changeWords, cyclesPerDay, hoursOnChargePerDay, monthsBetween, nextQuarters, percentChange, quarterOf,
  closedMonthsInside, monthText, ratedCyclesReachedOn, sameDaysLastMonth,
} from '../../shared/utils/report-math'
import 'dayjs/locale/es'
import { mailWords } from '../../server/utils/mail-words'
import { defaultReportRange, reportQuerySchema } from '../../shared/utils/report-schemas'
import { scopeToday } from '../../server/utils/reports/scope'
import { daysInRange } from '../../shared/utils/area-checklists'

dayjs.extend(utc)
dayjs.extend(quarterOfYear)

// Dates are checked against dayjs (a general-purpose date library), the rest by arithmetic written beside it.
describe('report arithmetic', () => {
  it('hours on charge per day: 11 h over the 31 days of March = 0.3548', () => {
    expect(hoursOnChargePerDay(11, 31)).toBeCloseTo(0.354839, 6)
    expect(hoursOnChargePerDay(5, 0)).toBe(0)
  })

  it('change on last month: (120 − 100) ÷ 100 = +20 %; nothing before gives no percentage', () => {
    expect(percentChange(120, 100)).toBeCloseTo(20, 9)
    expect(percentChange(5, 0)).toBeNull()
    expect(changeWords(120, 100)).toBe('+20 % on last month')
    expect(changeWords(96, 100)).toBe('−4 % on last month')
    expect(changeWords(100, 100)).toBe('±0 % on last month')
    expect(changeWords(3, 0)).toBe('nothing recorded last month')
  })

  it('the day rated cycles are reached: 97 cycles left at 3 per 90 days = 2,910 days on', () => {
    const perDay = cyclesPerDay(3, 90)
    expect(perDay).toBeCloseTo(0.033333, 6)
    expect(ratedCyclesReachedOn('2026-03-31', 3, 100, perDay)).toBe(dayjs.utc('2026-03-31').add(2910, 'day').format('YYYY-MM-DD'))
    // 1,500 − 1,400 = 100 cycles at 5 a week (5/7 a day) = 140 days
    expect(ratedCyclesReachedOn('2026-01-01', 1400, 1500, 5 / 7)).toBe(dayjs.utc('2026-01-01').add(140, 'day').format('YYYY-MM-DD'))
    expect(ratedCyclesReachedOn('2026-01-01', 1600, 1500, 0)).toBe('2026-01-01')
    expect(ratedCyclesReachedOn('2026-01-01', 10, 1500, 0)).toBeNull()
  })

  it('the forecast names a day up to ten years ahead (calendar years, as dayjs adds them)', () => {
    const horizon = dayjs.utc('2026-03-31').add(10, 'year').format('YYYY-MM-DD')
    expect(beyondYears('2026-03-31', horizon, 10)).toBe(false)
    expect(beyondYears('2026-03-31', dayjs.utc(horizon).add(1, 'day').format('YYYY-MM-DD'), 10)).toBe(true)
    // 1,500 rated, 8 used, 1 counted cycle in 90 days: 134,280 days on, centuries away
    expect(beyondYears('2026-12-05', ratedCyclesReachedOn('2026-12-05', 8, 1500, cyclesPerDay(1, 90))!, 10)).toBe(true)
    // the 2,910 days above are within it
    expect(beyondYears('2026-03-31', ratedCyclesReachedOn('2026-03-31', 3, 100, cyclesPerDay(3, 90))!, 10)).toBe(false)
    // from 29 February, ten years on is 28 February (dayjs agrees)
    expect(beyondYears('2028-02-29', dayjs.utc('2028-02-29').add(10, 'year').format('YYYY-MM-DD'), 10)).toBe(false)
    expect(dayjs.utc('2028-02-29').add(10, 'year').format('YYYY-MM-DD')).toBe('2038-02-28')
    expect(beyondYears('2028-02-29', '2038-03-01', 10)).toBe(true)
  })

  it('quarters agree with dayjs\'s quarterOfYear', () => {
    for (const d of ['2026-01-01', '2026-03-31', '2026-04-01', '2026-09-30', '2026-12-31']) {
      const q = dayjs.utc(d)
      expect(quarterOf(d)).toBe(`${q.year()} Q${q.quarter()}`)
    }
    expect(nextQuarters('2026-11-15', 4)).toEqual(['2026 Q4', '2027 Q1', '2027 Q2', '2027 Q3'])
  })

  it('a month as each language names it, checked against dayjs\'s English and Spanish month names', () => {
    for (let i = 1; i <= 12; i++) {
      const m = `2026-${String(i).padStart(2, '0')}`
      expect(monthText(m, 'en-US')).toBe(dayjs.utc(`${m}-01`).format('MMM YYYY'))
      // dayjs writes Spanish short months with a dot ("sep."), Intl without ("sept"): the same word's start
      const es = monthText(m, 'es-US')
      expect(es.endsWith(' 2026')).toBe(true)
      expect(es.startsWith(dayjs.utc(`${m}-01`).locale('es').format('MMM').replace('.', ''))).toBe(true)
    }
    expect(monthText('not a month', 'en-US')).toBe('not a month')
  })

  it('the whole months of a range that ended before yesterday (kept for the energy report)', () => {
    // a year to 3 Dec 2026: December 2025 starts on the 4th and December 2026 is not over
    expect(closedMonthsInside('2025-12-04', '2026-12-03', '2026-12-03')).toEqual(monthsBetween('2026-01-01', '2026-11-30'))
    // November ended yesterday: not yet (a site west of UTC may still be in it)
    expect(closedMonthsInside('2026-10-01', '2026-11-30', '2026-12-01')).toEqual(['2026-10'])
    expect(closedMonthsInside('2026-10-01', '2026-11-30', '2026-12-02')).toEqual(['2026-10', '2026-11'])
    // a range ending on 28 February of a leap year and not
    expect(closedMonthsInside('2028-02-01', '2028-02-28', '2028-06-01')).toEqual([])
    expect(closedMonthsInside('2027-02-01', '2027-02-28', '2027-06-01')).toEqual(['2027-02'])
  })

  it('a report writes its counts with the digits grouped; other words keep theirs', () => {
    expect(mailWords('en', { groupCounts: true })('report.energy.charges', { n: 5002 })).toBe('5,002 charges')
    expect(mailWords('es', { groupCounts: true })('report.energy.charges', { n: 1 })).toBe('1 carga')
    expect(mailWords('en')('report.energy.charges', { n: 5002 })).toBe('5002 charges')
  })

  it('months of a range, and the same days of last month', () => {
    expect(monthsBetween('2025-11-20', '2026-02-03')).toEqual(['2025-11', '2025-12', '2026-01', '2026-02'])
    expect(monthsBetween('2026-03-01', '2026-03-31')).toEqual(['2026-03'])
    expect(sameDaysLastMonth('2026-03-31')).toEqual({ from: '2026-02-01', to: '2026-02-28' })
    expect(sameDaysLastMonth('2026-01-12')).toEqual({ from: '2025-12-01', to: '2025-12-12' })
    expect(daysInRange('2026-03-01', '2026-03-31')).toBe(dayjs.utc('2026-03-31').diff(dayjs.utc('2026-03-01'), 'day') + 1)
  })

  it('risk orders the fleet: 1,200 of 1,500 cycles (48) + a weak cell (20) + spread 0.025 (5) + Ah per charge down 10 % (5) = 78', () => {
    expect(batteryRisk({ cycles: 1200, ratedCycles: 1500, weakCell: true, lastSpread: 0.025, capacityRatio: 0.9 })).toBe(78)
    expect(batteryRisk({ cycles: 0, ratedCycles: 1500, weakCell: false, lastSpread: null, capacityRatio: null })).toBe(0)
    expect(batteryRisk({ cycles: 3000, ratedCycles: 1500, weakCell: true, lastSpread: 0.2, capacityRatio: 0.5 })).toBe(100)
  })
})

describe('report query', () => {
  it('defaults to the year to today, and refuses a backwards or too long range', () => {
    const range = defaultReportRange('2026-12-02')
    expect(range).toEqual({ from: '2025-12-03', to: '2026-12-02' })
    expect(reportQuerySchema.safeParse({ siteId: 'all', from: '2026-04-01', to: '2026-03-01' }).success).toBe(false)
    expect(reportQuerySchema.safeParse({ siteId: 'all', from: '2020-01-01', to: '2026-01-01' }).success).toBe(false)
    expect(reportQuerySchema.safeParse({ siteId: 'somewhere' }).success).toBe(false)
    const ok = reportQuerySchema.parse({ siteId: 'all', to: '2026-03-31' })
    expect(ok).toMatchObject({ from: '2025-04-01', to: '2026-03-31', format: 'json' })
  })
})

describe('the facilities lead\'s "this month so far"', () => {
  // 01:30 UTC on 1 December is 19:30 on 30 November in Chicago (UTC−6 in winter) and 10:30 on 1 December in
  // Tokyo (UTC+9): IANA time zone database, read through the runtime's Intl
  const at = new Date('2026-12-01T01:30:00Z')
  const site = (timeZone: string) => ({ id: timeZone, name: timeZone, timeZone, unitSystem: 'us' as const, settings: {} as never })
  it('ends on the site\'s own day, not UTC\'s', () => {
    expect(scopeToday({ sites: [site('America/Chicago')] }, at)).toBe('2026-11-30')
  })
  it('across sites in several zones, on the latest of their days', () => {
    expect(scopeToday({ sites: [site('America/Chicago'), site('Asia/Tokyo')] }, at)).toBe('2026-12-01')
    expect(scopeToday({ sites: [] }, at)).toBe('2026-12-01')
  })
})
