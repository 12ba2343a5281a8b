import type { ColumnType, Generated } from 'kysely'

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>

export interface OrganizationsTable {
  id: Generated<number>
  name: string
  created_at: Timestamp
}

export interface UsersTable {
  id: Generated<number>
  org_id: number
  email: string
  name: string
  role: 'admin' | 'ehs_officer' | 'lab_manager' | 'staff'
  status: 'invited' | 'active' | 'deactivated'
  password_hash: string | null
  unit_system: Generated<'metric' | 'imperial'>
  created_at: Timestamp
  updated_at: Timestamp
}

export interface AuthTokensTable {
  id: Generated<number>
  user_id: number
  purpose: 'invite' | 'reset'
  nonce_hash: string
  expires_at: Timestamp
  used_at: Timestamp | null
  created_at: Timestamp
}

export interface AppSecretsTable {
  name: string
  value: string
}

export interface OutgoingMailTable {
  id: Generated<number>
  org_id: number | null
  kind: string
  ref: string | null
  to_address: string
  subject: string
  text_body: string
  html_body: string
  ics: string | null
  status: 'pending' | 'sent' | 'failed'
  attempts: Generated<number>
  next_attempt_at: Timestamp
  last_error: string | null
  created_at: Timestamp
  sent_at: Timestamp | null
}

export interface CapturedMailTable {
  id: Generated<number>
  org_id: number | null
  received_at: Timestamp
  envelope_from: string
  envelope_to: string[]
  subject: string
  text_body: string
  html_body: string | null
  attachments: ColumnType<CapturedAttachment[], string, string>
  raw: string
}
export interface CapturedAttachment {
  filename: string
  contentType: string
  size: number
  /** Text content for small text attachments (calendar files), so tests and the outbox can read them. */
  content?: string
}

export interface AuditLogTable {
  id: Generated<string>
  org_id: number
  actor_id: number | null
  action: string
  target_type: string
  target_id: string | null
  detail: ColumnType<Record<string, unknown>, string | undefined, string>
  at: Timestamp
}
