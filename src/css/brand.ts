/**
 * Driftwarden's palette: deep blue and teal for structure, amber reserved for cautions. Text on each colour
 * meets WCAG AA contrast (white on primary/secondary/negative/positive/info, dark ink on warning).
 */
export const BRAND_COLOURS = {
  primary: '#14375e',
  secondary: '#0b6e69',
  accent: '#2a7fa8',
  dark: '#0c1f33',
  'dark-page': '#08141f',
  positive: '#1b6e3c',
  negative: '#a8201a',
  info: '#1f5f8b',
  warning: '#f2b33d',
} as const
