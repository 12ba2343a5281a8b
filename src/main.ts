import { createApp } from 'vue'
import App from './App.vue'
import * as styles from './boot/styles'
import * as quasar from './boot/quasar'
import * as pinia from './boot/pinia'
import * as csrf from './boot/csrf'
import * as router from './boot/router'
import type { BootContext } from './boot/types'
import { createAppRouter } from './router'

// Explicit order: Pinia before the router (its guard uses the session store), CSRF cookie before the first navigation.
const bootModules = [styles, quasar, pinia, csrf, router]

async function start(): Promise<void> {
  const app = createApp(App)
  const context: BootContext = { app, router: createAppRouter() }
  for (const module of bootModules) await module.install(context)
  await context.router.isReady()
  app.mount('#app')
}

void start()
