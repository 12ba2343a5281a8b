/**
 * The whole API contract: `contract.<area>.<route>`. Server route files register handlers against these entries,
 * `server/http/openapi.ts` documents them, and `src/api/http.ts`'s `call` builds requests from them.
 */
import { auth } from './auth'
import { drills } from './drills'
import { floors } from './floors'
import { plans, staleness } from './plans'
import { runs } from './runs'
import { scenarios } from './scenarios'
import { sites } from './sites'
import { system } from './system'
import { users } from './users'

export const contract = { system, auth, users, sites, floors, scenarios, runs, plans, staleness, drills }
export { pathOf, type Route, type Access, type Method, type PathParams } from './route'
