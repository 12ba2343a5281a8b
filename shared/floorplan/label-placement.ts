/**
 * Greedy placement of point labels on the plan canvas (screen pixels). Each label tries a few positions
 * around its anchor (right, left, above, below, then the diagonals) and takes the first that overlaps no
 * label already placed, no obstacle (glyphs, room names) and stays inside the bounds. Labels are placed in
 * the order given, so put the most important first (the selection, then sources, detectors…).
 *
 * When no position is free: a label with a shorter alternative (a source's gas instead of its name) tries
 * that; an optional label is dropped; otherwise the position overlapping least is used.
 */

export interface Box { x: number; y: number; w: number; h: number }

export interface LabelRequest {
  id: string
  /** Anchor (the glyph's centre). */
  x: number
  y: number
  text: string
  /** Width of `text` in pixels. */
  w: number
  h: number
  /** A shorter text to try when the full one does not fit anywhere. */
  alt?: { text: string; w: number }
  /** Drop the label rather than overlap. */
  optional?: boolean
}

export interface PlacedLabel {
  id: string
  text: string
  /** Top-left corner of the label, absolute. */
  x: number
  y: number
  w: number
  h: number
  /** True when no free position existed and the label overlaps something. */
  crowded: boolean
}

export interface PlacementOptions {
  /** Clearance between anchor and label, pixels (about the glyph radius). */
  gap?: number
  obstacles?: readonly Box[]
  bounds?: Box
}

/** Candidate top-left corners around an anchor, in preference order. */
export function candidateOffsets(w: number, h: number, gap: number): [number, number][] {
  return [
    [gap, -h / 2], // right
    [-gap - w, -h / 2], // left
    [-w / 2, -gap - h], // above
    [-w / 2, gap], // below
    [gap * 0.8, -gap * 0.8 - h], // upper right
    [gap * 0.8, gap * 0.8], // lower right
    [-gap * 0.8 - w, -gap * 0.8 - h], // upper left
    [-gap * 0.8 - w, gap * 0.8], // lower left
  ]
}

export function overlapArea(a: Box, b: Box): number {
  const w = Math.min(a.x + a.w, b.x + b.w) - Math.max(a.x, b.x)
  const h = Math.min(a.y + a.h, b.y + b.h) - Math.max(a.y, b.y)
  return w > 0 && h > 0 ? w * h : 0
}

function inside(a: Box, b: Box | undefined): boolean {
  return !b || (a.x >= b.x && a.y >= b.y && a.x + a.w <= b.x + b.w && a.y + a.h <= b.y + b.h)
}

export function placeLabels(requests: readonly LabelRequest[], opts: PlacementOptions = {}): PlacedLabel[] {
  const gap = opts.gap ?? 11
  const blockers: Box[] = [...(opts.obstacles ?? [])]
  const out: PlacedLabel[] = []
  const cost = (box: Box) => blockers.reduce((s, b) => s + overlapArea(box, b), 0) + (inside(box, opts.bounds) ? 0 : box.w * box.h)

  for (const r of requests) {
    const texts = [{ text: r.text, w: r.w }, ...(r.alt && r.alt.text !== r.text ? [r.alt] : [])]
    let chosen: PlacedLabel | null = null
    for (const t of texts) {
      for (const [dx, dy] of candidateOffsets(t.w, r.h, gap)) {
        const box = { x: r.x + dx, y: r.y + dy, w: t.w, h: r.h }
        if (cost(box) === 0) {
          chosen = { id: r.id, text: t.text, ...box, crowded: false }
          break
        }
      }
      if (chosen) break
    }
    if (!chosen && !r.optional) {
      const t = texts.at(-1)!
      let best = Infinity
      for (const [dx, dy] of candidateOffsets(t.w, r.h, gap)) {
        const box = { x: r.x + dx, y: r.y + dy, w: t.w, h: r.h }
        const c = cost(box)
        if (c < best) {
          best = c
          chosen = { id: r.id, text: t.text, ...box, crowded: true }
        }
      }
    }
    if (chosen) {
      out.push(chosen)
      blockers.push(chosen)
    }
  }
  return out
}
