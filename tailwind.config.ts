import type { Config } from 'tailwindcss'

// Barsmith's tokens live here and in app/assets/css/main.css (the CSS variables they read),
// so night session only swaps variables.
export default {
  darkMode: 'class',
  content: [],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: 'rgb(var(--paper) / <alpha-value>)', deep: 'rgb(var(--paper-deep) / <alpha-value>)' },
        ink: { DEFAULT: 'rgb(var(--ink) / <alpha-value>)', soft: 'rgb(var(--ink-soft) / <alpha-value>)', faint: 'rgb(var(--ink-faint) / <alpha-value>)' },
        rule: 'rgb(var(--rule) / <alpha-value>)',
        brass: { DEFAULT: 'rgb(var(--brass) / <alpha-value>)', deep: 'rgb(var(--brass-deep) / <alpha-value>)', wash: 'rgb(var(--brass-wash) / <alpha-value>)' },
        oxblood: { DEFAULT: 'rgb(var(--oxblood) / <alpha-value>)', wash: 'rgb(var(--oxblood-wash) / <alpha-value>)' },
      },
      fontFamily: {
        lyric: ['Literata', 'Georgia', 'serif'],
        ui: ['"Public Sans"', 'system-ui', 'sans-serif'],
      },
      borderWidth: { hair: '0.5px' },
    },
  },
} satisfies Config
