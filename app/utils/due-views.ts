import type { DueItem } from '~/stores/due'

// "Due today", "3 days overdue", "in 12 days": when an obligation falls due, in words.
export function dueWhen(item: Pick<DueItem, 'dueOn' | 'state' | 'remaining'>, today: string): string {
  if (item.state === 'done') return item.dueOn ? `Done ${item.dueOn}` : 'Done'
  if (!item.dueOn) return item.remaining !== null && item.remaining <= 0 ? 'Due now' : `${item.remaining ?? '?'} to go`
  const days = calendarDaysBetween(today, item.dueOn)
  if (days === 0) return 'Due today'
  if (days < 0) return `${-days} day${days === -1 ? '' : 's'} overdue · was due ${item.dueOn}`
  return `Due ${item.dueOn} · in ${days} day${days === 1 ? '' : 's'}`
}
