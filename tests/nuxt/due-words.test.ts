import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import { createPinia, setActivePinia } from 'pinia'
import { useDueWords } from '../../app/composables/useDueWords'
import { useLocaleFormat } from '../../app/composables/useLocaleFormat'
import { useSessionStore } from '../../app/stores/session'
import DueFilters from '../../app/components/due/DueFilters.vue'

// The due list's words: an area log's day in the reader's date words, and the Task filter offering each
// schedule a lead added by its title.
const log = (label: string, periodStart: string | null) => ({ subject: { kind: 'log' as const, id: 'l1', label, tagCode: null, areaId: 'a1', periodStart } })

describe('due words', () => {
  it('an area log reads its day as a date, not as ISO; other subjects keep their name', () => {
    const words = useDueWords()
    expect(words.subject(log('North charge room · 2026-11-30', '2026-11-30'))).toBe('North charge room · Nov 30, 2026')
    expect(words.subject(log('North charge room', null))).toBe('North charge room')
    expect(words.subject({ subject: { kind: 'battery', id: 'b1', label: 'QB24M-1175 · 2026-11-30', tagCode: 'B-00025', areaId: null, periodStart: '2026-11-30' } })).toBe('QB24M-1175 · 2026-11-30')
  })

  it('a follow-up reads its title in the reader\'s words when it came with codes, its day as a date', async () => {
    const words = useDueWords()
    const followUp = (labelWords: { code: string, params: Record<string, string> } | null) => ({ subject: { kind: 'follow_up' as const, id: 'f1', label: 'Truck MB-01: Service brake stops the truck smoothly — failed pre-shift check on 2026-12-03', tagCode: null, labelWords } })
    const coded = followUp({ code: 'preshift', params: { truck: 'MB-01', items: 'Service brake stops the truck smoothly', date: '2026-12-03' } })
    expect(words.subject(coded)).toBe('Truck MB-01: Service brake stops the truck smoothly — failed pre-shift check on Dec 3, 2026')
    expect(words.subject(followUp(null))).toBe(coded.subject.label)
    const { $i18n } = useNuxtApp()
    try {
      await $i18n.setLocale('es')
      expect(useDueWords().subject(coded)).toBe('Montacargas MB-01: El freno de servicio detiene el montacargas sin jalones — falló la inspección antes del turno el 3 dic 2026')
    }
    finally {
      await $i18n.setLocale('en')
    }
  })

  it('the Task filter lists each lead-added schedule by its title and sets kind and schedule together', async () => {
    setActivePinia(createPinia())
    const schedules = [{ id: '7b0c6a3e-5a0b-4c41-9a57-1d1f0f4b2c11', title: 'Battery cable and plug inspection' }, { id: '9d2e4f10-1a2b-4c3d-8e9f-0a1b2c3d4e5f', title: 'Spill kit restock check' }]
    const picked: unknown[] = []
    const wrapper = await mountSuspended(DueFilters, { props: { 'modelValue': { kind: undefined }, schedules, 'onUpdate:modelValue': (v: unknown) => picked.push(v) } })
    const select = wrapper.find('[data-testid="due-filter-kind"]')
    expect(select.findAll('optgroup option').map(o => o.text())).toEqual(['Every schedule a lead added', ...schedules.map(s => s.title)])
    await select.setValue(`custom:${schedules[1]!.id}`)
    expect(picked.at(-1)).toMatchObject({ kind: 'custom', schedule: schedules[1]!.id })
    await select.setValue('battery_watering')
    expect(picked.at(-1)).toMatchObject({ kind: 'battery_watering', schedule: undefined })
  })

  it('a moment reads on the site\'s clock whatever the reader\'s own zone; a calendar day stays the day it names', () => {
    setActivePinia(createPinia())
    const session = useSessionStore()
    session.me = { user: { id: 'u1', email: 'lead@example.test', name: 'Lee Lead' }, memberships: [{ siteId: 's1', siteName: 'North Yard', roles: ['facilities_lead'] }], sites: [{ id: 's1', name: 'North Yard', timeZone: 'America/Chicago', unitSystem: 'us' }] }
    const { time, dateTime, day, today } = useLocaleFormat()
    // 20:00 UTC is 2:00 PM in Chicago on 4 December (CST, UTC-6; the IANA tz database via the runtime's Intl)
    expect(time('2026-12-04T20:00:00Z')).toBe('2:00 PM')
    expect(dateTime('2026-12-05T03:30:00Z')).toBe('Dec 4, 2026, 9:30 PM')
    expect(day('2026-12-04')).toBe('Dec 4, 2026')
    // a form's "today" on the evening shift is the site's 4 December, though UTC has reached the 5th
    expect(today(new Date('2026-12-05T03:30:00Z'))).toBe('2026-12-04')
    expect(today(new Date('2026-12-05T06:30:00Z'))).toBe('2026-12-05')
  })
})
