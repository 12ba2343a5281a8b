import { fileTypeFromBuffer } from 'file-type'
import { FLOOR_IMAGE_TYPES, type FloorImage } from '../../shared/schemas/floors'
import { AppError, notFound } from '../http/errors'
import type { Actor } from '../http/session-user'
import { findFloorImage, insertFloorImage } from '../repositories/uploads.repo'
import type { ServiceContext } from './context'
import { requireVisibleFloor } from './floors.service'

type ImageRow = { id: number; floor_id: number; mime: FloorImage['mime']; byte_size: number; file_name: string; created_at: Date | string }

function toFloorImage(r: ImageRow): FloorImage {
  return { id: r.id, floorId: r.floor_id, mime: r.mime, byteSize: r.byte_size, fileName: r.file_name, createdAt: new Date(r.created_at).toISOString() }
}

/**
 * Store a floor-plan image to trace over. The type is decided by the file's bytes (file-type), never by
 * its name or the browser's content type: a text file renamed .png is refused, and so is SVG, which can
 * carry scripts.
 */
export async function uploadFloorImage(
  ctx: ServiceContext, actor: Actor, floorId: number, file: { buffer: Buffer; originalname: string } | undefined,
): Promise<FloorImage> {
  await requireVisibleFloor(ctx.db, actor, floorId)
  if (!file || file.buffer.length === 0) throw new AppError(400, 'validation_failed', 'Attach an image in the field “file”', { file: 'Required' })
  const detected = await fileTypeFromBuffer(file.buffer)
  const mime = detected?.mime as FloorImage['mime'] | undefined
  if (!mime || !FLOOR_IMAGE_TYPES.includes(mime)) {
    throw new AppError(415, 'unsupported_type', `Only PNG or JPEG images can be traced; this file is ${detected?.mime ?? 'not an image we recognise'}`,
      { file: 'PNG or JPEG only' })
  }
  const fileName = file.originalname.replace(/[^\w.\- ]+/g, '_').slice(0, 120)
  return toFloorImage(await insertFloorImage(ctx.db, { orgId: actor.orgId, floorId, mime, bytes: file.buffer, fileName, userId: actor.id }))
}

export async function readFloorImage(ctx: ServiceContext, actor: Actor, floorId: number, imageId: number) {
  await requireVisibleFloor(ctx.db, actor, floorId)
  const row = await findFloorImage(ctx.db, actor.orgId, floorId, imageId)
  if (!row) throw notFound('Image')
  return { mime: row.mime, bytes: row.bytes }
}
