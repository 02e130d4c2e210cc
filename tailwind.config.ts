import type { Config } from 'tailwindcss';

/**
 * Tetherwise palette. Text pairs (foreground on its own surface) are kept at or above 4.5:1;
 * tests/client/palette.test.ts measures them.
 */
export const palette = {
  // the 3D areas and the app bar
  ink: {
    950: '#0a1220',
    900: '#0f1a2e',
    800: '#18253d',
    700: '#24344f',
    300: '#a9b6cc',
    100: '#e3e9f2',
  },
  // panels and page
  surface: {
    page: '#f3f5f8',
    panel: '#ffffff',
    sunken: '#e9edf2',
    line: '#cfd6df',
  },
  text: {
    strong: '#111826',
    DEFAULT: '#1f2937',
    muted: '#4a5566',
  },
  accent: {
    DEFAULT: '#0b6b66',
    strong: '#084f4b',
    soft: '#dff1ef',
    bright: '#4fd1c5',
  },
  status: {
    draft: '#4b5563',
    'draft-soft': '#eceff3',
    review: '#8a4a00',
    'review-soft': '#fff1dc',
    approved: '#17663a',
    'approved-soft': '#e3f3e8',
  },
  danger: {
    DEFAULT: '#a3161c',
    soft: '#fdeceb',
  },
  caution: {
    DEFAULT: '#6f4c00',
    soft: '#fff5d1',
  },
} as const;

export default {
  theme: {
    extend: {
      colors: palette,
      fontFamily: {
        sans: ['Inter', 'ui-sans-serif', 'system-ui', 'sans-serif'],
      },
    },
  },
} satisfies Config;
