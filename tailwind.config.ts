import type { Config } from 'tailwindcss';

// The source of truth for Haulcase's palette and type (app/globals.css loads it).
const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}', './lib/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: '#15181c',
        paper: '#f7f7f5',
        rule: '#e3e4e1',
        muted: '#5d646d',
        panel: '#ffffff',
        policy: { keep: '#8c837b', rebuild: '#35618f', repower: '#b0562b' },
        gain: '#2e7650',
        loss: '#b3261e',
        caution: { DEFAULT: '#8a5a00', ground: '#fdf6e3', rule: '#ecd9a8' },
        accent: '#35618f',
      },
      fontFamily: {
        sans: ['var(--font-sans)', 'system-ui', 'sans-serif'],
        mono: ['var(--font-mono)', 'ui-monospace', 'monospace'],
      },
      fontSize: { xs: ['0.75rem', '1rem'], sm: ['0.8125rem', '1.125rem'] },
    },
  },
};

export default config;
