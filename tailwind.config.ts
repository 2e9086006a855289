import type { Config } from 'tailwindcss';

/**
 * Tallyvat's palette: deep "fir" green for structure, warm "amber" for fuel and
 * actions, neutral "stone" for text. Every text/background pairing used in the app
 * meets WCAG 2.2 AA contrast (4.5:1 for body text).
 */
const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        fir: {
          50: '#f1f7f4',
          100: '#dcebe3',
          200: '#b9d6c7',
          300: '#8cbaa3',
          400: '#5c977d',
          500: '#3d7a61',
          600: '#2d624d',
          700: '#244f3f',
          800: '#1d3f33',
          900: '#16322a',
        },
        amber: {
          50: '#fff8eb',
          100: '#feecc7',
          200: '#fdd68a',
          300: '#fbbb4d',
          400: '#f59f24',
          500: '#d97f0b',
          600: '#b45f06',
          700: '#8f4709',
          800: '#74390f',
          900: '#5f3010',
        },
        danger: { 50: '#fdf2f2', 600: '#b42318', 700: '#912018' },
        warn: { 50: '#fffaeb', 600: '#b54708', 700: '#93370d' },
        ok: { 50: '#ecfdf3', 600: '#067647', 700: '#085d3a' },
      },
      fontFamily: {
        sans: ['var(--font-inter)', 'ui-sans-serif', 'system-ui', 'sans-serif'],
      },
    },
  },
};

export default config;
