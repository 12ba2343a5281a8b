import { createPinia } from 'pinia'
import type { BootInstaller } from './types'

export const install: BootInstaller = ({ app }) => {
  app.use(createPinia())
}
