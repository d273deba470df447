import type { Config } from 'tailwindcss'

// Our own palette: dark "ink" of the timing hut, "salt" of the lake bed, and the "beam" of a trap.
export default {
  content: ['./app/**/*.{vue,ts}', './shared/**/*.ts'],
  darkMode: 'class',
  theme: {
    extend: {
      colors: {
        ink: { 950: '#08131c', 900: '#0e1f2c', 800: '#17303f', 700: '#254457', 600: '#3a5d72', 500: '#56788d', 300: '#9fb4c1' },
        salt: { 50: '#fbfaf6', 100: '#f4f1e8', 200: '#e6e0cf', 300: '#d2c9b0', 400: '#a99f84' },
        beam: { 300: '#ffb27a', 400: '#ff8c3a', 500: '#f06a0f', 600: '#c9550a', 700: '#a34306' },
        // Verdict colours switch with the theme (main.css): each meets WCAG 2.1 AA (4.5:1) on its theme's cards.
        verdict: {
          pass: 'rgb(var(--verdict-pass) / <alpha-value>)',
          fail: 'rgb(var(--verdict-fail) / <alpha-value>)',
          warn: 'rgb(var(--verdict-warn) / <alpha-value>)',
          info: 'rgb(var(--verdict-info) / <alpha-value>)',
        },
      },
      fontFamily: {
        sans: ['Inter', 'system-ui', 'sans-serif'],
        serif: ['Merriweather', 'Georgia', 'serif'],
      },
      fontSize: { base: ['1rem', '1.55'] },
      minHeight: { touch: '44px' },
      minWidth: { touch: '44px' },
    },
  },
} satisfies Config
