import type { Config } from 'tailwindcss'

// Bandlight's own identity: a dark "kiln" slate-plum for structure, a "glow"
// amber for the one action that matters on a screen, a cool "band" teal for
// data and links, on a warm paper background. Type is IBM Plex Sans (shipped
// with the app through @fontsource) on a 1.2 modular scale; spacing is the
// Tailwind 4 px grid with two named gutters.
export default {
  content: [
    './components/**/*.{vue,ts}',
    './layouts/**/*.vue',
    './pages/**/*.vue',
    './composables/**/*.ts',
    './app.vue',
    './error.vue',
  ],
  theme: {
    extend: {
      colors: {
        kiln: {
          50: '#f6f4f8',
          100: '#ebe6f0',
          200: '#d3c9de',
          300: '#b2a2c4',
          400: '#8c77a4',
          500: '#6c5886',
          600: '#56446d',
          700: '#45375a',
          800: '#33293f',
          900: '#231c2c',
          950: '#17121d',
        },
        glow: {
          50: '#fff8ec',
          100: '#ffeecf',
          200: '#fdd99a',
          300: '#f9bd5c',
          400: '#f2a33a',
          500: '#e0851b',
          600: '#bf6513',
          700: '#984914',
          800: '#7a3a16',
          900: '#643116',
        },
        band: {
          50: '#eefbf8',
          100: '#d3f4ed',
          200: '#a9e8dc',
          300: '#74d4c5',
          400: '#43b9aa',
          500: '#279d90',
          600: '#1d7e75',
          700: '#1c655f',
          800: '#1b514d',
          900: '#1a4441',
        },
        paper: '#f8f6f1',
        verdict: {
          pass: '#1d7e75',
          warn: '#bf6513',
          fail: '#b42335',
        },
      },
      fontFamily: {
        sans: ['"IBM Plex Sans"', 'ui-sans-serif', 'system-ui', 'sans-serif'],
        mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace'],
      },
      fontSize: {
        // 1.2 scale from a 15 px body
        xs: ['0.694rem', { lineHeight: '1rem' }],
        sm: ['0.833rem', { lineHeight: '1.25rem' }],
        base: ['0.9375rem', { lineHeight: '1.5rem' }],
        lg: ['1.125rem', { lineHeight: '1.65rem' }],
        xl: ['1.35rem', { lineHeight: '1.85rem' }],
        '2xl': ['1.62rem', { lineHeight: '2.1rem' }],
        '3xl': ['1.944rem', { lineHeight: '2.4rem' }],
      },
      spacing: {
        gutter: '1.5rem',
        rail: '15rem',
      },
      borderRadius: {
        card: '0.375rem',
      },
      boxShadow: {
        card: '0 1px 0 0 rgba(35, 28, 44, 0.06), 0 1px 3px 0 rgba(35, 28, 44, 0.08)',
      },
    },
  },
  plugins: [],
} satisfies Config
