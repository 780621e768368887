import type { Config } from 'tailwindcss';

// Platterpost's own palette: verdigris greens for the frame and actions, copper for
// focus and highlights, warm paper for surfaces. Status tones are muted so that a
// badge never depends on colour alone (every badge also says its state in words).
// Text pairs are chosen for at least 4.5:1 contrast on `paper` and `paper-raised`.
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        paper: {
          DEFAULT: '#f6f3ec',
          raised: '#fffdf8',
          sunken: '#ece7dc',
        },
        ink: {
          DEFAULT: '#1c2b26',
          strong: '#14201c',
          muted: '#4d5d57',
          faint: '#8a9892',
          line: '#d3d9d3',
          hairline: '#e6e9e4',
        },
        spruce: {
          50: '#eef6f2',
          100: '#d4eae0',
          200: '#a9d4c1',
          300: '#74b59a',
          500: '#2f7d63',
          600: '#236a53',
          700: '#1b5643',
          800: '#15443a',
          900: '#0f3029',
        },
        copper: {
          100: '#f7e6d6',
          300: '#e3a26b',
          400: '#d4823f',
          500: '#c06a2b',
          600: '#a4561f',
          700: '#874518',
        },
        moss: { bg: '#e3efdb', line: '#a9c99a', text: '#2c5f27' },
        ochre: { bg: '#fbefcf', line: '#e0c173', text: '#6e4a00' },
        brick: { bg: '#f9e1da', line: '#e2a393', text: '#9c2f1c', solid: '#b1361f', deep: '#8f2a17' },
        slate: { bg: '#e2eaf3', line: '#a6bad3', text: '#2e4d71' },
      },
      fontFamily: {
        sans: ['"DM Sans"', 'ui-sans-serif', 'system-ui', 'sans-serif'],
      },
      borderRadius: {
        control: '0.5rem',
        panel: '0.875rem',
      },
      boxShadow: {
        panel: '0 1px 2px rgb(20 32 28 / 0.06), 0 4px 16px -6px rgb(20 32 28 / 0.12)',
        lift: '0 10px 40px -12px rgb(20 32 28 / 0.35)',
      },
      maxWidth: {
        page: '78rem',
      },
    },
  },
} satisfies Config;
