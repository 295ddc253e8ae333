// Beadpath's palette and type: a workshop notebook. Contrast of each text pair is checked in
// tests/unit/palette.test.ts (WCAG AA, 4.5:1 for text).
import type { Config } from 'tailwindcss';

export const palette = {
  paper: { DEFAULT: '#FBF8F1', raised: '#FFFDF9', sunk: '#F2ECE0' },
  ink: { DEFAULT: '#24211C', soft: '#57503F', faint: '#6E6656' },
  amber: { DEFAULT: '#9C5700', deep: '#7A4300', wash: '#F7E6C4', line: '#E0B36A' },
  fixed: { DEFAULT: '#1E6B3B', wash: '#DDEFE2' },
  danger: { DEFAULT: '#B3261E', deep: '#8C1D17', wash: '#FBE4E1' },
  rule: { DEFAULT: '#D8CFBF', strong: '#B9AD98' },
} as const;

export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: palette,
      fontFamily: {
        serif: ['Lora', 'Georgia', 'serif'],
        sans: ['system-ui', '-apple-system', 'Segoe UI', 'Roboto', 'Helvetica Neue', 'Arial', 'sans-serif'],
      },
    },
  },
} satisfies Config;
