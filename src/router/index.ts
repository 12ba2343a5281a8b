import { type Router, createRouter, createWebHistory } from 'vue-router'
import { roleAllowed } from '../../shared/ui/access'
import { safeRedirectPath } from '../../shared/ui/safe-redirect'
import { useSessionStore } from '../stores/session'
import { ROUTE } from './route-names'
import { routes } from './routes'

export function createAppRouter(): Router {
  const router = createRouter({
    history: createWebHistory(),
    routes,
    scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
  })

  // Guards return a location instead of calling next(); the store is used inside, after Pinia is installed.
  router.beforeEach(async (to) => {
    const session = useSessionStore()
    await session.ensureLoaded()
    if (to.meta.public) {
      if (to.name === ROUTE.signIn && session.user) return safeRedirectPath(to.query.redirect)
      return true
    }
    if (!session.user) return { name: ROUTE.signIn, query: to.fullPath === '/' ? {} : { redirect: to.fullPath } }
    if (!roleAllowed(to.meta.roles, session.user.role)) return { name: ROUTE.notAllowed, query: { from: to.fullPath } }
    return true
  })

  router.afterEach((to) => {
    document.title = to.meta.title ? `${to.meta.title} · Driftwarden` : 'Driftwarden'
  })

  return router
}
