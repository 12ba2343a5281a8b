// Benchmark of the dispersion engine on tests/fixtures/engine/bench-floor.json (npm run bench).
// Each configuration runs in its own child process so that wall time, CPU time and peak memory are
// measured in isolation. Errors are max over probes of max_t |C − C_ref| / max_t C_ref.
import { spawnSync } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { simulate } from '../../shared/engine/simulate'
import { buildModel } from '../../shared/engine/model'
import { explicitStableStep } from '../../shared/engine/operator'
import { validateScenario } from '../../shared/engine/validate'
import { peerComparison, throughput } from './peer-throughput'

const FIXTURE = fileURLToPath(new URL('../fixtures/engine/bench-floor.json', import.meta.url))
const SELF = fileURLToPath(import.meta.url)
const ROOT = fileURLToPath(new URL('../..', import.meta.url))

interface ChildOut {
  wall_s: number; cpu_s: number; max_rss_mb: number; steps: number; cells: number; solver: string
  times: number[]; probes: Record<string, number[]>; closure: number
}

function child(config: string): void {
  const cfg = JSON.parse(config) as { numerics?: object; solver?: 'explicit-baseline'; grid?: object; duration_s?: number }
  const base = JSON.parse(readFileSync(FIXTURE, 'utf8'))
  const scenario = { ...base, ...(cfg.grid ? { grid: cfg.grid } : {}), ...(cfg.duration_s ? { duration_s: cfg.duration_s } : {}), ...(cfg.numerics ? { numerics: cfg.numerics } : {}) }
  const cpu0 = process.cpuUsage()
  const t0 = performance.now()
  const r = simulate(scenario, { solver: cfg.solver })
  const wall = (performance.now() - t0) / 1000
  const cpu = process.cpuUsage(cpu0)
  const out: ChildOut = {
    wall_s: wall, cpu_s: (cpu.user + cpu.system) / 1e6, max_rss_mb: process.resourceUsage().maxRSS / 1024,
    steps: r.stats.steps, cells: r.stats.cells, solver: r.stats.solver, times: Array.from(r.times_s),
    probes: Object.fromEntries(r.probes.map((p) => [p.id, Array.from(p.ppm)])), closure: r.mass_balance.closure_error,
  }
  process.stdout.write(JSON.stringify(out))
}

function runChild(config: object): ChildOut {
  const res = spawnSync(process.execPath, [...process.execArgv, SELF, '--child', JSON.stringify(config)], { encoding: 'utf8', maxBuffer: 1 << 28 })
  if (res.status !== 0) throw new Error(`child failed: ${res.stderr}`)
  return JSON.parse(res.stdout) as ChildOut
}

function probeError(run: ChildOut, ref: ChildOut): number {
  let worst = 0
  for (const [id, series] of Object.entries(ref.probes)) {
    const mine = run.probes[id]!
    let peak = 0, err = 0
    for (let k = 0; k < series.length; k++) {
      peak = Math.max(peak, series[k]!)
      err = Math.max(err, Math.abs(mine[k]! - series[k]!))
    }
    if (peak > 0) worst = Math.max(worst, err / peak)
  }
  return worst * 100
}

function cliWall(): number {
  let best = Infinity
  for (let k = 0; k < 3; k++) {
    const t0 = performance.now()
    const res = spawnSync('npm', ['run', '--silent', 'simulate', '--', FIXTURE], { cwd: ROOT, encoding: 'utf8', maxBuffer: 1 << 28 })
    if (res.status !== 0) throw new Error(res.stderr)
    best = Math.min(best, (performance.now() - t0) / 1000)
  }
  return best
}

function main(): void {
  const fmt = (x: number, d = 3) => x.toFixed(d)
  const line = (label: string, r: ChildOut, err?: string) =>
    console.log(`${label.padEnd(34)} wall ${fmt(r.wall_s)} s  cpu ${fmt(r.cpu_s)} s  steps ${String(r.steps).padStart(5)}  ` +
      `cell-updates/s ${((r.cells * r.steps) / r.wall_s / 1e6).toFixed(1)}e6  peak RSS ${r.max_rss_mb.toFixed(0)} MB${err ? `  ${err}` : ''}`)
  console.log(`Driftwarden engine benchmark: ${FIXTURE}`)
  const cli = cliWall()
  console.log(`CLI 'npm run --silent simulate -- bench-floor.json' wall time (best of 3, includes npm + node start-up and the cached-bundle launcher): ${fmt(cli)} s`)
  const ref = runChild({ numerics: { time_step_s: 0.5 } })
  line('reference (same grid, dt 0.5 s fixed)', ref)
  const main_ = runChild({})
  line('implicit (default accuracy control)', main_, `error vs reference ${fmt(probeError(main_, ref))} %  mass closure ${main_.closure.toExponential(1)}`)
  const ftcs = runChild({ solver: 'explicit-baseline' })
  line('explicit FTCS baseline', ftcs, `error vs reference ${fmt(probeError(ftcs, ref))} %`)
  console.log(`speed-up implicit vs FTCS (wall): ${(ftcs.wall_s / main_.wall_s).toFixed(1)}x, (cpu): ${(ftcs.cpu_s / main_.cpu_s).toFixed(1)}x`)
  {
    // What limits the explicit step: with every sink explicit (plain FTCS) vs transport alone.
    const v = validateScenario(JSON.parse(readFileSync(FIXTURE, 'utf8')))
    const m = buildModel(v.scenario, v.gas)
    const nPlan = m.nx * m.ny
    const none = new Float64Array(nPlan * m.nz), sink = new Float64Array(none.length)
    for (let pp = 0; pp < nPlan; pp++) {
      const r = m.roomOfPlan[pp]!
      if (r < 0) continue
      for (let k = 0; k < m.nz; k++) sink[pp + nPlan * k] = m.roomDecay[r]!
      sink[pp] += m.floorOut[pp]!
      none[pp] = m.floorOut[pp]!
    }
    for (let a = 0; a < m.exhaustCells.length; a++) sink[m.exhaustCells[a]!] += m.exhaustRates[a]!
    console.log(`FTCS stability limit: ${explicitStableStep(m, sink).toFixed(3)} s with ventilation and exhaust sinks explicit, ` +
      `${explicitStableStep(m, none).toFixed(3)} s for transport (diffusion, downflow, transfer air) alone (an explicit solver treating sinks exactly would need ` +
      `${Math.round(1800 / explicitStableStep(m, none))} steps instead of ${ftcs.steps})`)
  }
  const fine = runChild({ grid: { cell_m: 0.1, layers: 20 } })
  line('half cell size (0.1 m, 20 layers)', fine, `grid error of 0.2 m run vs 0.1 m: ${fmt(probeError(main_, fine))} %`)
  console.log('Scaling (cost per cell-update and per cell x simulated second):')
  const perCellSimS: number[] = []
  for (const [label, cfg] of [
    ['0.4 m, 5 layers, 1800 s', { grid: { cell_m: 0.4, layers: 5 } }],
    ['0.2 m, 10 layers, 1800 s', {}],
    ['0.2 m, 10 layers, 3600 s', { duration_s: 3600 }],
  ] as const) {
    const r = label.startsWith('0.2 m, 10 layers, 1800') ? main_ : runChild(cfg)
    const simT = 'duration_s' in cfg ? cfg.duration_s : 1800
    perCellSimS.push((r.wall_s / (r.cells * simT)) * 1e9)
    console.log(`  ${label.padEnd(26)} cells ${String(r.cells).padStart(7)}  steps ${String(r.steps).padStart(4)}  wall ${fmt(r.wall_s)} s  ` +
      `ns per cell-update ${((r.wall_s / (r.cells * r.steps)) * 1e9).toFixed(1)}  ns per cell x sim-s ${perCellSimS.at(-1)!.toFixed(2)}`)
  }
  // The issue's targets, met or not, with the figure measured here (this machine's speed varies over time).
  const err = probeError(main_, ref), ftcsErr = probeError(ftcs, ref)
  const speedUp = ftcs.wall_s / main_.wall_s
  const [small, big1800, big3600] = perCellSimS
  // Linear (or better): the cost per cell × simulated second does not grow with the grid or the duration.
  const linear = big1800! <= 1.2 * small! && big3600! <= 1.2 * big1800!
  const verdict = (ok: boolean) => (ok ? 'met' : 'NOT met')
  console.log('Targets:')
  console.log(`  whole CLI command under 1 s ............ ${verdict(cli < 1)} (${fmt(cli)} s, best of 3)`)
  console.log(`  10x faster than FTCS at 1 % accuracy ... ${verdict(speedUp >= 10 && err <= 1 && ftcsErr <= 1)} (${speedUp.toFixed(1)}x; errors ${fmt(err)} % and ${fmt(ftcsErr)} %)`)
  console.log(`  peak memory under 300 MB ............... ${verdict(main_.max_rss_mb < 300)} (${main_.max_rss_mb.toFixed(0)} MB)`)
  console.log(`  cost linear in cells x simulated time .. ${verdict(linear)} (${perCellSimS.map((x) => x.toFixed(2)).join(', ')} ns per cell x sim-s for the three sizes)`)
}

if (process.argv[2] === '--child') child(process.argv[3]!)
else {
  main()
  // Issue 18: beside the NumPy peer in the same invocation, and runs per minute with 1, 2, 4 workers.
  peerComparison()
  await throughput()
}
