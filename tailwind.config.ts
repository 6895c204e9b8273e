import type { Config } from 'tailwindcss'
import { palette } from './shared/utils/palette'

// Tiltwright's own palette (shared/utils/palette.ts): components use these names, never colour
// literals. "beam" is the brand steel-blue, "brass" the accent of the servo horn, "chalk" the page,
// "ink" the text; go / caution / stop carry meaning.
export default {
  content: [
    './components/**/*.{vue,ts}',
    './layouts/**/*.vue',
    './pages/**/*.vue',
    './app.vue',
    './error.vue',
    './composables/**/*.ts',
    './shared/utils/**/*.ts',
  ],
  theme: {
    extend: {
      fontFamily: { sans: ['Nunito', 'ui-sans-serif', 'system-ui', 'sans-serif'] },
      colors: palette,
    },
  },
  plugins: [],
} satisfies Config
