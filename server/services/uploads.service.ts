import { fileTypeFromBuffer } from 'file-type'
import { FLOOR_IMAGE_TYPES, type FloorImage } from '../../shared/schemas/floors'
import { AppError, notFound } from '../domain/errors'
import type { Actor } from '../domain/actor'
import { findFloorImage, insertFloorImage } from '../repositories/uploads.repo'
import type { ServiceContext } from './context'
import { requireVisibleFloor } from './floors.service'

type ImageRow = { id: number; floor_id: number; mime: FloorImage['mime']; byte_size: number; file_name: string; created_at: Date | string }

function toFloorImage(r: ImageRow): FloorImage {
  return { id: r.id, floorId: r.floor_id, mime: r.mime, byteSize: r.byte_size, fileName: r.file_name, createdAt: new Date(r.created_at).toISOString() }
}

/** Largest traced image: a floor plan scanned at 300 dpi on A0 is about 14 000 × 9 900 px (ISO 216), so 16 000 a side. */
export const MAX_IMAGE_SIDE_PX = 16_000
export const MAX_IMAGE_PIXELS = 150_000_000

/**
 * Width and height from the image's own header (issue 14: only the first bytes were checked, so a PNG claiming
 * 50 000 × 50 000 px was stored, and every browser tracing it would try to decode 10 GB). PNG: the IHDR chunk;
 * JPEG: the first start-of-frame marker. Null when the header is damaged.
 */
export function imageSize(b: Buffer, mime: FloorImage['mime']): { width: number; height: number } | null {
  if (mime === 'image/png') {
    if (b.length < 24 || b.toString('latin1', 12, 16) !== 'IHDR') return null
    const width = b.readUInt32BE(16), height = b.readUInt32BE(20)
    return width > 0 && height > 0 ? { width, height } : null
  }
  let i = 2
  while (i + 9 < b.length) {
    if (b[i] !== 0xff) return null
    const marker = b[i + 1]!
    if (marker === 0xff) { i++; continue }
    if (marker === 0xd8 || (marker >= 0xd0 && marker <= 0xd7) || marker === 0x01) { i += 2; continue }
    const len = b.readUInt16BE(i + 2)
    // SOF0–SOF15 carry the frame size, except DHT (C4), JPG (C8) and DAC (CC).
    if (marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc) {
      const height = b.readUInt16BE(i + 5), width = b.readUInt16BE(i + 7)
      return width > 0 && height > 0 ? { width, height } : null
    }
    if (len < 2) return null
    i += 2 + len
  }
  return null
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
  const size = imageSize(file.buffer, mime)
  if (!size) throw new AppError(400, 'bad_image', 'The image is damaged: its width and height cannot be read', { file: 'Damaged image' })
  if (size.width > MAX_IMAGE_SIDE_PX || size.height > MAX_IMAGE_SIDE_PX || size.width * size.height > MAX_IMAGE_PIXELS) {
    throw new AppError(400, 'image_too_large', `The image is ${size.width} × ${size.height} px; at most ${MAX_IMAGE_SIDE_PX} px a side and ${MAX_IMAGE_PIXELS / 1e6} megapixels`,
      { file: `At most ${MAX_IMAGE_SIDE_PX} × ${MAX_IMAGE_SIDE_PX} px` })
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
