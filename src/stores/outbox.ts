import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref } from 'vue'
import type { CapturedMail, OutgoingMail } from '../../shared/schemas/mail'
import { type ApiError, toApiError } from '../api/http'
import { mailApi } from '../api/mail'

/** Mail caught by the local fake SMTP server and Driftwarden's delivery queue (demo and development only). */
export const useOutboxStore = defineStore('outbox', () => {
  /** False when the server runs without the fake SMTP server (e.g. production with real mail). */
  const captureEnabled = ref(false)
  const captured = ref<CapturedMail[]>([])
  const queue = ref<OutgoingMail[]>([])
  const isLoading = ref(false)
  const error = ref<ApiError | null>(null)

  async function fetchOutbox(): Promise<void> {
    isLoading.value = true
    try {
      const [capturedList, queued] = await Promise.all([mailApi.captured(), mailApi.outgoing()])
      captureEnabled.value = capturedList.enabled
      // Newest first: people open the outbox to find the message they just caused.
      captured.value = [...capturedList.messages].sort((a, b) => b.receivedAt.localeCompare(a.receivedAt))
      queue.value = [...queued].sort((a, b) => b.createdAt.localeCompare(a.createdAt))
      error.value = null
    } catch (e) {
      error.value = toApiError(e)
    } finally {
      isLoading.value = false
    }
  }

  return { captureEnabled, captured, queue, isLoading, error, fetchOutbox }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useOutboxStore, import.meta.hot))
