import { defaultSchedules, type ScheduleDefinition } from '#shared/utils/due-schedules'

// Schedules in the reader's words: the interval, the due-soon window, the count unit (the English of
// shared/utils/schedule-words.ts, said through the locale files); a built-in schedule's name and what it applies
// to and where it comes from while still as the defaults word them (a lead's own wording is shown as written).
const DEFAULTS = new Map(defaultSchedules().map(s => [s.kind, s]))
export function useScheduleWords() {
  const { t } = useNuxtApp().$i18n
  function interval(s: Pick<ScheduleDefinition, 'rule' | 'every' | 'everyUnit' | 'withinDays'>): string {
    if (s.rule === 'date_rule') return t('schedules.words.date_rule')
    if (s.every === null || s.every < 1) return t('schedules.words.no_interval')
    if (s.rule === 'days') {
      const unit = s.everyUnit ?? 'day'
      return s.every === 1 ? t(`schedules.words.once.${unit}`) : t(`schedules.words.every.${unit}`, { n: s.every })
    }
    const count = t(`schedules.words.${s.rule}`, { n: s.every }, s.every)
    return s.withinDays ? t('schedules.words.or_days', { count, n: s.withinDays }, s.withinDays) : count
  }
  const builtIn = (s: Pick<ScheduleDefinition, 'kind'>) => (s.kind === 'custom' ? undefined : DEFAULTS.get(s.kind))
  return {
    title: (s: Pick<ScheduleDefinition, 'kind' | 'title'>) => (builtIn(s)?.title === s.title ? t(`due.kind.${s.kind}`) : s.title),
    appliesTo: (s: Pick<ScheduleDefinition, 'kind' | 'appliesTo'>) => (builtIn(s)?.appliesTo === s.appliesTo ? t(`schedules.applies_to.${s.kind}`) : s.appliesTo),
    /** where the interval comes from (the rule or policy it rests on); the citations stay as written in every language */
    source: (s: Pick<ScheduleDefinition, 'kind' | 'source'>) => (s.source && builtIn(s)?.source === s.source ? t(`schedules.source.${s.kind}`) : s.source),
    interval,
    dueSoon: (days: number) => (days <= 0 ? t('schedules.words.due_soon_day') : t('schedules.words.due_soon', { n: days }, days)),
    countUnit: (rule: ScheduleDefinition['rule']) => (rule === 'charges' || rule === 'hours' ? t(`schedules.count_unit.${rule}`) : null),
  }
}
