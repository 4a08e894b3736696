// A range of the site's days kept in the page's address (?from=&to=), so going back or sending the link keeps it;
// `fallback` is the range shown when the address has none. `pick` puts a new range in the address.
export function useDayRangeQuery(fallback: { from: string, to: string }) {
  const route = useRoute()
  const router = useRouter()
  const text = (v: unknown) => (typeof v === 'string' && v ? v : undefined)
  const from = computed(() => text(route.query.from) ?? fallback.from)
  const to = computed(() => text(route.query.to) ?? fallback.to)
  function pick(range: { from: string, to: string }) {
    router.replace({ query: { ...route.query, from: range.from, to: range.to } })
  }
  return { from, to, pick }
}

/** The last `days` of the site's days, today included. */
export function lastSiteDays(days: number): { from: string, to: string } {
  const today = useLocaleFormat().today()
  return { from: addCalendarInterval(today, -(days - 1), 'day'), to: today }
}
