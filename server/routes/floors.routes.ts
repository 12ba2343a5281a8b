import multer from 'multer'
import { IdParam } from '../../shared/schemas/common'
import {
  FLOOR_API, FloorDetail, FloorImage, FloorImageParams, FloorList, FloorUpdate, MAX_FLOOR_IMAGE_BYTES, SavePlanInput,
  SavePlanResult, ScenarioExportQuery,
} from '../../shared/schemas/floors'
import type { ApiRoutes } from '../http/define-route'
import { AppError } from '../http/errors'
import type { ServiceContext } from '../services/context'
import * as floors from '../services/floors.service'
import * as uploads from '../services/uploads.service'

const OFFICERS = ['admin', 'ehs_officer'] as const

// Kept in memory: the bytes go straight into PostgreSQL, and the size limit stops big bodies early (413).
const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_FLOOR_IMAGE_BYTES, files: 1, fields: 5 } })

/** A multipart body without a boundary, cut short or malformed is the sender's fault: 400 on "file", not 500 (issue 14). */
function uploadError(err: unknown): unknown {
  if (err instanceof multer.MulterError || err instanceof AppError) return err
  const message = err instanceof Error ? err.message : String(err)
  return new AppError(400, 'bad_upload', `The upload could not be read (${message}); send the image as multipart/form-data in the field "file"`, { file: 'The upload could not be read' })
}

export function floorsRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add({ method: 'get', path: FLOOR_API.floors, summary: 'Every floor the caller can see', tag: 'floors', access: 'signed-in', response: FloorList },
    ({ actor }) => floors.listVisibleFloors(ctx, actor))

  api.add({ method: 'get', path: '/api/floors/:id', summary: 'A floor with its plan and the plan checks', tag: 'floors', access: 'signed-in', params: IdParam, response: FloorDetail },
    ({ actor, params }) => floors.getFloor(ctx, actor, params.id))

  api.add({ method: 'patch', path: '/api/floors/:id', summary: 'Rename a floor, change its ceiling or its people', tag: 'floors', access: OFFICERS, params: IdParam, body: FloorUpdate, response: FloorDetail },
    ({ actor, params, body }) => floors.changeFloor(ctx, actor, params.id, body))

  api.add({ method: 'delete', path: '/api/floors/:id', summary: 'Delete a floor', tag: 'floors', access: OFFICERS, params: IdParam },
    ({ actor, params }) => floors.removeFloor(ctx, actor, params.id))

  api.add({ method: 'put', path: '/api/floors/:id/plan', summary: 'Save the plan (409 stale_version when someone saved since `version`)', tag: 'floors', access: OFFICERS, params: IdParam, body: SavePlanInput, response: SavePlanResult },
    ({ actor, params, body }) => floors.savePlan(ctx, actor, params.id, body.version, body.plan))

  api.add({ method: 'get', path: '/api/floors/:id/scenario', summary: 'The floor as an engine scenario file (400 plan_invalid with the reasons)', tag: 'floors', access: 'signed-in', params: IdParam, query: ScenarioExportQuery },
    async ({ actor, params, query, res }) => {
      const scenario = await floors.exportScenario(ctx, actor, params.id, query)
      res.setHeader('Content-Disposition', `attachment; filename="floor-${params.id}-scenario.json"`)
      return scenario
    })

  api.add({ method: 'post', path: '/api/floors/:id/images', summary: 'Upload a PNG or JPEG floor plan to trace (at most 10 MB)', tag: 'floors', access: OFFICERS, params: IdParam, response: FloorImage, status: 201, requestContentType: 'multipart/form-data' },
    async ({ actor, params, req, res }) => {
      // Parsed here, after the role check, so unauthorised callers never get their upload buffered.
      await new Promise<void>((resolve, reject) => upload.single('file')(req, res, (err: unknown) => (err ? reject(uploadError(err)) : resolve())))
      return uploads.uploadFloorImage(ctx, actor, params.id, req.file)
    })

  api.add({ method: 'get', path: '/api/floors/:id/images/:imageId', summary: 'A traced floor-plan image', tag: 'floors', access: 'signed-in', params: FloorImageParams, responseContentType: 'image/png' },
    async ({ actor, params, res }) => {
      const img = await uploads.readFloorImage(ctx, actor, params.id, params.imageId)
      res.setHeader('Content-Type', img.mime)
      res.setHeader('Cache-Control', 'private, max-age=86400, immutable')
      res.setHeader('X-Content-Type-Options', 'nosniff')
      res.end(img.bytes)
    })
}
