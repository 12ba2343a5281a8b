import { computed } from 'vue'
import { useRouter } from 'vue-router'
import type { Role } from '../../shared/schemas/common'
import { roleAllowed } from '../../shared/ui/access'
import { NAV_ITEMS, type NavItem } from '../layouts/nav-items'

/** The navigation items `role` may use, limited to routes that exist in this build. */
export function useNavItems(role: () => Role | undefined) {
  const router = useRouter()
  return computed<NavItem[]>(() => {
    const current = role()
    if (!current) return []
    return NAV_ITEMS.filter((item) => {
      if (!router.hasRoute(item.routeName)) return false
      const record = router.getRoutes().find((r) => r.name === item.routeName)
      return roleAllowed(record?.meta.roles, current)
    })
  })
}
