import { localeLoaders } from '#build/i18n-options.mjs'

// The words are in the app's own chunks (English in the bundle, every other language a chunk that
// app/plugins/i18n-languages.ts loads; the service worker precaches them). @nuxtjs/i18n would still ask the server for a language's messages (/_i18n/<hash>/<code>/messages.json) each
// time the browser sets a language; Bayward has no locale files, so that answer adds nothing, and the app opened
// with no signal has no server to ask. Emptying the module's list of locale loaders, as this file is imported
// (before any plugin runs), leaves it nothing to fetch. tests/browser/offline-app.test.ts checks that no such
// request is made, so a module update that changes this shows there.
for (const code of Object.keys(localeLoaders as object)) Reflect.deleteProperty(localeLoaders as object, code)

export default defineNuxtPlugin({ name: 'bayward:i18n-bundled' })
