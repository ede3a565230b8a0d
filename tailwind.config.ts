import type { Config } from 'tailwindcss'

// High-performance HMI palette (ISA-101 practice): calm greys for everything normal, colour
// reserved for abnormal states. Names say what a colour means, never what it looks like.
export default {
  content: ['./app/**/*.{vue,ts}'],
  theme: {
    extend: {
      colors: {
        surface: { DEFAULT: '#dcdfe2', raised: '#eceef0', sunken: '#cfd3d7', line: '#b7bdc3' },
        ink: { DEFAULT: '#1f2429', muted: '#545c64', faint: '#7a838c', inverse: '#f4f5f6' },
        accent: { DEFAULT: '#2f4a66', hover: '#243a51' },
        status: {
          steady: '#8a939b',
          watch: '#6b5fa8',
          warning: '#c98a00',
          alarm: '#c2331f',
          nodata: '#4d5660',
          bad: '#8f5a2a',
        },
        priority: { urgent: '#b0201a', high: '#d25f0f', medium: '#c9a400', low: '#4f7fa8' },
      },
      fontFamily: {
        mono: ['"Roboto Mono"', 'ui-monospace', 'monospace'],
        sans: ['"Roboto Mono"', 'ui-monospace', 'monospace'],
      },
    },
  },
} satisfies Config
