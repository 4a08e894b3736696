import { DEFAULT_CHECKLIST_ITEMS } from './area-checklists'
import { DEFAULT_INSPECTION_ITEMS } from './truck-inspection'

/** A follow-up's title as codes (stored beside its English title when it was opened). */
export interface FollowUpTitleWords { code: string, params: Record<string, string> }

/** How the reader's words are had: the screen's i18n, or an e-mail's (server/utils/mail-words.ts). */
export interface FollowUpWordsOf {
  t: (key: string, params?: Record<string, string | number>) => string
  has: (key: string) => boolean
  /** a calendar day ('2026-12-03') as the reader reads it */
  day: (isoDay: string) => string
}

// The default lists' English labels by key: a failed item still worded as shipped is named in the reader's words.
const INSPECTION_KEYS = new Map(Object.values(DEFAULT_INSPECTION_ITEMS).flat().map(i => [i.label, i.key]))
const CHECKLIST_KEYS = new Map(Object.values(DEFAULT_CHECKLIST_ITEMS).flat().map(i => [i.label, i.key]))

/** A failed checklist item as stored (its label): a default one still worded as shipped in the reader's words (logs.item.<key>), a lead's own as written. */
export function checklistItemName(label: string, words: Pick<FollowUpWordsOf, 't' | 'has'>): string {
  const key = CHECKLIST_KEYS.get(label)
  return key && words.has(`logs.item.${key}`) ? words.t(`logs.item.${key}`) : label
}

/**
 * A follow-up's title in the reader's words (logs.follow_ups.title_<code>): the day as the reader reads it, an
 * incident's kind and a default checklist's items translated. A title without codes (made before they were stored,
 * or written by a lead) reads as stored.
 */
export function followUpTitle(f: { title: string, titleWords?: FollowUpTitleWords | null }, words: FollowUpWordsOf): string {
  const w = f.titleWords
  const key = `logs.follow_ups.title_${w?.code}`
  if (!w || !words.has(key)) return f.title
  const p = w.params
  const named = (keys: Map<string, string>, prefix: string) => (label: string) => {
    const k = keys.get(label)
    return k && words.has(`${prefix}.${k}`) ? words.t(`${prefix}.${k}`) : label
  }
  return words.t(key, {
    ...p,
    ...(p.date ? { date: words.day(p.date) } : {}),
    ...(p.kind ? { kind: words.has(`incident.kind.${p.kind}`) ? words.t(`incident.kind.${p.kind}`) : p.kind } : {}),
    ...(w.code === 'preshift' && p.items ? { items: p.items.split('; ').map(named(INSPECTION_KEYS, 'inspect.item')).join('; ') } : {}),
    ...(w.code === 'checklist' && p.item ? { item: named(CHECKLIST_KEYS, 'logs.item')(p.item) } : {}),
  })
}
