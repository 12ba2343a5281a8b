/**
 * Colours of the floor symbols on the results map and in the plan PDF's figure (circle source, diamond detector,
 * triangle workstation), so a floor reads the same on screen and on paper. Chosen to stand out on the viridis scale.
 */
export const SYMBOL_COLOURS = {
  leakingSource: '#c2410c',
  otherSource: '#6b7280',
  detector: '#0f766e',
  workstation: '#7c3aed',
  door: '#2f80ed',
} as const
