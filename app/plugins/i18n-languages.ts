import type { Language } from '#shared/utils/languages'

type Messages = Record<string, unknown>

// The words of each language but English (which is in the bundle, i18n/i18n.config.ts), as a chunk of its
// own: a reader of English never downloads them. A new language adds its import here.
const LANGUAGE_WORDS: Record<Exclude<Language, 'en'>, () => Promise<{ default: Messages }>> = {
  es: () => import('../../i18n/locales/es.json'),
}

// Loads a language's words before @nuxtjs/i18n switches to it: the first render (server and client, before
// hydration), the person's setting (middleware/auth.global.ts) and the account page's picker all switch
// through `i18n:beforeLocaleSwitch`, which the module awaits. `pre` so the hook is in place before the
// module's first switch.
export default defineNuxtPlugin({
  name: 'bayward:i18n-languages',
  enforce: 'pre',
  setup() {
    const nuxtApp = useNuxtApp()
    const loaded = new Set<string>(['en'])
    nuxtApp.hook('i18n:beforeLocaleSwitch', async ({ newLocale }) => {
      if (loaded.has(newLocale) || !(newLocale in LANGUAGE_WORDS)) return
      const words = await LANGUAGE_WORDS[newLocale as keyof typeof LANGUAGE_WORDS]()
      nuxtApp.$i18n.setLocaleMessage(newLocale, words.default as never)
      loaded.add(newLocale)
    })
  },
})
