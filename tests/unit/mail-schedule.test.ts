import { describe, it, expect } from 'vitest'
import { MAIL_MAX_ATTEMPTS, digestDue, localHour, mailRetryDelaySeconds } from '../../shared/utils/mail-schedule'

// Product choices (no outside source): 30 s doubling to at most an hour, ten tries.
describe('outbox retry backoff', () => {
  it('30 s, 60 s, 120 s … capped at one hour', () => {
    expect([1, 2, 3, 4].map(mailRetryDelaySeconds)).toEqual([30, 60, 120, 240])
    expect(mailRetryDelaySeconds(8)).toBe(3600)
  })

  it('stops after the last try', () => {
    expect(mailRetryDelaySeconds(MAIL_MAX_ATTEMPTS)).toBeNull()
    expect(() => mailRetryDelaySeconds(0)).toThrow(RangeError)
  })
})

describe('digest hour in the site time zone (IANA tz data through Intl)', () => {
  it('06:00 in Chicago is 11:00 UTC in summer (CDT, UTC−5)', () => {
    expect(localHour(new Date('2026-07-01T11:00:00Z'), 'America/Chicago')).toBe(6)
    expect(digestDue(new Date('2026-07-01T10:59:00Z'), 'America/Chicago', 6, false)).toBe(false)
    expect(digestDue(new Date('2026-07-01T11:00:00Z'), 'America/Chicago', 6, false)).toBe(true)
    expect(digestDue(new Date('2026-07-01T11:00:00Z'), 'America/Chicago', 6, true)).toBe(false)
    expect(digestDue(new Date('2026-07-01T12:00:00Z'), 'America/Chicago', 6, false)).toBe(false)
  })

  it('and 12:00 UTC in winter (CST, UTC−6)', () => {
    expect(localHour(new Date('2026-01-15T12:00:00Z'), 'America/Chicago')).toBe(6)
  })
})
