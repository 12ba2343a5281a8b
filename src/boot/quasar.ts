import { Dialog, Loading, Notify, Quasar } from 'quasar'
import { BRAND_COLOURS } from '../css/brand'
import type { BootInstaller } from './types'

export const install: BootInstaller = ({ app }) => {
  app.use(Quasar, {
    plugins: { Notify, Dialog, Loading },
    config: {
      brand: BRAND_COLOURS,
      notify: { position: 'top', timeout: 6000, actions: [{ icon: 'close', color: 'white', 'aria-label': 'Dismiss' }] },
      loading: { delay: 300 },
    },
  })
}
