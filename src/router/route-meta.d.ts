import 'vue-router'
import type { Role } from '../../shared/schemas/common'

export {}

declare module 'vue-router' {
  interface RouteMeta {
    /** Roles allowed to open the route; absent means any signed-in user. Take values from AREA_ROLES. */
    roles?: readonly Role[]
    /** Open without signing in (sign-in, links from e-mails, not found). */
    public?: boolean
    /** Shown in the browser tab as "<title> · Driftwarden". */
    title?: string
  }
}
