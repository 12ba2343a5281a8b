import { onMounted, ref } from 'vue'
import type { TokenInfo } from '../../shared/schemas/auth'
import { accountLinkFailureMessage } from '../../shared/ui/auth-messages'
import { toApiError } from '../api/http'
import { useSessionStore } from '../stores/session'

/** Checks an e-mailed invitation or reset link on page load and says which account it is for. */
export function useAccountLink(token: () => string, purpose: TokenInfo['purpose']) {
  const session = useSessionStore()
  const info = ref<TokenInfo | null>(null)
  const problem = ref<string | null>(null)
  const isChecking = ref(true)

  async function check(): Promise<void> {
    if (!token()) {
      problem.value = accountLinkFailureMessage(400, purpose) ?? null
      return
    }
    try {
      const answer = await session.fetchTokenInfo(token())
      // A reset link pasted into the invitation page (or the reverse) is refused like a malformed one.
      if (answer.purpose === purpose) info.value = answer
      else problem.value = accountLinkFailureMessage(400, purpose) ?? null
    } catch (error) {
      const apiError = toApiError(error)
      problem.value = accountLinkFailureMessage(apiError.status, purpose) ?? apiError.message
    }
  }

  onMounted(async () => {
    await check()
    isChecking.value = false
  })

  return { info, problem, isChecking }
}
