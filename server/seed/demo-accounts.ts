import type { Role } from '../../shared/schemas/common'

/** The invented demo organization; README lists these sign-ins. Demo data only. */
export const DEMO_ORG_NAME = 'Calder Ridge Device Research'
export const DEMO_SITE_NAME = 'Building C, Thin-Film Wing'

export const DEMO_ACCOUNTS: { role: Role; email: string; password: string; name: string }[] = [
  { role: 'admin', email: 'admin@calder-ridge.example', password: 'demo-admin-2026', name: 'Imogen Varga' },
  { role: 'ehs_officer', email: 'officer@calder-ridge.example', password: 'demo-officer-2026', name: 'Tomasz Oyelaran' },
  { role: 'lab_manager', email: 'manager@calder-ridge.example', password: 'demo-manager-2026', name: 'Priya Halvorsen' },
  { role: 'staff', email: 'staff@calder-ridge.example', password: 'demo-staff-2026', name: 'Dario Kwan' },
]
