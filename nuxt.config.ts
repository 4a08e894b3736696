// Bayward: Nuxt 4 app (app/, server/, shared/), PostgreSQL through Drizzle, sealed-cookie sessions.
export default defineNuxtConfig({
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', '@vueuse/nuxt', 'nuxt-auth-utils', '@nuxt/eslint'],
  devtools: { enabled: false },
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
  },
  compatibilityDate: '2026-11-01',
  nitro: { experimental: { tasks: false } },
  typescript: { strict: true },
  telemetry: false,
  eslint: { config: { stylistic: true } },
  tailwindcss: { cssPath: false, viewer: false },
})
