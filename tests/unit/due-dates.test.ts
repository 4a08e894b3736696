import { describe, it, expect } from 'vitest'
import {
  OBLIGATION_STATE_LABELS,
  addCalendarInterval,
  calendarDaysBetween,
  isIsoCalendarDate,
  lastDayOfMonth,
  localDate,
  monthlyAtMost31Days,
  nextDueByCount,
  obligationState,
} from '../../shared/utils/due-dates'

// Independent reference for a zone's calendar date: the platform's Intl time-zone data (IANA tz database).
const intlDate = (instant: Date, timeZone: string) =>
  new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(instant)

describe('calendar intervals', () => {
  it('month ends clamp: Jan 31 + 1 month = Feb 28, or Feb 29 in a leap year', () => {
    expect(addCalendarInterval('2026-01-31', 1, 'month')).toBe('2026-02-28')
    expect(addCalendarInterval('2028-01-31', 1, 'month')).toBe('2028-02-29')
    expect(addCalendarInterval('2026-03-31', 1, 'month')).toBe('2026-04-30')
    expect(addCalendarInterval('2026-08-31', 6, 'month')).toBe('2027-02-28')
  })

  it('leap day: 2028-02-29 + 1 year = 2029-02-28; + 4 years = 2032-02-29', () => {
    expect(addCalendarInterval('2028-02-29', 1, 'year')).toBe('2029-02-28')
    expect(addCalendarInterval('2028-02-29', 4, 'year')).toBe('2032-02-29')
    expect(addCalendarInterval('2028-02-28', 1, 'day')).toBe('2028-02-29')
    expect(addCalendarInterval('2028-02-29', 1, 'day')).toBe('2028-03-01')
  })

  it('days and weeks across a DST change and a year end', () => {
    expect(addCalendarInterval('2026-03-07', 1, 'day')).toBe('2026-03-08')
    expect(addCalendarInterval('2026-03-01', 2, 'week')).toBe('2026-03-15')
    expect(addCalendarInterval('2026-12-28', 7, 'day')).toBe('2027-01-04')
    expect(addCalendarInterval('2026-03-15', -2, 'week')).toBe('2026-03-01')
  })

  it('rejects dates that do not exist and fractional counts', () => {
    expect(isIsoCalendarDate('2026-02-29')).toBe(false)
    expect(isIsoCalendarDate('2028-02-29')).toBe(true)
    expect(() => addCalendarInterval('2026-02-30', 1, 'day')).toThrow(RangeError)
    expect(() => addCalendarInterval('2026-2-3', 1, 'day')).toThrow(RangeError)
    expect(() => addCalendarInterval('2026-02-03', 1.5, 'day')).toThrow(RangeError)
  })

  it('days between dates, across a leap day', () => {
    expect(calendarDaysBetween('2028-02-28', '2028-03-01')).toBe(2)
    expect(calendarDaysBetween('2026-02-28', '2026-03-01')).toBe(1)
    expect(calendarDaysBetween('2026-03-01', '2026-02-28')).toBe(-1)
  })

  it('last day of a month', () => {
    expect(lastDayOfMonth(2028, 2)).toBe('2028-02-29')
    expect(lastDayOfMonth(2100, 2)).toBe('2100-02-28')
    expect(lastDayOfMonth(2026, 12)).toBe('2026-12-31')
  })
})

describe('local date in the site\'s time zone', () => {
  it('23:30 in Chicago stays that day, not the next UTC day', () => {
    const instant = new Date('2026-07-15T04:30:00Z') // 23:30 CDT on Jul 14
    expect(localDate(instant, 'America/Chicago')).toBe('2026-07-14')
    expect(localDate(instant, 'UTC')).toBe('2026-07-15')
  })

  it('America/Chicago across the US DST start, 2026-03-08 (UTC−6 → UTC−5)', () => {
    const beforeChange = new Date('2026-03-08T05:30:00Z') // 23:30 CST on Mar 7
    const afterChange = new Date('2026-03-09T04:30:00Z') // 23:30 CDT on Mar 8
    const justAfterMidnight = new Date('2026-03-09T05:30:00Z') // 00:30 CDT on Mar 9
    expect(localDate(beforeChange, 'America/Chicago')).toBe('2026-03-07')
    expect(localDate(afterChange, 'America/Chicago')).toBe('2026-03-08')
    expect(localDate(justAfterMidnight, 'America/Chicago')).toBe('2026-03-09')
    for (const instant of [beforeChange, afterChange, justAfterMidnight]) {
      expect(localDate(instant, 'America/Chicago')).toBe(intlDate(instant, 'America/Chicago'))
    }
  })

  it('America/Chicago across the US DST end, 2026-11-01 (UTC−5 → UTC−6)', () => {
    const lateOnSunday = new Date('2026-11-02T05:30:00Z') // 23:30 CST on Nov 1
    expect(localDate(lateOnSunday, 'America/Chicago')).toBe('2026-11-01')
    expect(localDate(lateOnSunday, 'America/Chicago')).toBe(intlDate(lateOnSunday, 'America/Chicago'))
  })

  it('Europe/Berlin across the EU DST start, 2026-03-29 (UTC+1 → UTC+2)', () => {
    const saturdayNight = new Date('2026-03-28T22:30:00Z') // 23:30 CET on Mar 28
    const sundayNight = new Date('2026-03-29T21:30:00Z') // 23:30 CEST on Mar 29
    const sameUtcTimeSunday = new Date('2026-03-29T22:30:00Z') // 00:30 CEST on Mar 30
    expect(localDate(saturdayNight, 'Europe/Berlin')).toBe('2026-03-28')
    expect(localDate(sundayNight, 'Europe/Berlin')).toBe('2026-03-29')
    expect(localDate(sameUtcTimeSunday, 'Europe/Berlin')).toBe('2026-03-30')
    for (const instant of [saturdayNight, sundayNight, sameUtcTimeSunday]) {
      expect(localDate(instant, 'Europe/Berlin')).toBe(intlDate(instant, 'Europe/Berlin'))
    }
  })

  it('rejects an invalid instant', () => {
    expect(() => localDate(new Date('nope'), 'America/Chicago')).toThrow(RangeError)
  })
})

describe('count-based schedules', () => {
  it('equalize every 5th charge: last at 120, now 123 → due at 125, 2 left', () => {
    expect(nextDueByCount(120, 123, 5)).toEqual({ dueAtCount: 125, remaining: 2 })
  })

  it('service every 250 hours, overdue by 10', () => {
    expect(nextDueByCount(1000, 1260, 250)).toEqual({ dueAtCount: 1250, remaining: -10 })
  })

  it('rejects a zero interval or a counter that went backwards', () => {
    expect(() => nextDueByCount(0, 10, 0)).toThrow(RangeError)
    expect(() => nextDueByCount(20, 10, 5)).toThrow(RangeError)
  })
})

describe('obligation state', () => {
  it('upcoming, due soon inside the window, due soon on the day, overdue the day after', () => {
    expect(obligationState('2026-06-30', '2026-06-01', 14)).toBe('upcoming')
    expect(obligationState('2026-06-30', '2026-06-16', 14)).toBe('due_soon')
    expect(obligationState('2026-06-30', '2026-06-30', 14)).toBe('due_soon')
    expect(obligationState('2026-06-30', '2026-07-01', 14)).toBe('overdue')
    expect(obligationState('2026-06-30', '2026-06-30', 0)).toBe('due_soon')
  })

  it('labels', () => {
    expect(OBLIGATION_STATE_LABELS).toEqual({ upcoming: 'Upcoming', due_soon: 'Due soon', overdue: 'Overdue', done: 'Done' })
  })
})

describe('monthly extinguisher checks (NFPA 10: "monthly" is at most 31 days)', () => {
  it('is 31 days on, not the same date next month', () => {
    expect(monthlyAtMost31Days('2026-01-31')).toBe('2026-03-03')
    expect(addCalendarInterval('2026-01-31', 1, 'month')).toBe('2026-02-28')
    expect(monthlyAtMost31Days('2026-03-31')).toBe('2026-05-01')
    expect(addCalendarInterval('2026-03-31', 1, 'month')).toBe('2026-04-30')
    expect(monthlyAtMost31Days('2028-02-01')).toBe('2028-03-03')
  })
})

describe('due dates by rule kind at month ends, leap days and in a site time zone', () => {
  it('a daily checklist done on Feb 28 of a leap year is due Feb 29, of a common year Mar 1', () => {
    expect(addCalendarInterval('2028-02-28', 1, 'day')).toBe('2028-02-29')
    expect(addCalendarInterval('2026-02-28', 1, 'day')).toBe('2026-03-01')
  })

  it('quarterly CO monitoring from Nov 30 lands on the last day of February (Minnesota Rules 5205.0116: at least quarterly)', () => {
    expect(addCalendarInterval('2027-11-30', 3, 'month')).toBe('2028-02-29')
    expect(addCalendarInterval('2026-11-30', 3, 'month')).toBe('2027-02-28')
  })

  it('three-year operator evaluation from a leap day clamps to Feb 28 (29 CFR 1910.178(l)(4)(iii))', () => {
    expect(addCalendarInterval('2028-02-29', 3, 'year')).toBe('2031-02-28')
  })

  it('a watering logged at 23:30 Chicago time counts for that local day, not the UTC one', () => {
    const watered = new Date('2026-03-31T04:30:00Z') // 23:30 CDT on Mar 30
    expect(localDate(watered, 'America/Chicago')).toBe('2026-03-30')
    expect(addCalendarInterval(localDate(watered, 'America/Chicago'), 7, 'day')).toBe('2026-04-06')
    expect(addCalendarInterval(localDate(watered, 'UTC'), 7, 'day')).toBe('2026-04-07')
  })
})
