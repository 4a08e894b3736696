import type { ReasonParams } from '#shared/utils/battery-fit'

/** A timeline line as the history route sends it: English words, and the same as codes where the server has them. */
export interface HistoryLineWords {
  title: string
  titleWords?: { code: string, params?: ReasonParams }
  detail?: string | null
  detailWords?: { code: string, params?: ReasonParams }[]
  who: string
  record?: { correctsId: string | null }
}

// An asset's timeline in the reader's language and the site's units (`history.<code>`, values in stored units
// shown as the site reads them); the server's English words for a line it sends uncoded.
export function useHistoryWords() {
  const { t } = useNuxtApp().$i18n
  const { codedText, reasonText } = useReasonWords()
  // a pre-shift check's failed items (stored as their labels): the default ones in the reader's words
  const { failedItems } = useInspectionWords()
  /** one coded part of a line's detail; a refused refill's reason by its refusal code (`refusal.<code>`), its stored English otherwise */
  function line(w: { code: string, params?: ReasonParams }): string {
    const p = w.params ?? {}
    if (w.code === 'preshift_failed_items' && typeof p.checks === 'string') return failedItems(p.checks.split('; '))
    if (w.code === 'refusal_reason' && typeof p.refusal === 'string') {
      const { refusal, said, ...rest } = p
      return refusal === 'refill_refused' ? String(said ?? '') : reasonText({ code: refusal, message: String(said ?? ''), params: rest })
    }
    return codedText(`history.${w.code}`, w.params, '')
  }
  return {
    title: (h: HistoryLineWords): string => {
      const said = h.titleWords ? codedText(`history.${h.titleWords.code}`, h.titleWords.params, h.title) : h.title
      return h.titleWords && h.record?.correctsId ? t('history.correction', { title: said }) : said
    },
    detail: (h: HistoryLineWords): string | null | undefined => (h.detailWords?.length
      ? h.detailWords.map(line).filter(Boolean).join(' · ')
      : h.detail),
    who: (h: HistoryLineWords): string => (h.who === 'System' ? t('history.system') : h.who),
  }
}
