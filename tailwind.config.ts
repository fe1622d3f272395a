import type { Config } from 'tailwindcss'

// Tightwell palette: a calm slate-teal brand ("fir") and a warm sand accent.
// Verdict colours are never the only signal: every verdict also has a symbol and words.
export default {
  content: [],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Noto Sans"', 'system-ui', 'sans-serif'],
      },
      colors: {
        fir: {
          50: '#effaf8', 100: '#d6f0ec', 200: '#ade0d9', 300: '#7cc9c0', 400: '#4fada4',
          500: '#35918a', 600: '#287470', 700: '#245e5b', 800: '#214c4a', 900: '#1f403f', 950: '#0d2625',
        },
        sand: {
          50: '#fbf8f1', 100: '#f5eedd', 200: '#eadbb9', 300: '#dcc28c', 400: '#cfa864', 500: '#c4914a',
          600: '#ad763e', 700: '#905b36', 800: '#764a32', 900: '#613e2c', 950: '#362016',
        },
      },
    },
  },
  plugins: [],
} satisfies Config
