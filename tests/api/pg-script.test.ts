import { execFileSync, spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs'
import os from 'node:os'
import net from 'node:net'
import path from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'

// Paths come from `pg.sh where`, never assumed: in a 0700 clone the cluster lives under /tmp (the postgres user
// cannot enter the checkout), and a socket dir with a space or a long path moves to /tmp too.
// mkdtemp makes a 0700 folder, as CI's clone folder may be.
const privateDir = mkdtempSync(path.join(os.tmpdir(), 'dw private '))
const dirs = [path.resolve('.pg-script-test/plain'), path.resolve('.pg-script-test/with space/' + 'long-'.repeat(14)), path.join(privateDir, 'pg')]
const started: { dir: string; port: number }[] = []

const env = (dir: string, port: number) => ({ ...process.env, DW_PG_PORT: String(port), DW_PG_DIR: dir })
const run = (dir: string, port: number, ...args: string[]) =>
  spawnSync('bash', ['server/cli/pg.sh', ...args], { env: env(dir, port), encoding: 'utf8', timeout: 60_000 })
const where = (dir: string, port: number) =>
  Object.fromEntries(execFileSync('bash', ['server/cli/pg.sh', 'where'], { env: env(dir, port), encoding: 'utf8' })
    .trim().split('\n').map((l) => [l.slice(0, l.indexOf('=')), l.slice(l.indexOf('=') + 1)])) as { data: string; run: string; port: string }

/** A port nobody listens on now (the OS picks it), so parallel checkouts never meet here. */
async function freePort(): Promise<number> {
  const s = net.createServer().listen(0, '127.0.0.1')
  await new Promise((r) => s.once('listening', r))
  const port = (s.address() as net.AddressInfo).port
  await new Promise((r) => s.close(r))
  return port
}

afterAll(() => {
  for (const { dir, port } of started) {
    const w = where(dir, port)
    run(dir, port, 'stop')
    for (const p of [path.dirname(w.data), w.run]) if (p.startsWith('/tmp/dw-pg-')) rmSync(p, { recursive: true, force: true })
  }
  rmSync(path.resolve('.pg-script-test'), { recursive: true, force: true })
  rmSync(privateDir, { recursive: true, force: true })
})

describe('server/cli/pg.sh (the project-local cluster)', () => {
  it('refuses a taken port with a clear message instead of hanging', async () => {
    const blocker = net.createServer().listen(0, '127.0.0.1')
    await new Promise((r) => blocker.once('listening', r))
    const port = (blocker.address() as net.AddressInfo).port
    try {
      const r = run(dirs[0]!, port, 'start', 'x')
      expect(r.status).toBe(4)
      expect(r.stderr).toContain(`port ${port} on 127.0.0.1 is already in use`)
    } finally {
      blocker.close()
    }
  })

  it('where: prints the data dir, a socket dir without spaces and short enough for a socket, and the port', () => {
    const w = where(dirs[1]!, 54999)
    expect(w.port).toBe('54999')
    expect(w.data.endsWith('/data')).toBe(true)
    expect(w.run).not.toContain(' ')
    expect(w.run.length).toBeLessThanOrEqual(80)
  })

  it('the default port is derived from the checkout path and DW_PG_PORT overrides it', () => {
    const { DW_PG_PORT: _, ...noPort } = process.env
    const out = execFileSync('bash', ['server/cli/pg.sh', 'where'], { env: { ...noPort, DW_PG_DIR: dirs[0]! }, encoding: 'utf8' })
    const port = Number(/port=(\d+)/.exec(out)![1])
    expect(port).toBeGreaterThanOrEqual(54400)
    expect(port).toBeLessThan(55400)
    expect(where(dirs[0]!, 54998).port).toBe('54998')
  })

  it('a 0700 folder the postgres user cannot enter moves the cluster under /tmp', () => {
    expect(statSync(privateDir).mode & 0o777).toBe(0o700)
    expect(where(dirs[2]!, 54997).data).toMatch(/^\/tmp\/dw-pg-[0-9a-f]{10}\/data$/)
  })

  for (const [i, label] of [[0, 'a plain folder'], [1, 'a folder with a space and a long path'], [2, 'a private 0700 folder']] as const) {
    it(`starts after a crash that left a stale postmaster.pid (${label})`, async () => {
      const dir = dirs[i]!
      const port = await freePort()
      started.push({ dir, port })
      const first = run(dir, port, 'start', 'x')
      expect(first.status, first.stderr).toBe(0)
      const { data } = where(dir, port)
      const pid = Number(readFileSync(path.join(data, 'postmaster.pid'), 'utf8').split('\n')[0])
      process.kill(pid, 'SIGKILL')
      const r = run(dir, port, 'start', 'x')
      expect(r.status, r.stderr).toBe(0)
      expect(r.stdout.trim()).toBe(`postgres://postgres@127.0.0.1:${port}/x`)
      expect(run(dir, port, 'status').stdout).toMatch(/running/)
      expect(run(dir, port, 'stop').status).toBe(0)
      expect(run(dir, port, 'status').stdout).toMatch(/stopped/)
    })
  }
})
