/** Mantissa's colours, one source for the Tailwind theme and the charts. */
export const PALETTE = {
  paper: '#FBFAF6',
  paperDeep: '#F3F0E8',
  ink: '#1D1C1A',
  inkSoft: '#45423C',
  graphite: '#5F5B53',
  rule: '#DDD8CC',
  signal: '#A3262E',
  signalSoft: '#F6E3E1',
  expect: '#2C6A70',
  expectSoft: '#E0EEEE',
  accent: '#24406B',
  accentSoft: '#E4EAF3',
  seal: '#5A4A1E',
  sealSoft: '#F2ECD9',
} as const
