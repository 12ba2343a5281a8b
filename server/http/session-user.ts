import type { RequestHandler } from 'express'
import type { Actor } from '../domain/actor'
import type { Db } from '../db/database'
import { findActiveUserById } from '../repositories/users.repo'

export type { Actor } from '../domain/actor'

declare module 'express-session' {
  interface SessionData {
    userId?: number
  }
}
declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      actor?: Actor
    }
  }
}

/** Loads the session's user on each request, so a deactivated account or changed role takes effect at once. */
export function loadActor(db: Db): RequestHandler {
  return async (req, _res, next) => {
    const id = req.session?.userId
    if (id) {
      const u = await findActiveUserById(db, id)
      if (u) req.actor = { id: u.id, orgId: u.org_id, role: u.role, email: u.email, name: u.name }
    }
    next()
  }
}
