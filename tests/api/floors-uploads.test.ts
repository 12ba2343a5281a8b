import { deflateSync } from 'node:zlib'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { contract, pathOf } from '../../shared/contract'
import { MAX_FLOOR_IMAGE_BYTES } from '../../shared/schemas/floors'
import { createOtherOrg, signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'

const acct = (role: string) => DEMO_ACCOUNTS.find((a) => a.role === role)!

/** A real 2×2 RGB PNG, built byte by byte (signature, IHDR, IDAT, IEND with CRCs). */
function tinyPng(): Buffer {
  const crcTable = Array.from({ length: 256 }, (_, n) => {
    let c = n
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1
    return c >>> 0
  })
  const crc = (buf: Buffer) => {
    let c = 0xffffffff
    for (const b of buf) c = crcTable[(c ^ b) & 0xff]! ^ (c >>> 8)
    return (c ^ 0xffffffff) >>> 0
  }
  const chunk = (type: string, data: Buffer) => {
    const len = Buffer.alloc(4); len.writeUInt32BE(data.length)
    const td = Buffer.concat([Buffer.from(type, 'ascii'), data])
    const c = Buffer.alloc(4); c.writeUInt32BE(crc(td))
    return Buffer.concat([len, td, c])
  }
  const ihdr = Buffer.alloc(13)
  ihdr.writeUInt32BE(2, 0); ihdr.writeUInt32BE(2, 4); ihdr[8] = 8; ihdr[9] = 2
  const raw = Buffer.from([0, 255, 0, 0, 0, 255, 0, 0, 0, 0, 255, 255, 255, 255])
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(raw)), chunk('IEND', Buffer.alloc(0))])
}

let rt: Runtime
let officer: ApiAgent
let floorId: number
beforeAll(async () => {
  rt = await startTestRuntime()
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
  const siteId = (await officer.post(contract.sites.create.path).send({ name: `Upload site ${Date.now()}` }).expect(201)).body.id
  const staffId = (await officer.get(contract.sites.people.path)).body.people.find((p: { role: string }) => p.role === 'staff').id
  floorId = (await officer.post(pathOf(contract.sites.createFloor, { id: siteId })).send({ name: 'Traced', ceilingHeightM: 3, memberIds: [staffId] }).expect(201)).body.id
})
afterAll(() => rt.close())

describe('POST /api/floors/:id/images', () => {
  it('accepts a PNG, stores its bytes and serves them back with its type', async () => {
    const png = tinyPng()
    const res = await officer.post(pathOf(contract.floors.uploadImage, { id: floorId })).attach('file', png, { filename: 'plan.png', contentType: 'image/png' }).expect(201)
    expect(res.body).toMatchObject({ floorId, mime: 'image/png', byteSize: png.length, fileName: 'plan.png' })
    const back = await officer.get(pathOf(contract.floors.image, { id: floorId, imageId: res.body.id })).buffer(true).expect(200)
    expect(back.headers['content-type']).toBe('image/png')
    expect(Buffer.compare(back.body as Buffer, png)).toBe(0)
    // Staff assigned to the floor may look at the image too.
    const staff = await signIn(rt, acct('staff').email, acct('staff').password)
    await staff.get(pathOf(contract.floors.image, { id: floorId, imageId: res.body.id })).expect(200)
  })
  it('judges by the bytes: a PNG named .txt with a text type is still a PNG', async () => {
    const res = await officer.post(pathOf(contract.floors.uploadImage, { id: floorId })).attach('file', tinyPng(), { filename: 'notes.txt', contentType: 'text/plain' }).expect(201)
    expect(res.body.mime).toBe('image/png')
  })
  it('refuses a text file renamed to .png (415)', async () => {
    const res = await officer.post(pathOf(contract.floors.uploadImage, { id: floorId }))
      .attach('file', Buffer.from('#!/bin/sh\necho not an image\n'), { filename: 'plan.png', contentType: 'image/png' }).expect(415)
    expect(res.body.error).toMatchObject({ code: 'unsupported_type', fields: { file: 'PNG or JPEG only' } })
  })
  it('refuses an SVG, even one that says it is a PNG (415)', async () => {
    const svg = Buffer.from('<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><script>alert(1)</script></svg>')
    await officer.post(pathOf(contract.floors.uploadImage, { id: floorId })).attach('file', svg, { filename: 'plan.svg', contentType: 'image/svg+xml' }).expect(415)
    await officer.post(pathOf(contract.floors.uploadImage, { id: floorId })).attach('file', svg, { filename: 'plan.png', contentType: 'image/png' }).expect(415)
  })
  it('refuses a file over 10 MB with 413', async () => {
    const big = Buffer.concat([tinyPng(), Buffer.alloc(MAX_FLOOR_IMAGE_BYTES)])
    const res = await officer.post(pathOf(contract.floors.uploadImage, { id: floorId })).attach('file', big, { filename: 'huge.png', contentType: 'image/png' }).expect(413)
    expect(res.body.error.code).toBe('too_large')
  })
  it('asks for a file when none is attached (400 naming the field)', async () => {
    const res = await officer.post(pathOf(contract.floors.uploadImage, { id: floorId })).field('note', 'no file').expect(400)
    expect(res.body.error.fields).toEqual({ file: 'Required' })
  })
  it('staff cannot upload (403); another organization cannot read (404)', async () => {
    const staff = await signIn(rt, acct('staff').email, acct('staff').password)
    await staff.post(pathOf(contract.floors.uploadImage, { id: floorId })).attach('file', tinyPng(), 'plan.png').expect(403)
    const id = (await officer.post(pathOf(contract.floors.uploadImage, { id: floorId })).attach('file', tinyPng(), 'plan.png').expect(201)).body.id
    const other = await createOtherOrg(rt.ctx.db, rt.ctx.config)
    const stranger = await signIn(rt, other.users.admin.email, other.password)
    await stranger.get(pathOf(contract.floors.image, { id: floorId, imageId: id })).expect(404)
    await stranger.post(pathOf(contract.floors.uploadImage, { id: floorId })).attach('file', tinyPng(), 'plan.png').expect(404)
  })
})
