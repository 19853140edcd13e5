/** Quadrille's theme: loaded from src/styles/global.css with `@config`. */
/** @type {import('tailwindcss').Config} */
export default {
  content: ['./src/**/*.{astro,tsx,ts,html}'],
  darkMode: ['class', '[data-theme="dark"]'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Inter Variable"', 'system-ui', 'sans-serif'],
        mono: ['"JetBrains Mono Variable"', 'ui-monospace', 'monospace'],
      },
      colors: {
        // Surfaces and text follow CSS variables so light and dark share one palette.
        surface: 'rgb(var(--q-surface) / <alpha-value>)',
        panel: 'rgb(var(--q-panel) / <alpha-value>)',
        ink: 'rgb(var(--q-ink) / <alpha-value>)',
        muted: 'rgb(var(--q-muted) / <alpha-value>)',
        line: 'rgb(var(--q-line) / <alpha-value>)',
        accent: 'rgb(var(--q-accent) / <alpha-value>)',
        danger: 'rgb(var(--q-danger) / <alpha-value>)',
        ok: 'rgb(var(--q-ok) / <alpha-value>)',
      },
    },
  },
};
