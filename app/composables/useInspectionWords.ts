import type { InspectionItem, InspectionPower } from '#shared/utils/truck-inspection'
import { DEFAULT_INSPECTION_ITEMS, DEFAULT_INSPECTION_TITLES, holdReasonParts } from '#shared/utils/truck-inspection'

// The default checklist's English words by item key, to tell an unedited item from one a lead has reworded.
const DEFAULT_WORDS = new Map(Object.values(DEFAULT_INSPECTION_ITEMS).flat().map(i => [i.key, i]))
const DEFAULT_KEYS = new Map(Object.values(DEFAULT_INSPECTION_ITEMS).flat().map(i => [i.label, i.key]))

// The pre-shift checklist in the reader's language: an item still worded as the default list has words in
// every language (inspect.item.<key>); an item a lead wrote or reworded is shown as the lead wrote it.
export function useInspectionWords() {
  const { t, te } = useNuxtApp().$i18n
  const known = (item: InspectionItem) => DEFAULT_WORDS.get(item.key)?.label === item.label && te(`inspect.item.${item.key}`)
  /** failed items as stored ("Horn; Brakes"): each default item in the reader's words, a lead's own as written */
  const failedItems = (labels: string[]) => labels.map((label) => {
    const key = DEFAULT_KEYS.get(label)
    return key && te(`inspect.item.${key}`) ? t(`inspect.item.${key}`) : label
  }).join('; ')
  return {
    failedItems,
    itemLabel: (item: InspectionItem) => (known(item) ? t(`inspect.item.${item.key}`) : item.label),
    itemHint: (item: InspectionItem) => (item.hint && known(item) && te(`inspect.hint.${item.key}`) ? t(`inspect.hint.${item.key}`) : item.hint),
    /** A truck's hold reason (stored in English): a failed pre-shift check said in the reader's words, its default items named; other words as stored. */
    holdReason: (reason: string) => {
      const parts = holdReasonParts(reason)
      return parts ? t('inspect.hold_failed', { name: parts.name, items: failedItems(parts.items) }) : reason
    },
    templateTitle: (title: string) => {
      const power = (Object.keys(DEFAULT_INSPECTION_TITLES) as InspectionPower[]).find(p => DEFAULT_INSPECTION_TITLES[p] === title)
      return power ? t(`inspect.template_${power}`) : title
    },
  }
}
