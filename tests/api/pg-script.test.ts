import { execFileSync, spawnSync } from 'node:child_process'
import { readFileSync, rmSync } from 'node:fs'
import net from 'node:net'
import path from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'

const dir = path.resolve('.pg-script-test')
const run = (port: number, ...args: string[]) =>
  spawnSync('bash', ['server/cli/pg.sh', ...args], { env: { ...process.env, DW_PG_PORT: String(port), DW_PG_DIR: dir }, encoding: 'utf8', timeout: 60_000 })

afterAll(() => {
  run(54361, 'stop')
  rmSync(dir, { recursive: true, force: true })
})

describe('server/cli/pg.sh (the project-local cluster)', () => {
  it('refuses a taken port with a clear message instead of hanging', async () => {
    const blocker = net.createServer().listen(54362, '127.0.0.1')
    await new Promise((r) => blocker.once('listening', r))
    try {
      const r = run(54362, 'start', 'x')
      expect(r.status).toBe(4)
      expect(r.stderr).toMatch(/port 54362 on 127\.0\.0\.1 is already in use/)
    } finally {
      blocker.close()
    }
  })

  it('starts after a crash that left a stale postmaster.pid', () => {
    expect(run(54361, 'start', 'x').status).toBe(0)
    const pid = Number(readFileSync(path.join(dir, 'data/postmaster.pid'), 'utf8').split('\n')[0])
    process.kill(pid, 'SIGKILL')
    const r = run(54361, 'start', 'x')
    expect(r.status).toBe(0)
    expect(r.stdout.trim()).toBe('postgres://postgres@127.0.0.1:54361/x')
    expect(execFileSync('bash', ['server/cli/pg.sh', 'status'], { env: { ...process.env, DW_PG_PORT: '54361', DW_PG_DIR: dir }, encoding: 'utf8' })).toMatch(/running/)
  })
})
