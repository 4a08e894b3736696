import { defaultReportRange } from '#shared/utils/report-schemas'

// The report pages' range and site, kept in the URL (?from=&to=&site=) so a view can be bookmarked or sent.
export function useReportRange() {
  const route = useRoute()
  const router = useRouter()
  const session = useSessionStore()
  const { locale } = useI18n()
  // the year to the site's today (a Chicago lead after 6 PM is not yet on UTC's tomorrow)
  const fallback = defaultReportRange(useLocaleFormat().today())
  const { from, to } = useDayRangeQuery(fallback)
  const text = (v: unknown) => (typeof v === 'string' && v ? v : undefined)
  const siteId = computed(() => text(route.query.site) ?? session.siteId ?? '')
  // the page's language goes with the query, so the server writes the report's words in it (and a change refetches)
  const query = computed(() => ({ siteId: siteId.value, from: from.value, to: to.value, lang: locale.value }))
  function change(v: { from: string, to: string, siteId: string }) {
    router.replace({ query: { ...route.query, from: v.from, to: v.to, site: v.siteId } })
  }
  /** the link to a section's CSV */
  function csvHref(kind: string, section: string) {
    return `/api/reports/${kind}?${new URLSearchParams({ ...query.value, format: 'csv', section }).toString()}`
  }
  return { from, to, siteId, query, change, csvHref }
}
