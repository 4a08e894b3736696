import type { DueKind } from '#shared/utils/due-schedules'
import type { ObligationState } from '#shared/utils/due-dates'
import type { DueItem } from '~/stores/due'

// The due list's words in the reader's language: states, built-in task names and their one-tap actions
// (due.kind.<kind>, due.action.<kind>), and "when". A task a lead added keeps the words the lead wrote.
export function useDueWords() {
  const { t, te } = useNuxtApp().$i18n
  const { number, day } = useLocaleFormat()
  const followUp = useFollowUpWords()
  const kindLabel = (kind: DueKind | string, fallback: string) => (kind !== 'custom' && te(`due.kind.${kind}`) ? t(`due.kind.${kind}`) : fallback)
  return {
    stateLabel: (state: ObligationState) => t(`due.state.${state}`),
    kindLabel,
    /** the item's task name: the built-in name in the reader's words, else what the server said */
    what: (item: Pick<DueItem, 'kind' | 'what'>) => (DUE_KIND_LABELS[item.kind as DueKind] === item.what ? kindLabel(item.kind, item.what) : item.what),
    /** the item's detail in the reader's words when it came as a code (due.detail.<code>), else as the server wrote it */
    detail: (item: Pick<DueItem, 'detail' | 'detailWords'>): string | null => {
      const w = item.detailWords
      if (!w || !te(`due.detail.${w.code}`)) return item.detail
      const params = Object.fromEntries(Object.entries(w.params ?? {}).map(([k, v]) => [k, typeof v === 'number' ? number(v, 1) : /^\d{4}-\d{2}-\d{2}$/.test(v) ? day(v) : v]))
      return typeof w.params?.n === 'number' ? t(`due.detail.${w.code}`, params, w.params.n) : t(`due.detail.${w.code}`, params)
    },
    /** the subject's name; an area log's day ("North charge room · 2026-11-30") in the reader's date words, a follow-up's title in the reader's words */
    subject: (item: Pick<DueItem, 'subject'>): string => {
      const { label, periodStart, labelWords } = item.subject
      if (item.subject.kind === 'follow_up' && labelWords) return followUp.title({ title: label, titleWords: labelWords })
      return item.subject.kind === 'log' && periodStart && label.endsWith(` · ${periodStart}`)
        ? `${label.slice(0, -periodStart.length)}${day(periodStart)}`
        : label
    },
    actionLabel: (item: Pick<DueItem, 'kind' | 'action'>) => (te(`due.action.${item.kind}`) ? t(`due.action.${item.kind}`) : item.action.label),
    when: (item: Pick<DueItem, 'dueOn' | 'state' | 'remaining'>, today: string): string => {
      const on = item.dueOn ? day(item.dueOn) : ''
      if (item.state === 'done') return item.dueOn ? t('due.when.done_on', { on }) : t('due.state.done')
      if (!item.dueOn) return item.remaining !== null && item.remaining <= 0 ? t('due.when.now') : t('due.when.to_go', { n: item.remaining ?? '?' })
      const days = calendarDaysBetween(today, item.dueOn)
      if (days === 0) return t('due.when.today')
      if (days < 0) return t('due.when.overdue', { n: -days, on }, -days)
      return t('due.when.in', { n: days, on }, days)
    },
  }
}
