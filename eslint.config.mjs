import withNuxt from './.nuxt/eslint.config.mjs'

export default withNuxt({
  ignores: ['server/database/migrations/**', '.data/**', 'screenshots/**'],
})
