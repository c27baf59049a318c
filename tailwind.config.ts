import type { Config } from 'tailwindcss';

// Design tokens. "strato" marks anything above the tropopause, "tropo" anything below it;
// every chart, map and table uses the same pair so the two regimes read alike everywhere.
const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: '#16233b', soft: '#3d4a63', faint: '#5f6879' },
        paper: { DEFAULT: '#f6f6f2', raised: '#ffffff', sunk: '#ecece6' },
        line: { DEFAULT: '#d8d8cf', strong: '#b9b9ad' },
        strato: { DEFAULT: '#6a3d9a', soft: '#ece4f5', strong: '#4b2574' },
        tropo: { DEFAULT: '#23867a', soft: '#dff1ee', strong: '#15594f' },
        caution: { DEFAULT: '#9a5a12', soft: '#fbf0df' },
        danger: { DEFAULT: '#b3261e', soft: '#fbe4e2' },
        accent: { DEFAULT: '#1d5fa8', soft: '#e2ecf8', strong: '#154a85' },
      },
      fontFamily: {
        sans: ['var(--font-inter)', 'system-ui', 'sans-serif'],
        mono: ['ui-monospace', 'SFMono-Regular', 'Menlo', 'monospace'],
      },
      borderRadius: { card: '0.625rem' },
    },
  },
};

export default config;
