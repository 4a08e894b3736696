import en from './locales/en.json'
import es from './locales/es.json'

// Both languages travel in the app bundle (precached by the service worker): nothing is fetched from
// /_i18n/ at run time, so the app opened with no signal still has its words.
export default defineI18nConfig(() => ({
  legacy: false,
  fallbackLocale: 'en',
  messages: { en, es },
  // dates and numbers: app/composables/useLocaleFormat.ts (Intl with en-US / es-US)
}))
