import { computed, reactive } from 'vue'
import type { Point } from '../../../shared/geometry/polygon'

/**
 * Pan and zoom of the plan canvas. World coordinates are metres with y to the north; screen coordinates
 * are CSS pixels with y down. `scale` is pixels per metre.
 */
export function useViewport() {
  const view = reactive({ scale: 40, originX: 60, originY: 480, width: 800, height: 520 })
  /** True while the view is as `fit` left it (no zoom or pan since): a resize then fits again. */
  let fitted = false

  const toScreen = (p: readonly [number, number]): [number, number] => [view.originX + p[0] * view.scale, view.originY - p[1] * view.scale]
  const toWorld = (sx: number, sy: number): Point => [(sx - view.originX) / view.scale, (view.originY - sy) / view.scale]
  /** A screen distance in metres (snap tolerances are set in pixels so they feel the same at any zoom). */
  const pxToM = (px: number) => px / view.scale

  /** Zoom by `factor` keeping the world point under (sx, sy) fixed. */
  function zoomAt(sx: number, sy: number, factor: number): void {
    fitted = false
    const next = Math.min(800, Math.max(4, view.scale * factor))
    const [wx, wy] = toWorld(sx, sy)
    view.scale = next
    view.originX = sx - wx * next
    view.originY = sy + wy * next
  }

  function panBy(dx: number, dy: number): void {
    if (dx || dy) fitted = false
    view.originX += dx
    view.originY += dy
  }

  /** Fit a world bounding box [x0, y0, x1, y1] into the view with a margin in pixels. */
  function fit(box: [number, number, number, number] | null, margin = 48): void {
    const [x0, y0, x1, y1] = box ?? [0, 0, 20, 12]
    const w = Math.max(x1 - x0, 1), h = Math.max(y1 - y0, 1)
    view.scale = Math.min(800, Math.max(4, Math.min((view.width - 2 * margin) / w, (view.height - 2 * margin) / h)))
    view.originX = (view.width - w * view.scale) / 2 - x0 * view.scale
    view.originY = (view.height + h * view.scale) / 2 + y0 * view.scale
    fitted = true
  }

  /**
   * The canvas changed size. Returns true when the caller should fit again (the view was fitted);
   * otherwise keeps the plan point at the centre where it was.
   */
  function resize(width: number, height: number): boolean {
    const dx = (width - view.width) / 2, dy = (height - view.height) / 2
    view.width = width
    view.height = height
    if (fitted) return true
    view.originX += dx
    view.originY += dy
    return false
  }

  /** A "nice" scale bar length (1, 2 or 5 × 10^n metres) about `targetPx` pixels long. */
  const scaleBar = computed(() => {
    const target = 120 / view.scale
    const pow = 10 ** Math.floor(Math.log10(target))
    const metres = [1, 2, 5, 10].map((m) => m * pow).find((m) => m >= target * 0.6) ?? pow * 10
    return { metres, px: metres * view.scale }
  })

  return { view, toScreen, toWorld, pxToM, zoomAt, panBy, fit, resize, scaleBar }
}

export type Viewport = ReturnType<typeof useViewport>
