import { describe, expect, it } from 'vitest'
import { checklistItemName, followUpTitle } from '../../shared/utils/follow-up-words'
import { mailWords } from '../../server/utils/mail-words'

// A follow-up's title as an e-mail says it (the daily digest): the recipient's language from the stored codes,
// dates as the digest writes them (ISO), a title with no codes as stored.
const said = (language: string, f: Parameters<typeof followUpTitle>[0]) => {
  const t = mailWords(language)
  return followUpTitle(f, { t, has: key => t(key) !== key, day: d => d })
}

describe('follow-up titles in an e-mail', () => {
  const preshift = { title: 'Truck MB-02: Headlights and warning lights work — failed pre-shift check on 2026-12-04', titleWords: { code: 'preshift', params: { truck: 'MB-02', items: 'Headlights and warning lights work', date: '2026-12-04' } } }
  const checklist = { title: 'Dock 9 fuel cage: Cage locked — failed on 2026-12-01', titleWords: { code: 'checklist', params: { area: 'Dock 9 fuel cage', item: 'Cage locked', date: '2026-12-01' } } }

  it('in English it reads as the stored title', () => {
    expect(said('en', preshift)).toBe(preshift.title)
    expect(said('en', checklist)).toBe(checklist.title)
  })

  it('in Spanish the frame and the default items are Spanish; the area keeps its name', () => {
    expect(said('es', preshift)).toBe('Montacargas MB-02: Faros y luces de alerta funcionan — falló la inspección antes del turno el 2026-12-04')
    expect(said('es', checklist)).toBe('Dock 9 fuel cage: Jaula cerrada con llave — falló el 2026-12-01')
  })

  it('an item a lead wrote, an unknown code, no codes: as written', () => {
    expect(said('es', { ...checklist, titleWords: { ...checklist.titleWords, params: { ...checklist.titleWords.params, item: 'Gate chain on' } } })).toBe('Dock 9 fuel cage: Gate chain on — falló el 2026-12-01')
    expect(said('es', { title: 'Stored words', titleWords: { code: 'no_such_code', params: {} } })).toBe('Stored words')
    expect(said('es', { title: 'Stored words' })).toBe('Stored words')
  })

  it('a failed checklist item in an alert: a default one in the recipient\'s words, a lead\'s as written', () => {
    const es = mailWords('es')
    const words = { t: es, has: (key: string) => es(key) !== key }
    expect(checklistItemName('Eyewash flushed and reachable', words)).toBe('Lavaojos probado y a la mano')
    expect(checklistItemName('Gate chain on', words)).toBe('Gate chain on')
  })
})
