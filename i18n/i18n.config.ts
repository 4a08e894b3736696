import en from './locales/en.json'
import enLead from './lead/en.json'

// English travels in the app bundle (the fallback, and what most readers read). Every other language is a
// chunk of its own (app/plugins/i18n-languages.ts imports it the first time the language is picked, before
// the switch); the service worker precaches every chunk under /_nuxt/, so a language works offline. Nothing
// is fetched from /_i18n/ at run time. The lead pages' English (reports, audit pack, schedules, asset lists and
// forms, site, people, labels: i18n/lead/en.json) is on the server and, in the browser, a chunk of its own that
// app/plugins/i18n-lead-words.client.ts loads before any page but Scan and a tag's page: the floor's first page
// stays small.
export default defineI18nConfig(() => ({
  legacy: false,
  fallbackLocale: 'en',
  // Spanish starts empty and is filled in before the first switch to it
  messages: { en: import.meta.server ? { ...en, ...enLead } : en, es: {} },
  // dates and numbers: app/composables/useLocaleFormat.ts (Intl with en-US / es-US)
}))
