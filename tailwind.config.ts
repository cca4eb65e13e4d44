import type { Config } from 'tailwindcss'
import { PALETTE as P } from './shared/charts/palette'

// Mantissa's own palette: paper and ink, one signal colour for what deviates,
// a calm colour for what the law expects, and quiet marks for locks and approvals.
export default {
  content: ['./app/**/*.{vue,ts}', './content/**/*.md'],
  theme: {
    extend: {
      colors: {
        paper: { DEFAULT: P.paper, deep: P.paperDeep },
        ink: { DEFAULT: P.ink, soft: P.inkSoft },
        graphite: P.graphite,
        rule: P.rule,
        signal: { DEFAULT: P.signal, soft: P.signalSoft },
        expect: { DEFAULT: P.expect, soft: P.expectSoft },
        accent: { DEFAULT: P.accent, soft: P.accentSoft },
        seal: { DEFAULT: P.seal, soft: P.sealSoft },
      },
      fontFamily: {
        serif: ['Merriweather', 'Georgia', 'serif'],
        sans: ['Inter', 'system-ui', 'sans-serif'],
      },
      maxWidth: { column: '42rem' },
    },
  },
} satisfies Config
