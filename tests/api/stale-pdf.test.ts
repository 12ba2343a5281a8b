import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { fixtureFloor } from '../unit/plans-fixtures'
import { acct, planFixture } from './plans-fixtures'

/** Issue 17, item 6: a stale plan says so in its PDF's header, with the reason, before the caution; an up-to-date one does not. */
let rt: Runtime
let officer: ApiAgent
beforeAll(async () => {
  rt = await startTestRuntime({ inProcessWorkers: 0 }, { background: false })
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
})
afterAll(() => rt.close())

async function pdfText(url: string) {
  const res = await officer.get(url).buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = []
    r.on('data', (x: Buffer) => chunks.push(x)).on('end', () => cb(null, Buffer.concat(chunks)))
  }).expect(200)
  const dir = mkdtempSync(path.join(tmpdir(), 'stale-pdf-'))
  writeFileSync(path.join(dir, 'p.pdf'), res.body)
  return execFileSync('pdftotext', ['-l', '1', path.join(dir, 'p.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ')
}

describe('stale plan PDF', () => {
  it('puts the out-of-date notice and its reason in the header of the first page', async () => {
    const fx = await planFixture(rt)
    const id = (await officer.post('/api/plans').send({ floorId: fx.floorId, runIds: [fx.runId], title: 'Stale PDF plan' }).expect(201)).body.id
    await officer.post(`/api/plans/${id}/publish`).send({}).expect(200)
    const before = await pdfText(`/api/plans/${id}/versions/1/pdf`)
    expect(before).not.toContain('OUT OF DATE')

    const floor = fixtureFloor()
    floor.rooms[1]!.ventilation = { mode: 'ach', airChangesPerHour: 4 }
    await officer.put(`/api/floors/${fx.floorId}/plan`).send({ version: 1, plan: floor }).expect(200)
    const text = await pdfText(`/api/plans/${id}/versions/1/pdf`)
    const notice = text.indexOf('OUT OF DATE since')
    expect(notice).toBeGreaterThan(0)
    expect(notice).toBeLessThan(text.indexOf('Screening estimate, not a safety determination'))
    expect(text).toMatch(/OUT OF DATE since \d{4}-\d\d-\d\d: what this plan is built on has changed/)
    expect(text).toContain("Floor plan changed: room Lab B's air changes changed from 6 to 4")
  })
})
