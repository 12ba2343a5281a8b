import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref } from 'vue'
import type { Invitation, InvitationSent, UserSummary, UserUpdate } from '../../shared/schemas/users'
import { type ApiError, toApiError } from '../api/http'
import { usersApi } from '../api/users'

/** The organization's user accounts, for administrators. */
export const useUsersStore = defineStore('users', () => {
  const users = ref<UserSummary[]>([])
  const isLoading = ref(false)
  /** Why the last list load failed; null after a successful load. */
  const error = ref<ApiError | null>(null)

  async function fetchUsers(): Promise<void> {
    isLoading.value = true
    try {
      users.value = await usersApi.list()
      error.value = null
    } catch (e) {
      error.value = toApiError(e)
    } finally {
      isLoading.value = false
    }
  }

  /** Sends an invitation; throws ApiError (409 when the address is already in this organization, 400 with field messages). */
  async function inviteUser(invitation: Invitation): Promise<InvitationSent> {
    const sent = await usersApi.invite(invitation)
    // The answer carries no account (it must not tell whether the address exists elsewhere): reload the list.
    await fetchUsers()
    return sent
  }

  async function updateUser(id: number, update: UserUpdate): Promise<UserSummary> {
    const updated = await usersApi.update(id, update)
    users.value = users.value.map((u) => (u.id === id ? updated : u))
    return updated
  }

  return { users, isLoading, error, fetchUsers, inviteUser, updateUser }
})

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useUsersStore, import.meta.hot))
