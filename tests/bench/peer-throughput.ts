// Issue 18 bench sections: the engine CLI beside the NumPy explicit peer (../shared/bench/peer_ftcs.py) on
// the peer floor, alternating runs in one invocation (the 2-core machine is noisy: medians), and runs per
// minute for a batch of small scenarios with 1, 2 and 4 parallel CLI processes.
// Whole-process wall and CPU time and peak RSS come from GNU time (/usr/bin/time) when present.
import { spawn, spawnSync } from 'node:child_process'
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'

const ROOT = fileURLToPath(new URL('../..', import.meta.url))
const BENCH = join(ROOT, '../shared/bench')
const PEER_FLOOR = join(BENCH, 'peer-floor.json')
const GNU_TIME = existsSync('/usr/bin/time') ? '/usr/bin/time' : null

interface Proc { wall_s: number; cpu_s: number | null; rss_mb: number | null; stdout: string }

function timed(cmd: string, args: string[]): Proc {
  const full = GNU_TIME ? [GNU_TIME, ['-f', 'DWTIME %U %S %M', cmd, ...args]] as const : [cmd, args] as const
  const t0 = performance.now()
  const res = spawnSync(full[0], full[1] as string[], { cwd: ROOT, encoding: 'utf8', maxBuffer: 1 << 28 })
  const wall = (performance.now() - t0) / 1000
  if (res.status !== 0) throw new Error(`${cmd} failed: ${res.stderr}`)
  const m = /DWTIME ([\d.]+) ([\d.]+) (\d+)/.exec(res.stderr)
  return { wall_s: wall, cpu_s: m ? Number(m[1]) + Number(m[2]) : null, rss_mb: m ? Number(m[3]) / 1024 : null, stdout: res.stdout }
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!
const fmt = (x: number | null, d = 2) => (x === null ? 'n/a' : x.toFixed(d))

function summary(label: string, runs: Proc[], extra = ''): { wall: number } {
  const wall = median(runs.map((r) => r.wall_s))
  const cpu = runs[0]!.cpu_s === null ? null : median(runs.map((r) => r.cpu_s!))
  const rss = runs[0]!.rss_mb === null ? null : Math.max(...runs.map((r) => r.rss_mb!))
  console.log(`  ${label.padEnd(30)} wall ${fmt(wall)} s  cpu ${fmt(cpu)} s  peak RSS ${fmt(rss, 0)} MB${extra}`)
  return { wall }
}

function hasNumpy(): boolean {
  return spawnSync('python3', ['-c', 'import numpy, scipy'], { encoding: 'utf8' }).status === 0
}

export function peerComparison(reps = 3): void {
  console.log(`Engine CLI vs NumPy explicit peer on ${PEER_FLOOR} (alternating, ${reps} runs each, medians; load ${readFileSync('/proc/loadavg', 'utf8').split(' ').slice(0, 3).join(' ')}):`)
  if (!existsSync(PEER_FLOOR)) { console.log('  skipped: ../shared/bench/peer-floor.json not found'); return }
  const peerOk = hasNumpy()
  if (!peerOk) console.log('  NumPy peer skipped: python3 with numpy and scipy not found')
  const eng: Proc[] = [], peer: Proc[] = []
  for (let k = 0; k < reps; k++) {
    eng.push(timed('npm', ['run', '--silent', 'simulate', '--', PEER_FLOOR]))
    if (peerOk) peer.push(timed('python3', [join(BENCH, 'peer_ftcs.py'), PEER_FLOOR]))
  }
  const stats = JSON.parse(eng[0]!.stdout).stats as { steps: number; wall_s: number; cells: number }
  const e = summary('engine (whole command)', eng, `  solver ${stats.wall_s.toFixed(2)} s  steps ${stats.steps}  ns per cell x sim-s ${((median(eng.map((r) => r.wall_s)) / (stats.cells * 1800)) * 1e9).toFixed(2)}`)
  if (peerOk) {
    const p = summary('NumPy FTCS peer (whole command)', peer)
    console.log(`  engine speed-up over the peer: ${(p.wall / e.wall).toFixed(1)}x (issue 18 target 10x)`)
  }
}

/** Runs per minute for `runs` small scenarios spread over `workers` concurrent CLI processes. */
async function batch(file: string, runs: number, workers: number): Promise<number> {
  let next = 0
  const t0 = performance.now()
  const worker = async () => {
    while (next < runs) {
      next++
      await new Promise<void>((ok, bad) => {
        const c = spawn('npm', ['run', '--silent', 'simulate', '--', file], { cwd: ROOT, stdio: ['ignore', 'ignore', 'pipe'] })
        c.on('exit', (code) => (code === 0 ? ok() : bad(new Error(`simulate exit ${code}`))))
      })
    }
  }
  await Promise.all(Array.from({ length: workers }, worker))
  return runs / ((performance.now() - t0) / 60000)
}

export async function throughput(runs = 8): Promise<void> {
  const base = JSON.parse(readFileSync(PEER_FLOOR, 'utf8'))
  const small = { ...base, grid: { ...base.grid, cell_m: 0.4, layers: 5 } }
  const file = join(mkdtempSync(join(tmpdir(), 'dw-bench-')), 'small.json')
  writeFileSync(file, JSON.stringify(small))
  console.log(`Throughput: ${runs} small runs (peer floor at 0.4 m, 5 layers) through parallel CLI processes:`)
  for (const w of [1, 2, 4]) console.log(`  ${w} worker${w > 1 ? 's' : ' '}  ${(await batch(file, runs, w)).toFixed(0)} runs per minute`)
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  peerComparison()
  await throughput()
}
