import type { Config } from 'tailwindcss'

export default {
  darkMode: 'class',
  content: [
    './components/**/*.{vue,ts}',
    './layouts/**/*.vue',
    './pages/**/*.vue',
    './composables/**/*.ts',
    './app.vue',
    './error.vue',
    './shared/**/*.ts'
  ],
  theme: {
    extend: {
      colors: {
        ink: '#16213a',
        snow: '#f5f8fb',
        frost: '#dfe8f1',
        ember: { DEFAULT: '#b84c15', dark: '#e07a45' },
        moss: { DEFAULT: '#2f7d5b', dark: '#5fbf92' },
        signal: { DEFAULT: '#b3261e', dark: '#f2867f' },
        dusk: { DEFAULT: '#0f1526', card: '#182036', line: '#2a3552', text: '#d9e1ec', dim: '#9fb0c8' },
        band: {
          day: '#f3ecd9',
          civil: '#d9c3cf',
          nautical: '#9a86a8',
          astronomical: '#54496b',
          night: '#1f1b2e'
        }
      },
      fontFamily: {
        sans: ['"Work Sans"', 'system-ui', 'sans-serif']
      },
      // one type scale for the whole app: body 17–18 px, key figures 24 px and up (docs/look.md)
      fontSize: {
        'sm': ['0.9375rem', { lineHeight: '1.4rem' }],
        'base': ['1.0625rem', { lineHeight: '1.6rem' }],
        'lg': ['1.1875rem', { lineHeight: '1.7rem' }],
        'xl': ['1.375rem', { lineHeight: '1.9rem' }],
        'figure': ['1.625rem', { lineHeight: '2rem', fontWeight: '600' }],
        '2xl': ['1.75rem', { lineHeight: '2.2rem' }],
        '3xl': ['2.125rem', { lineHeight: '2.5rem' }]
      },
      minHeight: { touch: '44px' },
      minWidth: { touch: '44px' }
    }
  }
} satisfies Config
