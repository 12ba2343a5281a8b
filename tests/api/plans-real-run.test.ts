import { execFileSync } from 'node:child_process'
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { RunDetail } from '../../shared/schemas/runs'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { acct, demoFloorAndScenario, waitForRun } from './runs-fixtures'

/** A plan from a real engine run on the demo floor: the runs helper's queue, worker and stored fields, then the plan rules and PDF. */
let rt: Runtime
let officer: ApiAgent
let floorId: number
let scenarioId: number

beforeAll(async () => {
  rt = await startTestRuntime({ inProcessWorkers: 1 }, { background: true })
  ;({ floorId, scenarioId } = await demoFloorAndScenario(rt))
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
})
afterAll(() => rt.close())

describe('a plan from a real run', () => {
  it('generates from the stored summary, traces every line to the run, and draws the stored fronts in the PDF', async () => {
    const started = await officer.post(`/api/scenarios/${scenarioId}/runs`).expect(202)
    const { run } = await waitForRun(officer, started.body.id, (r) => ['succeeded', 'failed', 'cancelled'].includes(r.status))
    expect(run.status).toBe('succeeded')
    const summary = RunDetail.parse(run).summary!

    const choices = (await officer.get(`/api/plans/runs-of-floor/${floorId}`).expect(200)).body.runs
    expect(choices.map((r: { id: number }) => r.id)).toContain(run.id)
    // Each choice says how many detectors it had and whether the floor changed since (here: not)
    expect(choices.find((r: { id: number }) => r.id === run.id)).toMatchObject({
      detectorCount: summary.receptors.filter((x) => x.kind === 'detector').length, floorChanged: false,
    })
    const plan = (await officer.post('/api/plans').send({ floorId, runIds: [run.id] }).expect(201)).body
    const c = plan.current.content
    expect(c.title).toContain(summary.gas.name)
    expect(c.predicted.firstAlarmS).toBe(summary.firstAlarm?.timeS ?? null)
    const first = c.timeline.rows.find((r: { kind: string }) => r.kind === 'first_alarm')
    expect(first.timeS).toBe(summary.firstAlarm?.timeS ?? null)
    for (const section of [c.timeline.rows, c.evacuation.rooms, c.actions.items, c.protection.reentry, c.checklist]) {
      for (const line of section) expect(line.from?.runId ?? run.id).toBe(run.id)
    }
    // Every room of the result is placed, and the gas room's door comes from the drawn floor
    expect(c.evacuation.rooms.map((r: { roomId: string }) => r.roomId).sort()).toEqual(summary.rooms.map((r) => r.id).sort())
    const gasRoom = c.evacuation.rooms.find((r: { roomId: string }) => r.roomId === 'gas-room')
    expect(gasRoom.doors.map((d: { name: string }) => d.name)).toEqual(['G-204 door'])
    // Workstation times match the stored summary
    for (const w of summary.receptors.filter((r) => r.kind === 'workstation')) {
      const row = c.timeline.rows.find((r: { id: string }) => r.id === `tl-${run.id}-${w.id}-idlh`)
      if (row) expect(row.timeS).toBe(w.firstExceedS.idlh ?? null)
    }

    await officer.post(`/api/plans/${plan.id}/publish`).send({}).expect(200)
    const pdf = await officer.get(`/api/plans/${plan.id}/versions/1/pdf`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = []
      res.on('data', (x: Buffer) => chunks.push(x)).on('end', () => cb(null, Buffer.concat(chunks)))
    }).expect(200)
    mkdirSync('tests/artifacts', { recursive: true })
    writeFileSync('tests/artifacts/plan-real-run.pdf', pdf.body)
    const dir = mkdtempSync(path.join(tmpdir(), 'plan-real-'))
    writeFileSync(path.join(dir, 'p.pdf'), pdf.body)
    const text = execFileSync('pdftotext', [path.join(dir, 'p.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ')
    expect(text).toContain('Areas from the stored fronts at breathing height')
    expect(text).toContain(summary.gas.name)
    expect(text).toMatch(/Caution: Screening estimate only/)
  })
})
