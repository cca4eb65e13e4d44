import type { Config } from 'tailwindcss'

// Mantissa's own palette: paper and ink, one signal colour for what deviates,
// a calm colour for what the law expects, and quiet marks for locks and approvals.
export default {
  content: ['./app/**/*.{vue,ts}', './content/**/*.md'],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: '#FBFAF6', deep: '#F3F0E8' },
        ink: { DEFAULT: '#1D1C1A', soft: '#45423C' },
        graphite: '#5F5B53',
        rule: '#DDD8CC',
        signal: { DEFAULT: '#A3262E', soft: '#F6E3E1' },
        expect: { DEFAULT: '#2C6A70', soft: '#E0EEEE' },
        accent: { DEFAULT: '#24406B', soft: '#E4EAF3' },
        seal: { DEFAULT: '#5A4A1E', soft: '#F2ECD9' },
      },
      fontFamily: {
        serif: ['Merriweather', 'Georgia', 'serif'],
        sans: ['Inter', 'system-ui', 'sans-serif'],
      },
      maxWidth: { column: '42rem' },
    },
  },
} satisfies Config
