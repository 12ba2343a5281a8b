// Order matters: Quasar's base styles first, then the font and icons, then our overrides on top.
import 'quasar/dist/quasar.css'
import '@fontsource/atkinson-hyperlegible/400.css'
import '@fontsource/atkinson-hyperlegible/400-italic.css'
import '@fontsource/atkinson-hyperlegible/700.css'
import '@quasar/extras/material-icons/material-icons.css'
import '../css/app.css'
import type { BootInstaller } from './types'

/** Stylesheets are side-effect imports; this installer exists so main.ts lists every start-up step. */
export const install: BootInstaller = () => {}
