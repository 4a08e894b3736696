// The lead pages' English words (i18n/lead/en.json: reports, audit pack, schedules, asset lists and forms, site,
// people, labels) are a chunk of their own, so the Scan page and a tag's page (the floor's first pages, on
// warehouse Wi-Fi) do not carry them. They are merged in before the first render of any other page and before
// navigating to one; the service worker precaches the chunk with the rest of /_nuxt/, so they work offline too.
const WITHOUT_LEAD_WORDS = /^\/(?:scan|t)(?:\/|$)/

export default defineNuxtPlugin({
  name: 'bayward:i18n-lead-words',
  async setup() {
    const nuxtApp = useNuxtApp()
    let loading: Promise<void> | undefined
    const load = () => (loading ??= import('../../i18n/lead/en.json').then((words) => {
      nuxtApp.$i18n.mergeLocaleMessage('en', words.default as never)
    }))
    if (!WITHOUT_LEAD_WORDS.test(window.location.pathname)) await load()
    addRouteMiddleware('bayward-lead-words', async (to) => {
      if (!WITHOUT_LEAD_WORDS.test(to.path)) await load()
    }, { global: true })
  },
})
