import { describe, it, expect } from 'vitest'
import {
  DEFAULT_REQUALIFICATION_YEARS,
  REQUALIFICATION_MARK_SUFFIX,
  firstRequalificationDue,
  nextRequalificationDue,
  requalificationStatus,
} from '../../shared/utils/requalification'

describe('requalification periods (49 CFR 180.209)', () => {
  it('12 years water jacket and 5 years external visual (published); 7 years proof pressure (from memory)', () => {
    expect(DEFAULT_REQUALIFICATION_YEARS.water_jacket).toBe(12)
    expect(DEFAULT_REQUALIFICATION_YEARS.external_visual).toBe(5)
    expect(DEFAULT_REQUALIFICATION_YEARS.proof_pressure).toBe(7)
  })

  it('external visual requalification is marked "E" (published); other marks are left unset', () => {
    expect(REQUALIFICATION_MARK_SUFFIX.external_visual).toBe('E')
    expect(REQUALIFICATION_MARK_SUFFIX.water_jacket).toBeNull()
    expect(REQUALIFICATION_MARK_SUFFIX.proof_pressure).toBeNull()
  })
})

describe('first requalification: within 12 years of manufacture (49 CFR 180.209)', () => {
  it('a cylinder stamped 03-14 is due by the end of March 2026', () => {
    expect(firstRequalificationDue(2014, 3)).toBe('2026-03-31')
  })

  it('lands on Feb 29 in a leap year', () => {
    expect(firstRequalificationDue(2016, 2)).toBe('2028-02-29')
    expect(firstRequalificationDue(2015, 2)).toBe('2027-02-28')
  })

  it('rejects an impossible month', () => {
    expect(() => firstRequalificationDue(2014, 13)).toThrow(RangeError)
  })
})

describe('next requalification by method', () => {
  it('runs from the end of the stamped month', () => {
    expect(nextRequalificationDue('2024-06-12', 'external_visual')).toBe('2029-06-30')
    expect(nextRequalificationDue('2024-06', 'water_jacket')).toBe('2036-06-30')
    expect(nextRequalificationDue({ year: 2024, month: 6 }, 'proof_pressure')).toBe('2031-06-30')
  })

  it('takes a site table', () => {
    expect(nextRequalificationDue('2024-06-12', 'external_visual', { ...DEFAULT_REQUALIFICATION_YEARS, external_visual: 4 }))
      .toBe('2028-06-30')
  })

  it('rejects a date that does not exist', () => {
    expect(() => nextRequalificationDue('2024-02-30', 'water_jacket')).toThrow(RangeError)
  })
})

describe('requalification status', () => {
  it('current, due soon within 90 days, overdue after the due date', () => {
    expect(requalificationStatus('2026-03-31', '2025-12-01')).toEqual({ status: 'current', daysLeft: 120 })
    expect(requalificationStatus('2026-03-31', '2026-01-01')).toEqual({ status: 'due_soon', daysLeft: 89 })
    expect(requalificationStatus('2026-03-31', '2026-03-31')).toEqual({ status: 'due_soon', daysLeft: 0 })
    expect(requalificationStatus('2026-03-31', '2026-04-01')).toEqual({ status: 'overdue', daysLeft: -1 })
  })

  it('honours a different warning window', () => {
    expect(requalificationStatus('2026-03-31', '2026-01-01', 30).status).toBe('current')
  })
})
