import type {
  AppSecretsTable, AuditLogTable, AuthTokensTable, CapturedMailTable, OrganizationsTable, OutgoingMailTable, UsersTable,
} from './tables/foundation'
import type { FloorTables } from './tables/floors'
import type { RunTables } from './tables/runs'
import type { PlanTables } from './tables/plans'
import type { DrillTables } from './tables/drills'
import type { StalenessTables } from './tables/staleness'
import type { InvitationTables } from './tables/invitations'

/** The whole database as Kysely sees it; each feature's tables live in ./tables. */
export interface Database extends FloorTables, RunTables, PlanTables, DrillTables, StalenessTables, InvitationTables {
  organizations: OrganizationsTable
  users: UsersTable
  auth_tokens: AuthTokensTable
  app_secrets: AppSecretsTable
  outgoing_mail: OutgoingMailTable
  captured_mail: CapturedMailTable
  audit_log: AuditLogTable
}
