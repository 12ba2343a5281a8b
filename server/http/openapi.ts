import { z } from 'zod'
import type { RouteSpec } from './define-route'
import { ErrorBody } from '../../shared/schemas/common'

function schemaOf(s: z.ZodType, io: 'input' | 'output') {
  try {
    return z.toJSONSchema(s, { io, unrepresentable: 'any', target: 'draft-2020-12' })
  } catch {
    return {}
  }
}

/** OpenAPI 3.1 from the same zod schemas the routes validate with; x-roles says who may call each route. */
export function buildOpenApi(specs: RouteSpec<any, any, any>[]) {
  const paths: Record<string, Record<string, unknown>> = {}
  for (const s of specs) {
    const path = s.path.replace(/:([A-Za-z_]+)/g, '{$1}')
    const pathParams = [...s.path.matchAll(/:([A-Za-z_]+)/g)].map((m) => m[1]!)
    const parameters: unknown[] = pathParams.map((name) => ({ name, in: 'path', required: true, schema: { type: 'string' } }))
    if (s.query) {
      const js = schemaOf(s.query, 'input') as { properties?: Record<string, unknown>; required?: string[] }
      for (const [name, schema] of Object.entries(js.properties ?? {})) {
        parameters.push({ name, in: 'query', required: js.required?.includes(name) ?? false, schema })
      }
    }
    const roles = s.access === 'public' ? ['public'] : s.access === 'signed-in' ? ['admin', 'ehs_officer', 'lab_manager', 'staff'] : [...s.access]
    const ok = String(s.status ?? (s.response ? 200 : 204))
    const op: Record<string, unknown> = {
      summary: s.summary,
      tags: [s.tag],
      'x-roles': roles,
      parameters,
      responses: {
        [ok]: s.response
          ? { description: 'Success', content: { [s.responseContentType ?? 'application/json']: { schema: schemaOf(s.response, 'output') } } }
          : { description: s.responseContentType ? `A ${s.responseContentType} document` : 'Success' },
        default: { description: 'Error', content: { 'application/json': { schema: schemaOf(ErrorBody, 'output') } } },
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
