import type { ChecklistAreaKind, ChecklistItem } from '#shared/utils/area-checklists'
import { AREA_LOG_CAUTIONS, DEFAULT_CHECKLIST_ITEMS, DEFAULT_CHECKLIST_TITLES } from '#shared/utils/area-checklists'

// The default checklists' English words by item key, to tell an unedited item from one a lead has reworded.
const DEFAULT_WORDS = new Map(Object.values(DEFAULT_CHECKLIST_ITEMS).flat().map(i => [i.key, i]))
const TITLE_KEYS = new Map(Object.entries(DEFAULT_CHECKLIST_TITLES).flatMap(([kind, byCadence]) =>
  Object.entries(byCadence).map(([cadence, title]) => [title, `${kind}_${cadence}`])))

// The area log in the reader's language: a default item still worded as shipped, the default titles and the
// cautions have words in every language (logs.item.<key>, logs.item_hint.<key>, logs.template_title.<kind>_<cadence>,
// logs.caution.<kind>_<n>); an item or title a lead wrote is shown as the lead wrote it.
export function useChecklistWords() {
  const { t, te } = useNuxtApp().$i18n
  const known = (item: ChecklistItem) => DEFAULT_WORDS.get(item.key)?.label === item.label && te(`logs.item.${item.key}`)
  return {
    itemLabel: (item: ChecklistItem) => (known(item) ? t(`logs.item.${item.key}`) : item.label),
    itemHint: (item: ChecklistItem) => (item.hint && known(item) && DEFAULT_WORDS.get(item.key)?.hint === item.hint && te(`logs.item_hint.${item.key}`) ? t(`logs.item_hint.${item.key}`) : item.hint),
    title: (title: string) => {
      const key = TITLE_KEYS.get(title)
      return key && te(`logs.template_title.${key}`) ? t(`logs.template_title.${key}`) : title
    },
    /** the area's cautions as the server sent them (English), in the reader's words when they are the default ones */
    cautions: (list: readonly string[]): string[] => {
      const kind = (Object.keys(AREA_LOG_CAUTIONS) as ChecklistAreaKind[]).find(k => AREA_LOG_CAUTIONS[k].join('\n') === list.join('\n'))
      return kind ? list.map((said, n) => (te(`logs.caution.${kind}_${n + 1}`) ? t(`logs.caution.${kind}_${n + 1}`) : said)) : [...list]
    },
  }
}
