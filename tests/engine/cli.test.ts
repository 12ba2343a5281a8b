// The command line contract of shared/scenario-format.md: one JSON result on stdout, or one line on
// stderr naming the field and a non-zero exit with nothing on stdout.
import { spawn, spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

const root = fileURLToPath(new URL('../..', import.meta.url))
const fixture = (name: string) => join(root, 'tests/fixtures/engine', name)
const cli = (file: string) => spawnSync('npm', ['run', '--silent', 'simulate', '--', file], { cwd: root, encoding: 'utf8', maxBuffer: 1 << 26 })

describe('simulate CLI', () => {
  it('prints the result format for the format example', () => {
    const r = cli(fixture('format-example.json'))
    expect(r.status).toBe(0)
    expect(r.stderr).toBe('')
    const out = JSON.parse(r.stdout)
    expect(out.times_s).toEqual(Array.from({ length: 31 }, (_, k) => k * 30))
    expect(out.probes.p1.ppm).toHaveLength(31)
    expect(out.probes.p1.ppm[0]).toBe(0)
    expect(out.diffusivity_m2_s).toBe(0.005)
    const mb = out.mass_balance
    expect(mb.released_m3).toBeCloseTo(0.07, 10)
    expect(Math.abs(mb.released_m3 - mb.in_air_m3 - mb.removed_m3)).toBeLessThan(1e-3 * mb.released_m3)
    expect(out.stats.cells).toBe(13000)
    expect(out.stats.steps).toBeGreaterThan(0)
    expect(out.stats.wall_s).toBeGreaterThan(0)
  }, 60_000)
  it('rejects bad input with one stderr line naming the field and an empty stdout', () => {
    const dir = mkdtempSync(join(tmpdir(), 'dw-cli-'))
    const bad = join(dir, 'bad.json')
    const s = JSON.parse(readFileSync(fixture('format-example.json'), 'utf8'))
    s.sources[0].release.rate_m3_s = -1
    writeFileSync(bad, JSON.stringify(s))
    const r = cli(bad)
    expect(r.status).not.toBe(0)
    expect(r.stdout).toBe('')
    const lines = r.stderr.trim().split('\n')
    expect(lines).toHaveLength(1)
    expect(lines[0]).toMatch(/^sources\[0\]\.release\.rate_m3_s: /)
  }, 60_000)
  it('refuses an impossible input (transfer air through a closed door with no undercut): exit 2, one line, no stdout', () => {
    const dir = mkdtempSync(join(tmpdir(), 'dw-cli-'))
    const bad = join(dir, 'closed.json')
    const s = JSON.parse(readFileSync(fixture('format-example.json'), 'utf8'))
    s.openings[0].open = false
    s.openings[0].transfer = { flow_m3_s: 0.05, into: 'corridor' }
    writeFileSync(bad, JSON.stringify(s))
    const r = cli(bad)
    expect(r.status).toBe(2)
    expect(r.stdout).toBe('')
    expect(r.stderr.trim().split('\n')).toEqual(['openings[0].transfer: the door is closed and has no undercut_m, so transfer air has no path; open the door or give the gap under it'])
  }, 60_000)
  it('rejects unreadable JSON', () => {
    const dir = mkdtempSync(join(tmpdir(), 'dw-cli-'))
    const bad = join(dir, 'bad.json')
    writeFileSync(bad, '{ nope')
    const r = cli(bad)
    expect(r.status).not.toBe(0)
    expect(r.stdout).toBe('')
    expect(r.stderr.trim().split('\n')).toHaveLength(1)
  }, 60_000)
  it('concurrent runs from a missing cache all build, agree and leave one complete bundle', async () => {
    rmSync(join(root, 'node_modules/.cache/driftwarden'), { recursive: true, force: true })
    const run = () => new Promise<{ code: number | null; out: string; err: string }>((done) => {
      const p = spawn('node', ['server/cli/simulate-launch.mjs', fixture('format-example.json')], { cwd: root })
      let out = '', err = ''
      p.stdout.on('data', (d) => (out += d))
      p.stderr.on('data', (d) => (err += d))
      p.on('close', (code) => done({ code, out, err }))
    })
    const runs = await Promise.all([run(), run(), run()])
    const strip = (s: string) => { const j = JSON.parse(s); delete j.stats.wall_s; return JSON.stringify(j) }
    for (const r of runs) {
      expect(r.code).toBe(0)
      expect(r.err).toBe('')
      expect(strip(r.out)).toBe(strip(runs[0]!.out))
    }
    const bundle = readFileSync(join(root, 'node_modules/.cache/driftwarden/simulate-cli.cjs'), 'utf8')
    expect(bundle.startsWith('// driftwarden-bundle {')).toBe(true)
    const again = cli(fixture('format-example.json'))
    expect(again.status).toBe(0)
    expect(strip(again.stdout)).toBe(strip(runs[0]!.out))
  }, 120_000)
})
