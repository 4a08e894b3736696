/** A follow-up's title as codes (stored beside its English title when it was opened). */
export interface FollowUpTitleWords { code: string, params: Record<string, string> }

// A follow-up's title in the reader's words (logs.follow_ups.title_<code>): the day in date words, an
// incident's kind and a pre-shift check's default items translated. A title without codes (made before
// they were stored, or written by a lead) reads as stored.
export function useFollowUpWords() {
  const { t, te } = useNuxtApp().$i18n
  const { day } = useLocaleFormat()
  const { failedItems } = useInspectionWords()
  const { labelWords } = useChecklistWords()
  return {
    title: (f: { title: string, titleWords?: FollowUpTitleWords | null }): string => {
      const w = f.titleWords
      const key = `logs.follow_ups.title_${w?.code}`
      if (!w || !te(key)) return f.title
      const p = w.params
      return t(key, {
        ...p,
        ...(p.date ? { date: day(p.date) } : {}),
        ...(p.kind ? { kind: te(`incident.kind.${p.kind}`) ? t(`incident.kind.${p.kind}`) : p.kind } : {}),
        ...(w.code === 'preshift' && p.items ? { items: failedItems(p.items.split('; ')) } : {}),
        ...(w.code === 'checklist' && p.item ? { item: labelWords(p.item) } : {}),
      })
    },
  }
}
