import { ref } from 'vue'
import { type ApiError, toApiError } from '../api/http'

/**
 * Server-side errors for one form: field messages go next to their fields, anything else into one banner.
 * @example `<q-input :error="!!errors.fields.value.email" :error-message="errors.fields.value.email" />`
 */
export function useFormErrors() {
  const fields = ref<Record<string, string>>({})
  const message = ref<string | null>(null)

  function clear(): void {
    fields.value = {}
    message.value = null
  }

  /** Shows `error`; `override` rewrites the banner text for errors the page explains better itself. */
  function show(error: unknown, override?: (error: ApiError) => string | undefined): void {
    const apiError = toApiError(error)
    fields.value = apiError.fields
    const hasFieldMessages = Object.keys(apiError.fields).length > 0
    message.value = override?.(apiError) ?? (hasFieldMessages ? 'Please correct the highlighted fields.' : apiError.message)
  }

  /** Clears one field's server message once the user edits it. */
  function clearField(name: string): void {
    if (!(name in fields.value)) return
    const { [name]: _removed, ...rest } = fields.value
    fields.value = rest
  }

  /** The message for a field or, failing that, for the first of its nested fields (e.g. "runIds.2"). */
  function forField(name: string): string | undefined {
    return fields.value[name] ?? Object.entries(fields.value).find(([k]) => k.startsWith(`${name}.`))?.[1]
  }

  return { fields, message, clear, show, clearField, forField }
}
