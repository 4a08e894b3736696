import { describe, expect, it } from 'vitest'
import { DUE_KINDS, defaultSchedules } from '../../shared/utils/due-schedules'
import { dueSoonWords, groupSchedules, scheduleCountUnit, scheduleGroupOf, scheduleIntervalWords } from '../../shared/utils/schedule-words'

// The expected strings are our wording for the schedule editor; no outside source is involved.

describe('schedule interval in words', () => {
  it('one of a calendar unit reads as daily, weekly, monthly, yearly', () => {
    expect(scheduleIntervalWords({ rule: 'days', every: 1, everyUnit: 'day', withinDays: null })).toBe('daily')
    expect(scheduleIntervalWords({ rule: 'days', every: 1, everyUnit: 'week', withinDays: null })).toBe('weekly')
    expect(scheduleIntervalWords({ rule: 'days', every: 1, everyUnit: 'month', withinDays: null })).toBe('monthly')
    expect(scheduleIntervalWords({ rule: 'days', every: 1, everyUnit: 'year', withinDays: null })).toBe('yearly')
  })

  it('more than one counts the units; a missing unit counts days', () => {
    expect(scheduleIntervalWords({ rule: 'days', every: 31, everyUnit: 'day', withinDays: null })).toBe('every 31 days')
    expect(scheduleIntervalWords({ rule: 'days', every: 3, everyUnit: 'month', withinDays: null })).toBe('every 3 months')
    expect(scheduleIntervalWords({ rule: 'days', every: 3, everyUnit: 'year', withinDays: null })).toBe('every 3 years')
    expect(scheduleIntervalWords({ rule: 'days', every: 2, everyUnit: null, withinDays: null })).toBe('every 2 days')
  })

  it('a count rule names the count and the days cap, whichever comes first', () => {
    expect(scheduleIntervalWords({ rule: 'charges', every: 5, everyUnit: null, withinDays: 7 })).toBe('every 5 charges or 7 days')
    expect(scheduleIntervalWords({ rule: 'charges', every: 1, everyUnit: null, withinDays: 1 })).toBe('every charge or 1 day')
    expect(scheduleIntervalWords({ rule: 'charges', every: 10, everyUnit: null, withinDays: null })).toBe('every 10 charges')
    expect(scheduleIntervalWords({ rule: 'hours', every: 250, everyUnit: null, withinDays: 30 })).toBe('every 250 hours or 30 days')
    expect(scheduleIntervalWords({ rule: 'hours', every: 1, everyUnit: null, withinDays: null })).toBe('every hour of use')
  })

  it('a date rule and a missing interval', () => {
    expect(scheduleIntervalWords({ rule: 'date_rule', every: null, everyUnit: null, withinDays: null })).toBe('on the date its rule gives')
    expect(scheduleIntervalWords({ rule: 'days', every: null, everyUnit: 'day', withinDays: null })).toBe('no interval set')
  })

  it('the default battery watering in words', () => {
    const watering = defaultSchedules().find(s => s.kind === 'battery_watering')!
    expect(scheduleIntervalWords(watering)).toBe(`every ${watering.every} charges or ${watering.withinDays} days`)
  })
})

describe('due-soon window and count units in words', () => {
  it('zero is the day itself, then days before', () => {
    expect(dueSoonWords(0)).toBe('on the day')
    expect(dueSoonWords(1)).toBe('1 day before')
    expect(dueSoonWords(30)).toBe('30 days before')
  })

  it('count units only for count rules', () => {
    expect(scheduleCountUnit('charges')).toBe('charges')
    expect(scheduleCountUnit('hours')).toBe('hours')
    expect(scheduleCountUnit('days')).toBeNull()
    expect(scheduleCountUnit('date_rule')).toBeNull()
  })
})

describe('schedules grouped by subject', () => {
  it('every kind has a group; logs and follow-ups go with areas; one a lead added goes with its subject', () => {
    for (const kind of DUE_KINDS) expect(scheduleGroupOf({ kind })).toBeTruthy()
    expect(scheduleGroupOf({ kind: 'battery_watering' })).toBe('battery')
    expect(scheduleGroupOf({ kind: 'charger_inspection' })).toBe('charger')
    expect(scheduleGroupOf({ kind: 'emissions_test' })).toBe('truck')
    expect(scheduleGroupOf({ kind: 'cylinder_requalification' })).toBe('cylinder')
    expect(scheduleGroupOf({ kind: 'log_review' })).toBe('area')
    expect(scheduleGroupOf({ kind: 'follow_up' })).toBe('area')
    expect(scheduleGroupOf({ kind: 'operator_evaluation' })).toBe('person')
    expect(scheduleGroupOf({ kind: 'custom', subjectKind: 'charger' })).toBe('charger')
    expect(scheduleGroupOf({ kind: 'custom', subjectKind: 'site' })).toBe('area')
  })

  it('groups come in a fixed order, keep the given order inside and leave out empty groups', () => {
    const groups = groupSchedules(defaultSchedules())
    expect(groups.map(g => g.label)).toEqual(['Batteries', 'Chargers', 'Trucks', 'LP cylinders', 'Areas and logs', 'People'])
    expect(groups[0]!.items.map(s => s.kind)).toEqual(['battery_watering', 'battery_equalize', 'electrolyte_full_check'])
    expect(groups.flatMap(g => g.items).length).toBe(DUE_KINDS.length - 1)
    expect(groupSchedules([{ kind: 'co_monitoring' as const }]).map(g => g.key)).toEqual(['area'])
  })
})
