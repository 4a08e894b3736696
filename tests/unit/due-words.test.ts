import { describe, expect, it } from 'vitest'
import { dueDetail, dueSubjectName, dueTaskName } from '../../server/utils/due-words'
import { mailDay, mailWords } from '../../server/utils/mail-words'
import type { Obligation } from '../../server/utils/due/list'

// A due-list row as the daily digest and the calendar feed name it: built-in tasks and coded details in the
// reader's language, a lead's own task and an uncoded detail as written.
const row = (over: Partial<Obligation>): Obligation => ({
  kind: 'battery_watering', what: 'Battery watering', detail: '7 of 6 charges since watering', detailWords: { code: 'charges_since_watering', params: { now: 7, every: 6 } },
  subject: { kind: 'battery', label: 'B-00012' },
  ...over,
} as Obligation)

describe('due-list rows away from the screen', () => {
  it('in English, as the server wrote them', () => {
    const t = mailWords('en')
    const o = row({})
    expect(dueTaskName(t, o)).toBe('Battery watering')
    expect(dueDetail(t, mailDay('en'), o)).toBe('7 of 6 charges since watering')
    expect(dueSubjectName(t, mailDay('en'), o)).toBe('B-00012')
  })

  it('in Spanish, the built-in task and the coded detail from the locale file', () => {
    const t = mailWords('es')
    const o = row({})
    expect(dueTaskName(t, o)).toBe('Reponer agua a baterías')
    expect(dueDetail(t, mailDay('es'), o)).toBe('7 de 6 cargas desde que se repuso agua')
  })

  it('a lead\'s own task, an unknown detail code and an uncoded detail stay as written', () => {
    const t = mailWords('es')
    expect(dueTaskName(t, row({ kind: 'custom', what: 'Extinguisher check' }))).toBe('Extinguisher check')
    expect(dueDetail(t, mailDay('es'), row({ detail: 'As stored', detailWords: { code: 'no_such_code' } }))).toBe('As stored')
    expect(dueDetail(t, mailDay('es'), row({ detail: 'As stored', detailWords: null }))).toBe('As stored')
  })

  it('dates as the reader\'s language writes them (Intl through the runtime, en-US and es-US)', () => {
    expect(mailDay('en')('2026-12-03')).toBe('Dec 3, 2026')
    expect(mailDay('es')('2026-12-03')).toBe('3 dic 2026')
    expect(mailDay(null)('not a day')).toBe('not a day')
    // an alert's words: a day parameter as a date, other words as given
    expect(mailWords('es', { days: true })('mail.follow_up_open', { on: '2026-12-07' })).toContain('7 dic 2026')
    expect(mailWords('es')('mail.follow_up_open', { on: '2026-12-07' })).toContain('2026-12-07')
    const es = mailWords('es')
    expect(dueDetail(es, mailDay('es'), row({ detail: 'x', detailWords: { code: 'retraining_called', params: { on: '2026-11-30' } } }))).toBe('Se pidió reentrenamiento el 30 nov 2026')
    expect(dueSubjectName(es, mailDay('es'), row({ kind: 'log_review', subject: { kind: 'log', label: 'North charge room · 2026-11-30', periodStart: '2026-11-30' } as Obligation['subject'] }))).toBe('North charge room · 30 nov 2026')
  })
})
