import { describe, expect, it } from 'vitest'
import { AREA_LOG_CAUTIONS, DEFAULT_CHECKLIST_ITEMS, DEFAULT_CHECKLIST_TITLES } from '../../shared/utils/area-checklists'
import { useChecklistWords } from '../../app/composables/useChecklistWords'
import { useFollowUpWords } from '../../app/composables/useFollowUpWords'
import { useHistoryWords, type HistoryLineWords } from '../../app/composables/useHistoryWords'
import en from '../../i18n/locales/en.json'

// The area log in the reader's words: the default checklists, their titles and the area cautions have words in
// every language; an item a lead reworded stays as written.
const withSpanish = async (body: () => void) => {
  const { $i18n } = useNuxtApp()
  await $i18n.setLocale('es')
  try {
    body()
  }
  finally {
    await $i18n.setLocale('en')
  }
}

describe('checklist words', () => {
  it('the English words are the shared lists\' own, so a stored default is recognised', () => {
    for (const item of Object.values(DEFAULT_CHECKLIST_ITEMS).flat()) {
      expect(en.logs.item[item.key as keyof typeof en.logs.item]).toBe(item.label)
      // a hint that is only a citation reads the same in every language
      if (item.hint && !/^29 CFR [\d.()a-z]+$/.test(item.hint)) expect(en.logs.item_hint[item.key as keyof typeof en.logs.item_hint]).toBe(item.hint)
    }
    for (const [kind, byCadence] of Object.entries(DEFAULT_CHECKLIST_TITLES)) {
      for (const [cadence, title] of Object.entries(byCadence)) expect(en.logs.template_title[`${kind}_${cadence}` as keyof typeof en.logs.template_title]).toBe(title)
    }
    for (const [kind, list] of Object.entries(AREA_LOG_CAUTIONS)) {
      list.forEach((said, n) => expect(en.logs.caution[`${kind}_${n + 1}` as keyof typeof en.logs.caution]).toBe(said))
    }
  })

  it('in Spanish: a default item, its hint, the title and the cautions translated; a lead\'s wording kept', async () => {
    const eyewash = DEFAULT_CHECKLIST_ITEMS.charging_area[0]!
    await withSpanish(() => {
      const words = useChecklistWords()
      expect(words.itemLabel(eyewash)).toBe('Lavaojos probado y a la mano')
      expect(words.itemHint(eyewash)).toBe('Se activa cada semana; se llega en 10 segundos o menos (ANSI/ISEA Z358.1-2014).')
      expect(words.itemLabel({ ...eyewash, label: 'Eyewash at bay 3 flushed' })).toBe('Eyewash at bay 3 flushed')
      expect(words.title('Fuel station — daily check')).toBe('Estación de gas LP — revisión diaria')
      expect(words.title('Night shift walk-round')).toBe('Night shift walk-round')
      expect(words.cautions(AREA_LOG_CAUTIONS.charging_area)[1]).toBe('EPP para electrolito: gafas de seguridad y careta, guantes resistentes al ácido y mandil.')
      expect(words.cautions(['A caution a site wrote'])).toEqual(['A caution a site wrote'])
      // a follow-up opened by a failed item names the item in Spanish
      const { title } = useFollowUpWords()
      expect(title({ title: 'x', titleWords: { code: 'checklist', params: { area: 'North charge room', item: eyewash.label, date: '2026-12-02' } } }))
        .toBe('North charge room: Lavaojos probado y a la mano — falló el 2 dic 2026')
    })
  })

  it('a timeline in Spanish: failed pre-shift items (an item a lead wrote as written) and a refused refill\'s reasons', async () => {
    const line: HistoryLineWords = { title: 'Pre-shift check failed: out of service', titleWords: { code: 'preshift_out_of_service' }, detail: 'x', detailWords: [{ code: 'preshift_failed_items', params: { checks: 'Service brake stops the truck smoothly; Gate chain on' } }, { code: 'hour_meter', params: { hours: 120 } }], who: 'A' }
    expect(useHistoryWords().detail(line)).toMatch(/^Service brake stops the truck smoothly; Gate chain on · /)
    await withSpanish(() => {
      const words = useHistoryWords()
      expect(words.title(line)).not.toContain('Pre-shift')
      expect(words.detail(line)).toMatch(/^El freno de servicio detiene el montacargas sin jalones; Gate chain on · /)
      // a refused refill's reason by its refusal code, the pre-fill item by its key; an uncoded one as stored
      const refused: HistoryLineWords = { title: 'Refill refused', detailWords: [{ code: 'refusal_reason', params: { items: ['dents'], refusal: 'fill_inspection_failed', said: 'Failed pre-fill inspection: No dents. Do not fill this cylinder.' } }, { code: 'refusal_reason', params: { refusal: 'refill_refused', said: 'As stored' } }], who: 'A' }
      expect(words.detail(refused)).toBe('No pasó la inspección antes del llenado: Sin abolladuras. No llene este cilindro. · As stored')
    })
  })
})
