import VueKonva from 'vue-konva'
import type { BootInstaller } from './types'

/** Registers <v-stage>, <v-layer>, <v-rect>… for the floor editor and result views. */
export const install: BootInstaller = ({ app }) => {
  app.use(VueKonva)
}
