import type { Config } from 'tailwindcss'

/*
 * Tessera palette: deep ink for structure, a tide (blue-green) accent for action and focus,
 * mist greys for surfaces and secondary text, and berry only for error messages.
 * Status is never told by colour alone: every message also carries a word and an icon.
 *
 * WCAG 2.1 contrast ratios of the pairs the app uses (relative-luminance formula of WCAG 2.1,
 * computed for these hex values; text needs >= 4.5:1, UI boundaries and focus rings >= 3:1):
 *   text   ink-900 on white 15.50 · ink-900 on mist-50 14.57 · ink-900 on tide-100 12.96
 *   text   mist-600 on white 6.50 · mist-600 on mist-50 6.11 · mist-600 on mist-100 5.69
 *   text   mist-700 on mist-100 (footer) 7.62 · ink-700 on mist-100 9.00 · ink-600 on white 7.92
 *   link   tide-700 on white 7.47 · tide-700 on mist-50 7.02 · tide-700 on tide-50 7.01
 *   button white on tide-700 7.47 · white on tide-800 (hover) 9.73
 *   header ink-100 on ink-950 14.76 · ink-200 on ink-950 11.90 · white on ink-800 (current) 12.88
 *   header ink-300 on ink-950 8.15 · ink-300 on ink-800 5.87 · ink-200 on ink-800 8.57
 *   notice berry-700 on berry-50 8.53 · berry-800 on berry-100 9.43 · tide-800 on tide-50 9.13
 *   notice tide-800 on tide-100 8.14 · tide-700 on tide-100 6.25
 *   UI     input border mist-500 on white 4.51 · on mist-50 4.23
 *   UI     focus ring tide-600 on white 5.45 · on mist-50 5.12 · on ink-50 5.02 · on mist-100 4.77
 *   UI     focus ring tide-300 on ink-950 (dark header) 9.34 · on ink-900 8.10
 *   UI     current-page bar tide-300 on ink-950 9.34
 * Avoid for text or boundaries: mist-400 on white 2.62, mist-300 on white 1.67.
 */
export default {
  theme: {
    extend: {
      colors: {
        ink: {
          50: '#f3f6f9',
          100: '#e4eaf1',
          200: '#c9d4e0',
          300: '#9fb1c5',
          400: '#6f87a2',
          500: '#4f6885',
          600: '#3c536d',
          700: '#2f4258',
          800: '#233345',
          900: '#182535',
          950: '#0e1824',
        },
        tide: {
          50: '#effaf8',
          100: '#d3f1ec',
          200: '#a6e2d9',
          300: '#6fcbbf',
          400: '#3eaea2',
          500: '#229187',
          600: '#16766f',
          700: '#135f5a',
          800: '#134c49',
          900: '#123f3d',
          950: '#072524',
        },
        mist: {
          50: '#f7f8f8',
          100: '#eef0f1',
          200: '#dde1e4',
          300: '#c3c9ce',
          400: '#98a1a9',
          500: '#6e7880',
          600: '#565f67',
          700: '#454c53',
          800: '#33393e',
          900: '#22272b',
        },
        berry: {
          50: '#fcf2f6',
          100: '#f8e1ea',
          600: '#a3234f',
          700: '#861b41',
          800: '#6b1734',
        },
      },
      fontFamily: {
        sans: ['"Atkinson Hyperlegible"', 'ui-sans-serif', 'system-ui', 'sans-serif'],
        mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'Consolas', 'monospace'],
      },
      maxWidth: {
        shell: '80rem',
      },
    },
  },
} satisfies Partial<Config>
