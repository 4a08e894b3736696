import { describe, expect, it } from 'vitest'
import { dueDetail, dueSubjectName, dueTaskName } from '../../server/utils/due-words'
import { mailWords } from '../../server/utils/mail-words'
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
    expect(dueDetail(t, o)).toBe('7 of 6 charges since watering')
    expect(dueSubjectName(t, o)).toBe('B-00012')
  })

  it('in Spanish, the built-in task and the coded detail from the locale file', () => {
    const t = mailWords('es')
    const o = row({})
    expect(dueTaskName(t, o)).toBe('Reponer agua a baterías')
    expect(dueDetail(t, o)).toBe('7 de 6 cargas desde que se repuso agua')
  })

  it('a lead\'s own task, an unknown detail code and an uncoded detail stay as written', () => {
    const t = mailWords('es')
    expect(dueTaskName(t, row({ kind: 'custom', what: 'Extinguisher check' }))).toBe('Extinguisher check')
    expect(dueDetail(t, row({ detail: 'As stored', detailWords: { code: 'no_such_code' } }))).toBe('As stored')
    expect(dueDetail(t, row({ detail: 'As stored', detailWords: null }))).toBe('As stored')
  })
})
