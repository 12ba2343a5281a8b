import request from 'supertest'
import type { Runtime } from '../../server/runtime'

export interface OpenApiRoute {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete'
  /** OpenAPI path, e.g. /api/users/{id} */
  path: string
  roles: string[]
  bodySchema?: { type?: string; properties?: Record<string, { type?: string | string[] }>; required?: string[] }
  contentType?: string
}

/** Every route the server documents, read back from its own /api/openapi.json. */
export async function documentedRoutes(rt: Runtime): Promise<OpenApiRoute[]> {
  const doc = (await request(rt.app).get('/api/openapi.json').expect(200)).body
  const out: OpenApiRoute[] = []
  for (const [path, ops] of Object.entries<Record<string, any>>(doc.paths)) {
    for (const [method, op] of Object.entries<any>(ops)) {
      const content = op.requestBody?.content ?? {}
      const contentType = Object.keys(content)[0]
      out.push({ method: method as OpenApiRoute['method'], path, roles: op['x-roles'], bodySchema: contentType ? content[contentType].schema : undefined, contentType })
    }
  }
  return out
}

/** Fills every {param} with a value; ids that exist nowhere unless `ids` gives one. */
export function fillPath(path: string, ids: Record<string, string | number> = {}): string {
  return path.replace(/\{([^}]+)\}/g, (_m, name: string) => String(ids[name] ?? 999999))
}
