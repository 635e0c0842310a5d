import type { Config } from 'tailwindcss';

/**
 * Cellwright's own look: neutral slate workspace, one deep-teal accent for
 * selection and focus. Signal colours (IEC 60204-1 / IEC 60073) are reserved
 * for device meanings and are defined separately under `signal`.
 */
const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        accent: {
          50: '#effcfa',
          100: '#c8f3ee',
          200: '#92e6dd',
          300: '#58d0c6',
          400: '#2db3aa',
          500: '#16968f',
          600: '#0f7874',
          700: '#10605d',
          800: '#124d4b',
          900: '#133f3e',
          950: '#052626',
        },
        signal: {
          red: '#d62828',
          yellow: '#f2c200',
          green: '#2a9d3a',
          blue: '#1f5fbf',
          white: '#f4f4f5',
        },
      },
      fontFamily: {
        sans: ['var(--font-sans)', 'system-ui', 'sans-serif'],
        mono: ['var(--font-mono)', 'ui-monospace', 'monospace'],
      },
    },
  },
};

export default config;
