import { execFileSync } from 'node:child_process'
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Runtime } from '../../server/runtime'
import { egressFigureSvg } from '../../shared/egress/figure'
import { EgressResult } from '../../shared/schemas/egress'
import { signIn, startTestRuntime, type ApiAgent } from '../support/test-runtime'
import { shortcutFloorRun, shortcutPlan } from './egress-fixtures'
import { acct, demoFloorAndScenario } from './runs-fixtures'

/**
 * The ways out in the plan's PDF (issue 13, item 6): a real run on a floor where the short way out of office A
 * crosses the gas room; the PDF draws the routes, names the exits and the assembly point, says "No safe route" for
 * the gas room itself and gives the dose along each way out, with the caution.
 */
let rt: Runtime
let officer: ApiAgent
let orgId: number

beforeAll(async () => {
  rt = await startTestRuntime({ inProcessWorkers: 1 }, { background: true })
  ;({ orgId } = await demoFloorAndScenario(rt))
  officer = await signIn(rt, acct('ehs_officer').email, acct('ehs_officer').password)
})
afterAll(() => rt.close())

const pdfText = async (url: string) => {
  const pdf = await officer.get(url).buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = []
    res.on('data', (x: Buffer) => chunks.push(x)).on('end', () => cb(null, Buffer.concat(chunks)))
  }).expect(200)
  mkdirSync('tests/artifacts', { recursive: true })
  writeFileSync('tests/artifacts/plan-egress.pdf', pdf.body)
  const dir = mkdtempSync(path.join(tmpdir(), 'plan-egress-'))
  writeFileSync(path.join(dir, 'p.pdf'), pdf.body)
  return execFileSync('pdftotext', [path.join(dir, 'p.pdf'), '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ')
}

describe('ways out in the plan PDF', () => {
  it('draws the routes with exits and the assembly point, states the unsafe room plainly and the dose along each way', async () => {
    const { floorId, run } = await shortcutFloorRun(rt, officer, orgId)
    const egress = EgressResult.parse((await officer.get(`/api/runs/${run.id}/egress`).expect(200)).body)
    const fromA = egress.routes.find((r) => r.fromRoomId === 'A' && r.fromWorkstationId === null)!
    expect(fromA.safe).toBe(true)
    expect(egress.roomsReachingCriticalIds).toContain('S')

    const plan = (await officer.post('/api/plans').send({ floorId, runIds: [run.id] }).expect(201)).body
    const text = await pdfText(`/api/plans/${plan.id}/versions/${plan.current.version}/pdf`)
    expect(text).toContain(`Figure: ways out, run #${run.id}`)
    // Exits by kind and the assembly point, from the figure's own text.
    expect(text).toContain('EXIT · stair')
    expect(text).toContain('EXIT · outdoors')
    expect(text).toContain('Car park')
    // Safe vs no safe route in words, per room and workstation.
    expect(text).toMatch(/No safe route under these conditions from Gas room S/)
    // (pdftotext's reading order of table cells follows the page layout, so cells are checked one by one.)
    expect(text).toMatch(/Safe way out: 25 s on foot from 2 min/)
    expect(text).toContain('Desk A (Office A)')
    expect(text).toMatch(/Safe way out: 26 s on foot from 2 min/)
    expect(text).toContain('Leave Desk A by A–C door, then Stair door via Corridor C')
    expect(text).toContain('No safe route from Gas room S under these conditions: leaving at 2 min, every route to an exit crosses IDLH')
    expect(text).toContain('A–C door, then Stair door (Exit to a stair) via Corridor C')
    // Dose along the route against the gas's limits (ammonia: NIOSH REL STEL 35 ppm).
    expect(text).toMatch(/Dose along the walk: [\d.,]+ ppm·s, [\d.,]+ ppm averaged over 15 minutes \(no other exposure assumed\): (below|at or above) the NIOSH REL \(STEL\)( \(default alarm 2\))? of 35 ppm/)
    expect(text).toMatch(/Peak met on the way: [\d.,]+ ppm/)
    expect(text).toContain('Planning advice for drills, not live guidance during an incident')
    expect(text).toMatch(/Caution: Screening estimate only/)
  }, 240_000)

  it('the figure never draws an unsafe route and marks the room without one', () => {
    const plan = shortcutPlan()
    const route = (over: Partial<EgressResult['routes'][number]>): EgressResult['routes'][number] => ({
      fromRoomId: 'A', fromWorkstationId: null, exitOpeningId: 'E2', viaRoomIds: ['C'], doorIds: ['d-ac', 'E2'], startS: 120, walkS: 30, distanceM: 36,
      peakPpm: 1, doseppmS: 10, stelEquivalentPpm: 0.01, timeAboveS: {}, crossesCriticalRoom: false, criticalRoomIds: [], safe: true, closesS: null,
      beyondRun: false, reason: '', path: [[2, 2], [2, 4], [30, 5]], ...over,
    })
    const egress: EgressResult = {
      runId: 1, speedMS: 1.2, speedBasis: '', startS: 120, startBasis: '', criticalLimit: { key: 'idlh', label: 'IDLH', ppm: 300 }, exitIds: ['E1', 'E2'],
      assemblyPoints: [], routes: [route({}), route({ fromRoomId: 'S', safe: false, path: [[6, 2], [8, 2]], doorIds: ['E1'], viaRoomIds: [] })],
      roomsReachingCriticalIds: ['S'], notes: [], caution: '',
    }
    const svg = egressFigureSvg({ plan, egress, width: 400 })
    expect((svg.match(/<path d="M/g) ?? []).length).toBe(2) // halo + line of A's route only
    expect(svg).toContain('No safe route')
    expect(svg).toContain('stroke-dasharray="6 3"')
  })
})
