import { acceptHMRUpdate, defineStore } from 'pinia'
import { computed, ref } from 'vue'
import type { AcceptInvitation, Credentials, SessionUser, UnitSystem } from '../../shared/schemas/auth'
import { ROLE_LABELS } from '../../shared/schemas/common'
import { authApi } from '../api/auth'
import { type ApiError, toApiError } from '../api/http'

/** Who is signed in, and the account actions that go with it (sign in/out, links from e-mails, preferences). */
export const useSessionStore = defineStore('session', () => {
  /** The signed-in user, or null when signed out. */
  const user = ref<SessionUser | null>(null)
  /** True once the first "who am I" answer arrived, so guards know whether `user` can be trusted. */
  const isLoaded = ref(false)
  /** Why loading the session failed other than "signed out" (server down); null otherwise. */
  const loadError = ref<ApiError | null>(null)

  const isSignedIn = computed(() => user.value !== null)
  const roleLabel = computed(() => (user.value ? ROLE_LABELS[user.value.role] : ''))

  let loading: Promise<void> | undefined
  /** Loads the session once; later calls reuse the same answer (the router guard calls this on every navigation). */
  function ensureLoaded(): Promise<void> {
    loading ??= load()
    return loading
  }

  async function load(): Promise<void> {
    try {
      user.value = await authApi.me()
      loadError.value = null
    } catch (error) {
      const apiError = toApiError(error)
      user.value = null
      loadError.value = apiError.status === 401 ? null : apiError
    } finally {
      isLoaded.value = true
    }
  }

  /** Throws ApiError: 401 for wrong credentials, 429 when rate limited. */
  async function signIn(credentials: Credentials): Promise<SessionUser> {
    user.value = await authApi.login(credentials)
    isLoaded.value = true
    return user.value
  }

  async function signOut(): Promise<void> {
    try {
      await authApi.logout()
    } finally {
      forgetUser()
    }
  }

  /** Drops the user locally, e.g. when the server says the session has ended. */
  function forgetUser(): void {
    user.value = null
  }

  /** Saves the unit system; the UI switches at once and goes back if the server refuses. */
  async function setUnitSystem(unitSystem: UnitSystem): Promise<void> {
    if (!user.value || user.value.unitSystem === unitSystem) return
    const previous = user.value.unitSystem
    user.value = { ...user.value, unitSystem }
    try {
      await authApi.updatePreferences({ unitSystem })
    } catch (error) {
      if (user.value) user.value = { ...user.value, unitSystem: previous }
      throw error
    }
  }

  /** Creates the invited account and signs it in. */
  async function acceptInvitation(input: AcceptInvitation): Promise<SessionUser> {
    user.value = await authApi.acceptInvitation(input)
    isLoaded.value = true
    return user.value
  }

  const fetchTokenInfo = (token: string) => authApi.tokenInfo(token)
  const requestPasswordReset = (email: string) => authApi.requestPasswordReset(email)
  const resetPassword = (token: string, password: string) => authApi.resetPassword(token, password)

  return {
    user,
    isLoaded,
    loadError,
    isSignedIn,
    roleLabel,
    ensureLoaded,
    signIn,
    signOut,
    forgetUser,
    setUnitSystem,
    acceptInvitation,
    fetchTokenInfo,
    requestPasswordReset,
    resetPassword,
  }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useSessionStore, import.meta.hot))
