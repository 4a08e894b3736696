import { describe, expect, it } from 'vitest'
import dayjs from 'dayjs'
import utc from 'dayjs/plugin/utc'
import timezone from 'dayjs/plugin/timezone'
import { shiftStartedAt, zonedInstant } from '../../shared/utils/shift-times'
import { truckAuthorisationReason, evaluationDueOn } from '../../shared/utils/truck-authorisation'
import { inspectionHold } from '../../shared/utils/truck-inspection'

dayjs.extend(utc)
dayjs.extend(timezone)

// Wall times checked against dayjs's time-zone plugin (a general-purpose library reading the IANA database).
describe('when the shift began', () => {
  const shifts = ['06:00', '14:00', '22:00']
  it('a site-local wall time falls on the instant dayjs gives, across a daylight-saving change', () => {
    for (const [date, hhmm] of [['2026-03-07', '06:00'], ['2026-03-09', '06:00'], ['2026-11-02', '22:00'], ['2026-07-15', '14:30']] as const) {
      const [y, mo, d] = date.split('-').map(Number) as [number, number, number]
      const [h, m] = hhmm.split(':').map(Number) as [number, number]
      expect(zonedInstant(y, mo, d, h, m, 'America/Chicago').toISOString()).toBe(dayjs.tz(`${date} ${hhmm}`, 'America/Chicago').toISOString())
    }
  })
  it('at 15:10 in Chicago the 14:00 shift; at 03:00 yesterday\'s 22:00 shift; at 06:00 sharp the 06:00 one', () => {
    const at = (s: string) => dayjs.tz(s, 'America/Chicago').toDate()
    expect(shiftStartedAt(at('2026-12-02 15:10'), shifts, 'America/Chicago').toISOString()).toBe(at('2026-12-02 14:00').toISOString())
    expect(shiftStartedAt(at('2026-12-02 03:00'), shifts, 'America/Chicago').toISOString()).toBe(at('2026-12-01 22:00').toISOString())
    expect(shiftStartedAt(at('2026-12-02 06:00'), shifts, 'America/Chicago').toISOString()).toBe(at('2026-12-02 06:00').toISOString())
    expect(shiftStartedAt(at('2026-12-02 05:59'), ['06:00'], 'America/Chicago').toISOString()).toBe(at('2026-12-01 06:00').toISOString())
  })
})

describe('who may drive a truck', () => {
  const q = { trainedOn: '2023-02-01', evaluatedOn: '2023-02-10', expiresOn: '2030-01-01' }
  it('an evaluation is due three years after it was made (29 CFR 1910.178(l)(4)(iii))', () => {
    expect(evaluationDueOn(q)).toBe('2026-02-10')
    expect(evaluationDueOn({ ...q, expiresOn: '2025-06-30' })).toBe('2025-06-30')
  })
  it('refuses with the reason in words: no record, never evaluated, lapsed, retraining called for', () => {
    expect(truckAuthorisationReason(2, null, null, '2026-01-10')?.message ?? null).toContain('not authorised for class 2')
    expect(truckAuthorisationReason(1, { ...q, evaluatedOn: null }, null, '2026-01-10')?.message ?? null).toContain('no evaluation')
    expect(truckAuthorisationReason(1, q, null, '2026-02-10')?.message ?? null).toBeNull()
    expect(truckAuthorisationReason(1, q, null, '2026-02-11')?.message ?? null).toContain('lapsed on 2026-02-10')
    expect(truckAuthorisationReason(1, q, { happenedOn: '2025-05-01', reason: 'near_miss' }, '2025-06-01')?.message ?? null).toContain('near miss')
    expect(truckAuthorisationReason(1, q, { happenedOn: '2022-05-01', reason: 'near_miss' }, '2025-06-01')?.message ?? null).toBeNull()
  })
})

describe('the inspection hold (29 CFR 1910.178(q)(7))', () => {
  const at = (s: string) => new Date(s)
  const failed = (id: string, when: string) => ({ id, at: at(when), userId: 'u', userName: 'Ana Invented', criticalFailed: ['Horn sounds'] })
  it('holds from the first critical failure after the last return, and not before it', () => {
    expect(inspectionHold([failed('a', '2026-01-01T06:00:00Z'), failed('b', '2026-01-02T06:00:00Z')], null)).toMatchObject({ inspectionId: 'a' })
    expect(inspectionHold([failed('a', '2026-01-01T06:00:00Z'), failed('b', '2026-01-02T06:00:00Z')], at('2026-01-01T12:00:00Z'))).toMatchObject({ inspectionId: 'b' })
    expect(inspectionHold([failed('a', '2026-01-01T06:00:00Z')], at('2026-01-01T12:00:00Z'))).toBeNull()
  })
})
