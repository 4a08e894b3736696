import { describe, it, expect } from 'vitest'
import {
  BUILT_IN_DUE_KINDS, defaultSchedules, effectiveSchedules, obligationActionPath,
  type ScheduleDefinition, type StoredSchedule,
} from '../../shared/utils/due-schedules'
import { nextDueOn, obligationStateFor } from '../../shared/utils/due-rules'
import { firstRequalificationDue, nextRequalificationDue } from '../../shared/utils/requalification'
import { localDate, monthlyAtMost31Days } from '../../shared/utils/due-dates'

const defaults = defaultSchedules()
const schedule = (kind: ScheduleDefinition['kind'], over: Partial<ScheduleDefinition> = {}) => ({ ...defaults.find(s => s.kind === kind)!, ...over })

describe('default schedules and their sources', () => {
  it('every built-in obligation kind has one default with a source', () => {
    expect(defaults.map(s => s.kind).sort()).toEqual([...BUILT_IN_DUE_KINDS].sort())
    for (const s of defaults) expect(s.source.length).toBeGreaterThan(10)
  })

  it('eyewash weekly (ANSI/ISEA Z358.1-2014)', () => {
    expect(schedule('eyewash_activation')).toMatchObject({ rule: 'days', every: 1, everyUnit: 'week' })
    expect(schedule('eyewash_activation').source).toContain('ANSI/ISEA Z358.1-2014')
  })

  it('extinguisher monthly as at most 31 days (29 CFR 1910.157(e)(2); NFPA 10)', () => {
    expect(schedule('extinguisher_visual')).toMatchObject({ rule: 'days', every: 31, everyUnit: 'day' })
    expect(schedule('extinguisher_visual').source).toContain('1910.157(e)(2)')
  })

  it('operator evaluation every three years (29 CFR 1910.178(l)(4)(iii)); requalification is a date rule (49 CFR 180.209)', () => {
    expect(schedule('operator_evaluation')).toMatchObject({ every: 3, everyUnit: 'year' })
    expect(schedule('cylinder_requalification').rule).toBe('date_rule')
    expect(schedule('cylinder_requalification').source).toContain('49 CFR 180.209')
  })

  it('watering and equalize: every 5 charges or 7 days (common practice); a site row changes them, not its settings', () => {
    expect(schedule('battery_watering')).toMatchObject({ rule: 'charges', every: 5, withinDays: 7 })
    expect(schedule('battery_equalize')).toMatchObject({ rule: 'charges', every: 5, withinDays: 7 })
    const row: StoredSchedule = { ...stored(schedule('battery_watering')), every: 3, withinDays: 4, rule: 'days' }
    expect(effectiveSchedules(defaults, [row]).find(x => x.kind === 'battery_watering')).toMatchObject({ rule: 'charges', every: 3, withinDays: 4, id: 'row-1' })
  })

  it('the emissions test is due yearly and 30 days after a failed test unless the site says otherwise', () => {
    expect(schedule('emissions_test')).toMatchObject({ every: 1, everyUnit: 'year', afterFailDays: 30 })
    const row: StoredSchedule = { ...stored(schedule('emissions_test')), every: 6, everyUnit: 'month', afterFailDays: 14 }
    expect(effectiveSchedules(defaults, [row]).find(x => x.kind === 'emissions_test')).toMatchObject({ every: 6, everyUnit: 'month', afterFailDays: 14 })
  })

  it('schedules a lead added follow the built-in ones, each with its subject kind', () => {
    const added: StoredSchedule = { ...stored(schedule('eyewash_activation')), id: 'row-9', kind: 'custom', title: 'Eyewash yearly inspection', subjectKind: 'area', every: 1, everyUnit: 'year' }
    const merged = effectiveSchedules(defaults, [added])
    expect(merged.at(-1)).toMatchObject({ kind: 'custom', id: 'row-9', subjectKind: 'area', rule: 'days', every: 1, everyUnit: 'year' })
    expect(merged.length).toBe(defaults.length + 1)
  })

  it('a site row replaces the default of its kind; a date rule stays a date rule', () => {
    const rows: StoredSchedule[] = [
      { ...stored(schedule('eyewash_activation')), every: 2, dueSoonDays: 0, responsibleRole: 'safety_lead' },
      { ...stored(schedule('cylinder_requalification')), rule: 'days' },
    ]
    const merged = effectiveSchedules(defaults, rows)
    expect(merged.find(s => s.kind === 'eyewash_activation')).toMatchObject({ every: 2, responsibleRole: 'safety_lead' })
    expect(merged.find(s => s.kind === 'cylinder_requalification')!.rule).toBe('date_rule')
    expect(merged.find(s => s.kind === 'area_checklist')).toEqual(schedule('area_checklist'))
  })

  function stored(s: ScheduleDefinition): StoredSchedule {
    return { ...s, id: 'row-1', subjectKind: null, createdAt: null }
  }
})

describe('next due date for each rule kind', () => {
  it('days: a monthly extinguisher check on Jan 31 is due Mar 3, 31 days on (NFPA 10), not Feb 28', () => {
    const next = nextDueOn(schedule('extinguisher_visual'), { lastDoneOn: '2026-01-31', startOn: '2025-01-01' })
    expect(next.dueOn).toBe('2026-03-03')
    expect(next.dueOn).toBe(monthlyAtMost31Days('2026-01-31'))
  })

  it('days: weekly eyewash from a Sunday across a DST change is the next Sunday', () => {
    expect(nextDueOn(schedule('eyewash_activation'), { lastDoneOn: '2026-03-08', startOn: '2026-01-01' }).dueOn).toBe('2026-03-15')
  })

  it('days: never done counts from the start date', () => {
    expect(nextDueOn(schedule('area_checklist'), { lastDoneOn: null, startOn: '2028-02-28' }).dueOn).toBe('2028-02-29')
  })

  it('days in months: quarterly CO monitoring from Aug 31 is due Nov 30 (month end clamps)', () => {
    expect(nextDueOn(schedule('co_monitoring'), { lastDoneOn: '2026-08-31', startOn: '2026-01-01' }).dueOn).toBe('2026-11-30')
  })

  it('days in years: an evaluation on a leap day is due Feb 28 three years on', () => {
    expect(nextDueOn(schedule('operator_evaluation'), { lastDoneOn: '2028-02-29', startOn: '2028-01-01' }).dueOn).toBe('2031-02-28')
  })

  it('charges: 3 of 5 charges since watering — the 7-day cap gives the date, 2 charges left', () => {
    expect(nextDueOn(schedule('battery_watering'), { lastDoneOn: '2026-02-25', startOn: '2026-01-01', countSinceDone: 3 }))
      .toEqual({ dueOn: '2026-03-04', remaining: 2 })
  })

  it('charges: the 5th charge reached on Feb 27 makes it due that day, before the cap', () => {
    const next = nextDueOn(schedule('battery_watering'), { lastDoneOn: '2026-02-25', startOn: '2026-01-01', countSinceDone: 5, countReachedOn: '2026-02-27' })
    expect(next).toEqual({ dueOn: '2026-02-27', remaining: 0 })
    expect(obligationStateFor(next, '2026-02-27', 1)).toBe('due_soon')
    expect(obligationStateFor(next, '2026-02-28', 1)).toBe('overdue')
  })

  it('charges across a leap day: watered Feb 25, 2028, the 7-day cap is Mar 3', () => {
    expect(nextDueOn(schedule('battery_watering'), { lastDoneOn: '2028-02-25', startOn: '2028-01-01', countSinceDone: 0 }).dueOn).toBe('2028-03-03')
  })

  it('charges in the site time zone: a charge ending 00:30 UTC on Mar 1 is Feb 29 in Chicago (2028 is a leap year)', () => {
    const reached = localDate(new Date('2028-03-01T00:30:00Z'), 'America/Chicago')
    expect(reached).toBe('2028-02-29')
    expect(nextDueOn(schedule('battery_equalize'), { lastDoneOn: '2028-02-26', startOn: '2028-01-01', countSinceDone: 6, countReachedOn: reached }).dueOn).toBe('2028-02-29')
  })

  it('hours: every 250 h, 260 h since — due now with no date cap', () => {
    const next = nextDueOn({ rule: 'hours', every: 250, everyUnit: null, withinDays: null }, { lastDoneOn: '2026-01-01', startOn: '2026-01-01', countSinceDone: 260, countReachedOn: null })
    expect(next).toEqual({ dueOn: null, remaining: -10 })
    expect(obligationStateFor(next, '2026-05-01', 7)).toBe('due_soon')
    expect(obligationStateFor(nextDueOn({ rule: 'hours', every: 250, everyUnit: null, withinDays: null }, { lastDoneOn: null, startOn: '2026-01-01', countSinceDone: 100 }), '2026-05-01', 7)).toBe('upcoming')
  })

  it('date rule: a cylinder stamped 02-16 is due 2028-02-29, 12 years on to the end of the month (49 CFR 180.209)', () => {
    const ruleDueOn = firstRequalificationDue(2016, 2)
    expect(ruleDueOn).toBe('2028-02-29')
    expect(nextDueOn(schedule('cylinder_requalification'), { lastDoneOn: null, startOn: '2016-02-01', ruleDueOn }).dueOn).toBe('2028-02-29')
  })

  it('date rule: external visual on 2024-02-10 is next due 2029-02-28 (5 years, 49 CFR 180.209)', () => {
    expect(nextRequalificationDue('2024-02-10', 'external_visual')).toBe('2029-02-28')
  })

  it('refuses a day rule without an interval and a date rule without its date', () => {
    expect(() => nextDueOn({ rule: 'days', every: null, everyUnit: 'day', withinDays: null }, { lastDoneOn: null, startOn: '2026-01-01' })).toThrow(RangeError)
    expect(() => nextDueOn(schedule('cylinder_requalification'), { lastDoneOn: null, startOn: '2026-01-01' })).toThrow(RangeError)
  })
})

describe('one tap to the form that closes it', () => {
  it('links to the battery, fuel and area forms', () => {
    const battery = { kind: 'battery' as const, id: 'b1', label: 'BAT-1', tagCode: 'B-00012' }
    expect(obligationActionPath('battery_watering', battery).to).toBe('/check?battery=B-00012')
    expect(obligationActionPath('battery_equalize', battery).to).toBe('/charge?battery=B-00012')
    expect(obligationActionPath('emissions_test', { kind: 'truck', id: 't1', label: 'FX-09', tagCode: 'T-00009' }).to).toBe('/emissions?truck=t1')
    expect(obligationActionPath('eyewash_activation', { kind: 'area', id: 'a1', label: 'North', tagCode: null }).to).toBe('/logs?area=a1')
    expect(obligationActionPath('log_review', { kind: 'log', id: 'l1', label: 'North', tagCode: null, areaId: 'a1', periodStart: '2026-03-02' }).to)
      .toBe('/logs?area=a1&date=2026-03-02&review=1')
  })
})
