import { describe, expect, it } from 'vitest'
import { offPeakSaving, peakHours, peakPeriodsSchema, type PeakPeriod } from '../../shared/utils/tariff'

// Hand-computed against a calendar: in 2026 US daylight time starts Sunday 8 March at 02:00 (Chicago goes
// from CST, UTC−6, to CDT, UTC−5); 10 March 2026 is a Tuesday, 13 March a Friday, 14 March a Saturday.
const CHICAGO = 'America/Chicago'
const WEEKDAYS_NOON_TO_SIX: PeakPeriod[] = [{ days: [1, 2, 3, 4, 5], start: '12:00', end: '18:00' }]
const at = (iso: string) => new Date(iso)

describe('peak hours of a charge, in the site\'s time zone', () => {
  it('Tue 10:00–14:00 CDT: 2 of its 4 hours are in the 12:00–18:00 peak', () => {
    // 10:00 CDT = 15:00Z; 14:00 CDT = 19:00Z; overlap 12:00–14:00 = 2 h
    expect(peakHours(at('2026-03-10T15:00:00Z'), at('2026-03-10T19:00:00Z'), WEEKDAYS_NOON_TO_SIX, CHICAGO)).toBeCloseTo(2, 9)
  })

  it('Fri 17:00 to Sat 13:00: only Friday\'s last peak hour counts (Saturday has no peak)', () => {
    // Fri 17:00–18:00 = 1 h; Sat 12:00–13:00 is not a weekday window = 0 h
    expect(peakHours(at('2026-03-13T22:00:00Z'), at('2026-03-14T18:00:00Z'), WEEKDAYS_NOON_TO_SIX, CHICAGO)).toBeCloseTo(1, 9)
  })

  it('across the spring-forward night, Sun 00:00 CST to Mon 13:00 CDT: Monday 12:00–13:00 only', () => {
    // 00:00 CST = 06:00Z; Mon 13:00 CDT = 18:00Z (36 h); peak 1 h
    expect(peakHours(at('2026-03-08T06:00:00Z'), at('2026-03-09T18:00:00Z'), WEEKDAYS_NOON_TO_SIX, CHICAGO)).toBeCloseTo(1, 9)
  })

  it('Wed 15:00 to Thu 13:00: 3 h on Wednesday and 1 h on Thursday', () => {
    // Wed 15:00–18:00 = 3 h; Thu 12:00–13:00 = 1 h; total 4 h of 22 h
    expect(peakHours(at('2026-03-11T20:00:00Z'), at('2026-03-12T18:00:00Z'), WEEKDAYS_NOON_TO_SIX, CHICAGO)).toBeCloseTo(4, 9)
  })

  it('two windows on a day add; no windows means no peak; an empty or reversed charge has none', () => {
    const twoWindows: PeakPeriod[] = [{ days: [2], start: '07:00', end: '09:00' }, { days: [2], start: '17:00', end: '20:00' }]
    // Tue 06:00–21:00 CDT: 07–09 (2 h) + 17–20 (3 h) = 5 h
    expect(peakHours(at('2026-03-10T11:00:00Z'), at('2026-03-11T02:00:00Z'), twoWindows, CHICAGO)).toBeCloseTo(5, 9)
    expect(peakHours(at('2026-03-10T15:00:00Z'), at('2026-03-10T19:00:00Z'), [], CHICAGO)).toBe(0)
    expect(peakHours(at('2026-03-10T19:00:00Z'), at('2026-03-10T15:00:00Z'), WEEKDAYS_NOON_TO_SIX, CHICAGO)).toBe(0)
  })

  it('the saving of moving peak kWh off-peak: 30 kWh over 4 h with 2 h in peak → 15 kWh × (0.20 − 0.12) = 1.20', () => {
    // energy is taken as drawn evenly over the charge: 30 kWh × 2 h ÷ 4 h = 15 kWh in peak
    const peakKwh = 30 * peakHours(at('2026-03-10T15:00:00Z'), at('2026-03-10T19:00:00Z'), WEEKDAYS_NOON_TO_SIX, CHICAGO) / 4
    expect(peakKwh).toBeCloseTo(15, 9)
    expect(offPeakSaving(peakKwh, 0.20, 0.12)).toBeCloseTo(1.2, 9)
  })
})

describe('peak windows as a site sets them', () => {
  it('refuses a window that ends before it starts and two that overlap on a day', () => {
    expect(peakPeriodsSchema.safeParse([{ days: [1], start: '18:00', end: '12:00' }]).success).toBe(false)
    expect(peakPeriodsSchema.safeParse([{ days: [1, 2], start: '12:00', end: '18:00' }, { days: [2], start: '17:00', end: '19:00' }]).success).toBe(false)
    expect(peakPeriodsSchema.safeParse([{ days: [1], start: '12:00', end: '18:00' }, { days: [2], start: '17:00', end: '19:00' }]).success).toBe(true)
    expect(peakPeriodsSchema.safeParse([{ days: [8], start: '12:00', end: '18:00' }]).success).toBe(false)
  })
})
