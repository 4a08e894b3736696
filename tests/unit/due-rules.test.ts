import { describe, it, expect } from 'vitest'
import { chargesProgress, hoursAsOf, hoursProgress, obligationRemaining, obligationStateAt, scheduleObligation } from '../../shared/utils/due-rules'
import { customObligations } from '../../shared/utils/derived-custom'
import { truckObligations, truckStatusFrom, type TruckFacts } from '../../shared/utils/derived-subjects'
import { defaultSchedules, type ScheduleDefinition } from '../../shared/utils/due-schedules'
import { effectiveRecords, standingVersion } from '../../shared/utils/effective-records'

const at = (iso: string) => new Date(iso)
const TZ = 'America/Chicago'

function added(over: Partial<ScheduleDefinition>): ScheduleDefinition {
  return {
    id: 'sch-1', kind: 'custom', title: 'Added', appliesTo: 'Areas', subjectKind: 'area', rule: 'days', every: 1, everyUnit: 'year',
    withinDays: null, afterFailDays: null, dueSoonDays: 30, responsibleRole: 'safety_lead', source: '', active: true,
    createdAt: '2025-01-15T15:00:00.000Z', ...over,
  }
}
const area = { kind: 'area' as const, id: 'a1', label: 'North room', tagCode: 'A-00001', areaId: 'a1' }

describe('schedules a lead adds', () => {
  it('yearly extinguisher maintenance (29 CFR 1910.157(e)(3)): a year after it was last recorded done', () => {
    const [o] = customObligations([added({ title: 'Extinguisher yearly maintenance' })], area, at('2024-06-01T12:00:00Z'),
      [{ scheduleId: 'sch-1', subjectId: 'a1', doneOn: '2025-03-10', at: at('2025-03-10T18:00:00Z'), hourMeter: null }], {}, TZ)
    expect(o).toMatchObject({ ruleKey: 'custom:sch-1', kind: 'custom', scheduleId: 'sch-1', dueOn: '2026-03-10', lastDoneOn: '2025-03-10', responsibleRole: 'safety_lead' })
    expect(obligationStateAt(o!, '2026-02-08')).toBe('due_soon')
    expect(obligationStateAt(o!, '2026-02-07')).toBe('upcoming')
  })

  it('never done: counted from when the schedule was added (later than the area\'s registration)', () => {
    const [o] = customObligations([added({})], area, at('2024-06-01T12:00:00Z'), [], {}, TZ)
    expect(o).toMatchObject({ dueOn: '2026-01-15', lastDoneOn: null })
  })

  it('the latest completion counts; a paused schedule or one about another kind owes nothing', () => {
    const done = (doneOn: string) => ({ scheduleId: 'sch-1', subjectId: 'a1', doneOn, at: at(`${doneOn}T18:00:00Z`), hourMeter: null })
    const [o] = customObligations([added({ every: 6, everyUnit: 'month' })], area, at('2024-06-01T12:00:00Z'), [done('2025-04-01'), done('2025-09-30')], {}, TZ)
    expect(o!.dueOn).toBe('2026-03-30')
    expect(customObligations([added({ active: false })], area, at('2024-06-01T12:00:00Z'), [], {}, TZ)).toEqual([])
    expect(customObligations([added({ subjectKind: 'charger' })], area, at('2024-06-01T12:00:00Z'), [], {}, TZ)).toEqual([])
  })

  it('every N charges (a battery): due the day the Nth charge since it was done ended', () => {
    const ends = ['2025-02-01T20:00:00Z', '2025-02-03T20:00:00Z', '2025-02-05T20:00:00Z'].map(at)
    const battery = { kind: 'battery' as const, id: 'b1', label: 'BAT-1', tagCode: null, areaId: null }
    const [o] = customObligations([added({ subjectKind: 'battery', rule: 'charges', every: 2, everyUnit: null })], battery, at('2024-06-01T12:00:00Z'),
      [{ scheduleId: 'sch-1', subjectId: 'b1', doneOn: '2025-02-02', at: at('2025-02-02T12:00:00Z'), hourMeter: null }], { chargeEnds: ends }, TZ)
    expect(o).toMatchObject({ dueAtCount: 2, countNow: 2, countUnit: 'charges', dueOn: '2025-02-05' })
  })
})

describe('hours of use from the truck hour meter', () => {
  const readings = [{ at: at('2025-01-10T12:00:00Z'), hours: 1010 }, { at: at('2025-02-10T12:00:00Z'), hours: 1180 }, { at: at('2025-03-10T12:00:00Z'), hours: 1262.5 }]

  it('the meter as of a moment is the latest reading at or before it', () => {
    expect(hoursAsOf(readings, null, 1000)).toBe(1262.5)
    expect(hoursAsOf(readings, at('2025-02-15T00:00:00Z'), 1000)).toBe(1180)
    expect(hoursAsOf(readings, at('2025-01-01T00:00:00Z'), 1000)).toBe(1000)
  })

  it('every 250 h from 1010 h comes due on the day a reading moves the meter to 1260 h or past it', () => {
    const p = hoursProgress(readings, 1010, 1262.5, 250, at('2025-01-10T12:00:00Z'), TZ)
    expect(p).toEqual({ unit: 'hours', atDone: 1010, now: 1262.5, reachedOn: '2025-03-10' })
    expect(hoursProgress(readings.slice(0, 2), 1010, 1180, 250, null, TZ).reachedOn).toBeNull()
  })

  it('a truck\'s hours schedule never done counts from its meter when the schedule was added; its status carries the meter now', () => {
    const truck: TruckFacts = {
      id: 't1', siteId: 's1', fleetNumber: 'MB-01', tagCode: null, homeAreaId: null, power: 'electric', outOfService: false,
      createdAt: at('2024-01-01T12:00:00Z'), registeredHours: 900, readings, lastEmissions: null, completions: [],
    }
    const schedule = added({ subjectKind: 'truck', rule: 'hours', every: 250, everyUnit: null, createdAt: '2025-01-20T00:00:00.000Z', dueSoonDays: 7 })
    const [o] = truckObligations(truck, [...defaultSchedules(), schedule], TZ)
    expect(o).toMatchObject({ dueAtCount: 1260, countNow: 1262.5, countUnit: 'hours', dueOn: '2025-03-10' })
    expect(obligationRemaining(o!)).toBe(-2.5)
    expect(truckStatusFrom(truck)).toMatchObject({ hourMeter: 1262.5, hourMeterAt: at('2025-03-10T12:00:00Z') })
    expect(truckStatusFrom({ ...truck, readings: [] })).toMatchObject({ hourMeter: 900, hourMeterAt: null })
  })
})

describe('a count rule without a date', () => {
  it('is due now once reached, upcoming before', () => {
    expect(obligationStateAt({ dueOn: null, dueAtCount: 5, countNow: 5, dueSoonDays: 1 }, '2025-01-01')).toBe('due_soon')
    expect(obligationStateAt({ dueOn: null, dueAtCount: 5, countNow: 4, dueSoonDays: 1 }, '2025-01-01')).toBe('upcoming')
    expect(chargesProgress([], null, 5, TZ)).toEqual({ unit: 'charges', atDone: 0, now: 0, reachedOn: null })
  })
})

describe('the effective record', () => {
  const rows = [
    { id: 'a', correctsId: null, v: 1 },
    { id: 'b', correctsId: 'a', v: 2 },
    { id: 'c', correctsId: 'b', v: 3 },
    { id: 'd', correctsId: null, v: 4 },
  ]
  it('a corrected row is out; a correction of a correction stands in place of both', () => {
    expect(effectiveRecords(rows).map(r => r.id)).toEqual(['c', 'd'])
    expect(standingVersion(rows, 'a')?.id).toBe('c')
    expect(standingVersion(rows, 'd')?.id).toBe('d')
    expect(standingVersion(rows, 'x')).toBeNull()
  })
})

describe('a meter read lower than at the last completion', () => {
  it('counts as no hours since, so the obligation stays upcoming instead of failing the write', () => {
    const every250h = added({ subjectKind: 'truck', rule: 'hours', every: 250, everyUnit: null })
    const truck = { kind: 'truck' as const, id: 't1', label: 'LK-07', tagCode: 'T-00007', areaId: null }
    const o = scheduleObligation(every250h, truck, {
      lastDoneOn: '2025-03-01', startOn: '2025-01-15', ruleDueOn: null,
      count: { unit: 'hours', atDone: 1300, now: 1262.5, reachedOn: null },
    })
    expect(o.dueOn).toBeNull()
    expect(obligationStateAt(o, '2025-03-10')).toBe('upcoming')
  })
})
