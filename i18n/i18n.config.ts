import en from './locales/en.json'

// English travels in the app bundle (the fallback, and what most readers read). Every other language is a
// chunk of its own (app/plugins/i18n-languages.ts imports it the first time the language is picked, before
// the switch); the service worker precaches every chunk under /_nuxt/, so a language works offline. Nothing
// is fetched from /_i18n/ at run time.
export default defineI18nConfig(() => ({
  legacy: false,
  fallbackLocale: 'en',
  // Spanish starts empty and is filled in before the first switch to it
  messages: { en, es: {} },
  // dates and numbers: app/composables/useLocaleFormat.ts (Intl with en-US / es-US)
}))
