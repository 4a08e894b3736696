import { fileURLToPath } from 'node:url'

// Bayward: Nuxt 4 app (app/, server/, shared/), PostgreSQL through Drizzle, sealed-cookie sessions.
export default defineNuxtConfig({
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', '@vueuse/nuxt', 'nuxt-auth-utils', '@nuxt/eslint', '@vite-pwa/nuxt', '@nuxtjs/i18n'],
  devtools: { enabled: false },
  app: {
    head: {
      title: 'Bayward',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1, viewport-fit=cover' },
        { name: 'theme-color', content: '#1e293b' },
        { name: 'description', content: 'Battery room and fuel station logbook and due list.' },
      ],
      link: [
        { rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' },
        { rel: 'manifest', href: '/manifest.webmanifest' },
        { rel: 'apple-touch-icon', href: '/icons/apple-touch-icon.png' },
      ],
      // zod probes for eval (new Function) when its first schema is built; the content security policy
      // forbids eval and would report the probe, so zod is told to parse without it before the app loads.
      script: [{ innerHTML: 'globalThis.__zod_globalConfig={jitless:true}', tagPosition: 'head' }],
    },
  },
  css: ['@fontsource-variable/roboto-flex/index.css', '~/assets/css/main.css'],
  runtimeConfig: {
    databaseUrl: 'postgres://bayward@127.0.0.1:54329/bayward',
    signInLimit: { perEmail: 5, perAddress: 30, windowSeconds: 900 },
    session: {
      name: 'bayward-session',
      maxAge: 60 * 60 * 12,
      cookie: { sameSite: 'lax', httpOnly: true },
    },
    public: { appName: 'Bayward', baseUrl: 'http://localhost:3000' },
    // Certificates and photos: size limit, and where files go (server/plugins/storage.ts): NUXT_UPLOADS_DRIVER
    // disk (.data/uploads) or s3 (NUXT_UPLOADS_S3_ENDPOINT, _REGION, _BUCKET, _ACCESS_KEY_ID, _SECRET_ACCESS_KEY).
    uploads: {
      driver: 'disk',
      maxBytes: 10 * 1024 * 1024,
      // room for files per site, and uploads per person per hour (NUXT_UPLOADS_SITE_QUOTA_MB, NUXT_UPLOADS_PER_USER_PER_HOUR)
      siteQuotaMb: 2048,
      perUserPerHour: 60,
      s3: { endpoint: '', region: 'auto', bucket: '', accessKeyId: '', secretAccessKey: '' },
    },
  },
  // Separate build and output folders let several builds of one checkout coexist (BAYWARD_BUILD_NAME=x).
  buildDir: process.env.BAYWARD_BUILD_NAME ? `.nuxt-${process.env.BAYWARD_BUILD_NAME}` : '.nuxt',
  // The app shell the service worker keeps: the page rendered without data (no user, no nonce-free script), so the
  // app opens with no signal and draws whatever page was asked for on the device.
  routeRules: { '/offline-shell': { ssr: false } },
  compatibilityDate: '2026-11-01',
  nitro: {
    experimental: { tasks: false },
    // scripts, styles, fonts and icons are written .br and .gz at build and served as the browser asks
    compressPublicAssets: { gzip: true, brotli: true },
    // The 'uploads' storage (certificates, photos, job files under jobs:) is mounted at start by
    // server/plugins/storage.ts, on local disk or an S3-compatible bucket.
    output: { dir: process.env.BAYWARD_BUILD_NAME ? `.output-${process.env.BAYWARD_BUILD_NAME}` : '.output' },
    // Domain folders under server/utils: one act or one read model per file, auto-imported like utils/.
    imports: { dirs: ['battery-room', 'due', 'fuel', 'logs', 'inspection', 'reports'].map(dir => fileURLToPath(new URL(`./server/utils/${dir}`, import.meta.url))) },
  },
  typescript: { strict: true },
  telemetry: false,
  hooks: {
    // a language other than English is fetched when it is picked, and the lead pages' English when one opens
    // (app/plugins/i18n-lead-words.client.ts), not prefetched by every English page
    'build:manifest'(manifest) {
      for (const [key, chunk] of Object.entries(manifest)) {
        if (/i18n\/locales\/(?!en\.)[\w-]+\.json$/.test(key) || /i18n\/lead\/[\w-]+\.json$/.test(key)) chunk.prefetch = false
      }
    },
    // Bayward's handler (database unavailable → 503) runs before Nuxt's own error page handler.
    'nitro:config'(config) {
      const nuxtHandlers = [config.errorHandler ?? []].flat()
      config.errorHandler = [fileURLToPath(new URL('./server/error-handler.ts', import.meta.url)), ...nuxtHandlers]
    },
  },
  eslint: { config: { stylistic: true } },
  // English and Spanish. English is in the bundle (i18n/i18n.config.ts); Spanish is a chunk of its own, loaded
  // when picked (app/plugins/i18n-languages.ts) and precached by the service worker, so the app opened offline
  // has it. No prefix, so printed /t/<code> URLs never change. The language is the person's setting
  // (users.language, set in app/middleware/auth.global.ts), else the browser's.
  i18n: {
    strategy: 'no_prefix',
    defaultLocale: 'en',
    locales: [{ code: 'en', language: 'en-US', name: 'English' }, { code: 'es', language: 'es-US', name: 'Español' }],
    vueI18n: './i18n.config.ts',
    detectBrowserLanguage: { useCookie: false, fallbackLocale: 'en' },
  },
  pwa: {
    strategies: 'injectManifest',
    srcDir: fileURLToPath(new URL('./service-worker', import.meta.url)),
    filename: 'sw.ts',
    // registered by app/plugins/service-worker.client.ts (bundled): no inline script, so the nonce CSP stays strict
    injectRegister: false,
    client: { registerPlugin: false },
    registerWebManifestInRouteRules: true,
    manifest: {
      name: 'Bayward',
      short_name: 'Bayward',
      description: 'Battery room and fuel station logbook and due list.',
      start_url: '/',
      scope: '/',
      display: 'standalone',
      background_color: '#1e293b',
      theme_color: '#1e293b',
      icons: [
        { src: '/icons/bayward-192.png', sizes: '192x192', type: 'image/png' },
        { src: '/icons/bayward-512.png', sizes: '512x512', type: 'image/png' },
        { src: '/icons/bayward-maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
        { src: '/icons/bayward.svg', sizes: 'any', type: 'image/svg+xml' },
      ],
    },
    injectManifest: {
      globPatterns: ['_nuxt/**/*.{js,css,woff2,json}', 'icons/*.{png,svg}', 'favicon.svg', 'manifest.webmanifest'],
      maximumFileSizeToCacheInBytes: 4 * 1024 * 1024,
    },
  },
  tailwindcss: { cssPath: false, viewer: false },
})
