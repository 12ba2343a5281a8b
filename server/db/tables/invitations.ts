import type { ColumnType, Generated } from 'kysely'
import type { UsersTable } from './foundation'

type Timestamp = ColumnType<Date, Date | string | undefined, Date | string>
type NullableStamp = ColumnType<Date | null, Date | string | null | undefined, Date | string | null>

/** An invitation, apart from accounts; its id is drawn from the users' sequence (see the migration). */
export interface InvitationsTable {
  id: Generated<number>
  org_id: number
  email: string
  name: string
  role: UsersTable['role']
  status: Generated<'pending' | 'revoked' | 'accepted'>
  /** Null when no link was sent (the address has an account with another organization). */
  nonce_hash: string | null
  expires_at: Timestamp
  used_at: NullableStamp
  invited_by: number | null
  created_at: Generated<Date>
  updated_at: Generated<Date>
}

export interface InvitationTables {
  invitations: InvitationsTable
}
