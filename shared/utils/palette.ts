// Tiltwright's palette, defined once: tailwind.config.ts builds its named colours from this,
// and canvas/plot code (which cannot use classes) reads the same values.
export const palette = {
  beam: { 50: '#eef5f9', 100: '#d5e6f0', 200: '#a9cce0', 300: '#74abc9', 400: '#468bb0', 500: '#2b6f95', 600: '#1f5878', 700: '#1a4762', 800: '#173a50', 900: '#132f41' },
  brass: { 50: '#fdf7ea', 100: '#f9ebc8', 200: '#f2d48b', 300: '#e9b84f', 400: '#dc9d29', 500: '#c2801b', 600: '#9c6216', 700: '#7a4b16' },
  chalk: { DEFAULT: '#f7f6f2', dark: '#ecebe4' },
  ink: { DEFAULT: '#1f2a37', soft: '#4b5563', faint: '#586170' },
  go: { DEFAULT: '#256940', soft: '#e4f3ea' },
  caution: { DEFAULT: '#a15c00', soft: '#fdf1dc' },
  stop: { DEFAULT: '#b42318', soft: '#fde8e6' },
} as const
