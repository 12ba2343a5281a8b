import { z } from 'zod'
import type { RouteSpec } from './define-route'
import { pathParamNames } from '../../shared/contract/route'
import { ErrorBody, ROLES } from '../../shared/schemas/common'

function schemaOf(s: z.ZodType, io: 'input' | 'output') {
  try {
    return z.toJSONSchema(s, { io, unrepresentable: 'any', target: 'draft-2020-12' })
  } catch {
    return {}
  }
}

type ObjectSchema = { properties?: Record<string, unknown>; required?: string[] }

/** Path and query parameters, typed from the route's params and query schemas. */
function parametersOf(s: RouteSpec): unknown[] {
  const pathSchemas = s.params ? (schemaOf(s.params, 'input') as ObjectSchema).properties ?? {} : {}
  const out: unknown[] = pathParamNames(s.path).map((name) => ({ name, in: 'path', required: true, schema: pathSchemas[name] ?? { type: 'string' } }))
  if (s.query) {
    const js = schemaOf(s.query, 'input') as ObjectSchema
    for (const [name, schema] of Object.entries(js.properties ?? {})) {
      out.push({ name, in: 'query', required: js.required?.includes(name) ?? false, schema })
    }
  }
  return out
}

/** The failures a route can answer by construction: validation, sign-in, role, unknown id (all with ErrorBody). */
function errorResponses(s: RouteSpec) {
  const error = (description: string) => ({ description, content: { 'application/json': { schema: schemaOf(ErrorBody, 'output') } } })
  const out: Record<string, unknown> = {}
  if (s.params || s.query || s.body || s.requestContentType) out['400'] = error('Invalid input; error.fields names each field')
  if (s.access !== 'public') out['401'] = error('Not signed in')
  if (Array.isArray(s.access)) out['403'] = error(`Only for: ${s.access.join(', ')}`)
  if (s.params) out['404'] = error('Not found, or not visible to the caller')
  out.default = error('Error')
  return out
}

/** OpenAPI 3.1 from the route contract (shared/contract); x-roles says who may call each route. */
export function buildOpenApi(specs: RouteSpec[]) {
  const paths: Record<string, Record<string, unknown>> = {}
  for (const s of specs) {
    const path = s.path.replace(/:([A-Za-z_]+)/g, '{$1}')
    const roles = s.access === 'public' ? ['public'] : s.access === 'signed-in' ? [...ROLES] : [...s.access]
    const ok = String(s.status ?? (s.response ? 200 : 204))
    const op: Record<string, unknown> = {
      summary: s.summary,
      tags: [s.tag],
      'x-roles': roles,
      parameters: parametersOf(s),
      responses: {
        [ok]: s.response
          ? { description: 'Success', content: { [s.responseContentType ?? 'application/json']: { schema: schemaOf(s.response, 'output') } } }
          : { description: s.responseContentType ? `A ${s.responseContentType} document` : 'Success' },
        ...errorResponses(s),
      },
    }
    if (s.body) {
      op.requestBody = { required: true, content: { [s.requestContentType ?? 'application/json']: { schema: schemaOf(s.body, 'input') } } }
    } else if (s.requestContentType) {
      op.requestBody = { required: true, content: { [s.requestContentType]: { schema: { type: 'object' } } } }
    }
    ;(paths[path] ??= {})[s.method] = op
  }
  return {
    openapi: '3.1.0',
    info: {
      title: 'Driftwarden API',
      version: '1',
      description: 'Screening estimates for gas-release planning. Cookie sessions; state-changing calls need the x-csrf-token header.',
    },
    paths,
  }
}
