import multer from 'multer'
import { MAX_FLOOR_IMAGE_BYTES } from '../../shared/schemas/floors'
import { contract } from '../../shared/contract'
import type { ApiRoutes } from '../http/define-route'
import { AppError } from '../http/errors'
import type { ServiceContext } from '../services/context'
import * as floors from '../services/floors.service'
import * as uploads from '../services/uploads.service'


// Kept in memory: the bytes go straight into PostgreSQL, and the size limit stops big bodies early (413).
const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_FLOOR_IMAGE_BYTES, files: 1, fields: 5 } })

/** A multipart body without a boundary, cut short or malformed is the sender's fault: 400 on "file", not 500 (issue 14). */
function uploadError(err: unknown): unknown {
  if (err instanceof multer.MulterError || err instanceof AppError) return err
  const message = err instanceof Error ? err.message : String(err)
  return new AppError(400, 'bad_upload', `The upload could not be read (${message}); send the image as multipart/form-data in the field "file"`, { file: 'The upload could not be read' })
}

export function floorsRoutes(api: ApiRoutes, ctx: ServiceContext) {
  api.add(contract.floors.list,
    ({ actor }) => floors.listVisibleFloors(ctx, actor))

  api.add(contract.floors.get,
    ({ actor, params }) => floors.getFloor(ctx, actor, params.id))

  api.add(contract.floors.update,
    ({ actor, params, body }) => floors.changeFloor(ctx, actor, params.id, body))

  api.add(contract.floors.remove,
    ({ actor, params }) => floors.removeFloor(ctx, actor, params.id))

  api.add(contract.floors.savePlan,
    ({ actor, params, body }) => floors.savePlan(ctx, actor, params.id, body.version, body.plan))

  api.add(contract.floors.exportScenario,
    async ({ actor, params, query, res }) => {
      const scenario = await floors.exportScenario(ctx, actor, params.id, query)
      res.setHeader('Content-Disposition', `attachment; filename="floor-${params.id}-scenario.json"`)
      return scenario
    })

  api.add(contract.floors.uploadImage,
    async ({ actor, params, req, res }) => {
      // Parsed here, after the role check, so unauthorised callers never get their upload buffered.
      await new Promise<void>((resolve, reject) => upload.single('file')(req, res, (err: unknown) => (err ? reject(uploadError(err)) : resolve())))
      return uploads.uploadFloorImage(ctx, actor, params.id, req.file)
    })

  api.add(contract.floors.image,
    async ({ actor, params, res }) => {
      const img = await uploads.readFloorImage(ctx, actor, params.id, params.imageId)
      res.setHeader('Content-Type', img.mime)
      res.setHeader('Cache-Control', 'private, max-age=86400, immutable')
      res.setHeader('X-Content-Type-Options', 'nosniff')
      res.end(img.bytes)
    })
}
