import type { App } from 'vue'
import type { Router } from 'vue-router'

/** What every boot installer receives; main.ts runs them in a fixed order. */
export interface BootContext {
  app: App
  router: Router
}

export type BootInstaller = (context: BootContext) => void | Promise<void>
