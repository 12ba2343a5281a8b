import { onUnauthorized } from '../api/http'
import { ROUTE } from '../router/route-names'
import { useSessionStore } from '../stores/session'
import type { BootInstaller } from './types'

/** Installs the router and sends people to sign in when the server says their session has ended. */
export const install: BootInstaller = ({ app, router }) => {
  app.use(router)
  onUnauthorized(() => {
    useSessionStore().forgetUser()
    const current = router.currentRoute.value
    if (!current.meta.public) void router.push({ name: ROUTE.signIn, query: { redirect: current.fullPath } })
  })
}
