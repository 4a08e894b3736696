import type { Config } from 'tailwindcss'
import defaultTheme from 'tailwindcss/defaultTheme'

// Slate base, one accent of our own ("bay", a plum violet), and the ANSI Z535 safety colours,
// which are used only for hazards and states.
export default {
  content: ['./app/**/*.{vue,ts}', './shared/**/*.ts'],
  theme: {
    extend: {
      fontFamily: { sans: ['"Roboto Flex Variable"', ...defaultTheme.fontFamily.sans] },
      colors: {
        bay: {
          50: '#f7f3fb', 100: '#eee5f6', 200: '#dccaee', 300: '#c3a2e0', 400: '#a574cd',
          500: '#8a50b6', 600: '#723d9a', 700: '#5e317e', 800: '#4e2b68', 900: '#3f2454', 950: '#28133a',
        },
        z535: {
          danger: '#c8102e',
          warning: '#e86a10',
          caution: '#ffd100',
          notice: '#0067a5',
          safe: '#00804f',
        },
      },
      minHeight: { touch: '3rem' },
      minWidth: { touch: '3rem' },
    },
  },
} satisfies Config
