import { onBeforeUnmount, onMounted } from 'vue'
import { translateElements } from '../../../shared/floorplan/plan-edit'
import type { EditorTool, useFloorEditorStore } from '../../stores/floor-editor'

type Store = ReturnType<typeof useFloorEditorStore>

const TOOL_KEYS: Record<string, EditorTool> = {
  v: 'select', r: 'room-rect', p: 'room-polygon', d: 'door', h: 'pass-through', s: 'source', g: 'detector', e: 'exhaust', w: 'workstation', k: 'calibrate',
}

/**
 * Keyboard shortcuts of the editor. Ignored while typing in a field, so "d" in a name never switches tools.
 * Tools: V R P D H S G E W K. Ctrl+Z / Ctrl+Shift+Z / Ctrl+Y, Ctrl+C / Ctrl+V / Ctrl+D, Ctrl+A, Delete,
 * arrows nudge by the grid (Shift: ×10), Escape cancels, Enter closes a polygon, Space held pans, F fits, +/- zoom.
 */
export function useEditorShortcuts(store: Store, hooks: {
  gridM: () => number; cancel: () => void; finishPolygon: () => void; removeLastDraftPoint: () => boolean
  setSpace: (held: boolean) => void; fit: () => void; zoomBy: (f: number) => void
}) {
  function typing(e: KeyboardEvent): boolean {
    const t = e.target as HTMLElement | null
    return !!t && (t.isContentEditable || ['INPUT', 'TEXTAREA', 'SELECT'].includes(t.tagName))
  }

  function onKeyDown(e: KeyboardEvent): void {
    if (typing(e) || document.querySelector('.q-dialog')) return
    const mod = e.ctrlKey || e.metaKey
    const key = e.key.toLowerCase()
    if (mod && key === 'z') { e.preventDefault(); if (e.shiftKey) store.redo(); else store.undo(); return }
    if (mod && key === 'y') { e.preventDefault(); store.redo(); return }
    if (mod && key === 'c') { store.copySelected(); return }
    if (mod && key === 'v') { e.preventDefault(); store.paste(); return }
    if (mod && key === 'd') { e.preventDefault(); store.duplicateSelected(); return }
    if (mod && key === 'a') { e.preventDefault(); store.selectAll(); return }
    if (mod && key === 's') { e.preventDefault(); void store.save(); return }
    if (mod || e.altKey) return
    if (e.key === ' ') { e.preventDefault(); hooks.setSpace(true); return }
    if (e.key === 'Escape') { hooks.cancel(); if (store.tool === 'select') store.select([]); else store.setTool('select'); return }
    if (e.key === 'Enter') { hooks.finishPolygon(); return }
    if (e.key === 'Delete' || e.key === 'Backspace') {
      e.preventDefault()
      if (!hooks.removeLastDraftPoint()) store.deleteSelected()
      return
    }
    if (e.key.startsWith('Arrow') && store.selection.length) {
      e.preventDefault()
      const step = hooks.gridM() * (e.shiftKey ? 10 : 1)
      const dx = e.key === 'ArrowLeft' ? -step : e.key === 'ArrowRight' ? step : 0
      const dy = e.key === 'ArrowDown' ? -step : e.key === 'ArrowUp' ? step : 0
      store.commit(translateElements(store.plan, new Set(store.selection), dx, dy))
      return
    }
    if (key === 'f') { hooks.fit(); return }
    if (e.key === '+' || e.key === '=') { hooks.zoomBy(1.25); return }
    if (e.key === '-') { hooks.zoomBy(0.8); return }
    const tool = TOOL_KEYS[key]
    if (tool) { hooks.cancel(); store.setTool(tool) }
  }

  function onKeyUp(e: KeyboardEvent): void {
    if (e.key === ' ') hooks.setSpace(false)
  }

  onMounted(() => {
    window.addEventListener('keydown', onKeyDown)
    window.addEventListener('keyup', onKeyUp)
  })
  onBeforeUnmount(() => {
    window.removeEventListener('keydown', onKeyDown)
    window.removeEventListener('keyup', onKeyUp)
  })
}
