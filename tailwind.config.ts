// Read by Tailwind 4 only through `@config` in app/globals.css: the theme tokens of Switchback's own
// identity (a deep teal for "switch", amber for "back", on warm paper).
const config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: '#1d2a2e', soft: '#4a5a5f', faint: '#7d8b8f' },
        paper: { DEFAULT: '#faf8f3', raised: '#ffffff', sunk: '#f1ede4' },
        teal: { 50: '#eaf5f4', 100: '#cfe9e6', 300: '#6fb8b0', 500: '#1f7a72', 600: '#17645d', 700: '#114b46' },
        amber: { 50: '#fdf5e6', 100: '#fae6bf', 400: '#e2a23b', 500: '#c9861c', 700: '#8a5a0e' },
        danger: { 50: '#fbeeee', 500: '#b33a3a', 700: '#862a2a' },
      },
      fontFamily: {
        sans: ['var(--font-sans)', 'system-ui', 'sans-serif'],
        mono: ['var(--font-mono)', 'ui-monospace', 'monospace'],
      },
    },
  },
};

export default config;
