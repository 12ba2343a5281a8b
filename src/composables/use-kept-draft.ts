import { computed, ref, watch, type Ref } from 'vue'

/**
 * Keeps what a form holds but the server does not yet have in localStorage, so neither another action on the page
 * (which refreshes the data) nor a reload discards typed input. `fromServer` is the stored state; the form's
 * `value` is reset to it only when the stored state itself changes (a save), never because the page reloaded data.
 */
export function useKeptDraft<T>(key: () => string, fromServer: () => T, value: Ref<T>) {
  const restoredAt = ref<string | null>(null)
  const serverJson = ref('')
  const read = (): { value: T; changedAt: string } | null => {
    try {
      const raw = localStorage.getItem(key())
      return raw ? (JSON.parse(raw) as { value: T; changedAt: string }) : null
    } catch {
      return null
    }
  }
  const forget = () => { try { localStorage.removeItem(key()) } catch { /* storage disabled */ } }

  // A different record (another drill) or a changed stored state: start from the server, unless a kept draft differs.
  watch([key, () => JSON.stringify(fromServer())], ([, json], old) => {
    const sameKey = old !== undefined && old[0] === key()
    const stored = JSON.parse(json) as T
    serverJson.value = json
    if (sameKey) {
      // The stored state changed (this form or another tab saved): what is stored now is what the form shows.
      value.value = stored
      forget()
      restoredAt.value = null
      return
    }
    const kept = read()
    if (kept && JSON.stringify(kept.value) !== json) {
      value.value = kept.value
      restoredAt.value = kept.changedAt
    } else {
      value.value = stored
      restoredAt.value = null
      forget()
    }
  }, { immediate: true })

  const dirty = computed(() => JSON.stringify(value.value) !== serverJson.value)
  watch(value, (v) => {
    if (JSON.stringify(v) === serverJson.value) return forget()
    try { localStorage.setItem(key(), JSON.stringify({ value: v, changedAt: new Date().toISOString() })) } catch { /* storage full */ }
  }, { deep: true })

  /** Drops the kept draft and shows the stored state again. */
  function discard() {
    value.value = JSON.parse(serverJson.value) as T
    forget()
    restoredAt.value = null
  }
  return { dirty, restoredAt, discard, forget }
}
