import type { Db } from '../db/database'
import type { FloorImagesTable } from '../db/tables/floors'

const META = ['id', 'floor_id', 'mime', 'byte_size', 'file_name', 'created_at'] as const

export const insertFloorImage = (
  db: Db,
  img: { orgId: number; floorId: number; mime: FloorImagesTable['mime']; bytes: Buffer; fileName: string; userId: number },
) =>
  db
    .insertInto('floor_images')
    .values({ org_id: img.orgId, floor_id: img.floorId, mime: img.mime, bytes: img.bytes, byte_size: img.bytes.length,
      file_name: img.fileName, created_by: img.userId })
    .returning(META)
    .executeTakeFirstOrThrow()

export const findFloorImage = (db: Db, orgId: number, floorId: number, id: number) =>
  db.selectFrom('floor_images').select([...META, 'bytes']).where('id', '=', id).where('floor_id', '=', floorId)
    .where('org_id', '=', orgId).executeTakeFirst()

export const listFloorImages = (db: Db, orgId: number, floorId: number) =>
  db.selectFrom('floor_images').select(META).where('floor_id', '=', floorId).where('org_id', '=', orgId)
    .orderBy('created_at', 'desc').execute()
