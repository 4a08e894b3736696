// Bayward: Nuxt 4 app (app/, server/, shared/), PostgreSQL through Drizzle, sealed-cookie sessions.
export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', '@vueuse/nuxt', 'nuxt-auth-utils', '@nuxt/eslint'],
  devtools: { enabled: false },
  telemetry: false,
  css: ['@fontsource-variable/roboto-flex/index.css', '~/assets/css/main.css'],
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Bayward',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1, viewport-fit=cover' },
        { name: 'theme-color', content: '#1e293b' },
        { name: 'description', content: 'Battery room and fuel station logbook and due list.' },
      ],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  runtimeConfig: {
    databaseUrl: 'postgres://bayward@127.0.0.1:54329/bayward',
    publicBaseUrl: 'http://localhost:3000',
    signInLimit: { attempts: 5, windowSeconds: 900 },
    session: {
      name: 'bayward-session',
      maxAge: 60 * 60 * 12,
      cookie: { sameSite: 'lax', httpOnly: true },
    },
    public: { appName: 'Bayward' },
  },
  tailwindcss: { cssPath: false, viewer: false },
  eslint: { config: { stylistic: true } },
  nitro: { experimental: { tasks: false } },
  typescript: { strict: true },
})
