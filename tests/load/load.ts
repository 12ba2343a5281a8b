/**
 * Load run: N signed-in users browse the pages' API calls (floors, results, plans, drills: every parameter-free GET
 * list and the detail routes of the records they return, discovered from /api/openapi.json) while S simulations run.
 * Prints p50/p95/p99 latency per route and overall, the error count, and whether the simulations finished.
 *
 *   npm run load                         # starts its own server on a free port (local cluster, database driftwarden_load)
 *   LOAD_URL=http://127.0.0.1:3000 npm run load       # against a running server
 *   LOAD_USERS=50 LOAD_SECONDS=60 LOAD_SIMULATIONS=4  (defaults)
 */
import { spawn, type ChildProcess } from 'node:child_process'
import path from 'node:path'
import { fileURLToPath } from 'node:url'
import { DEMO_ACCOUNTS } from '../../server/seed/demo-accounts'
import { HttpSession } from './http-session'
import { startSimulations, type SimulationWatch } from './simulations'

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..')

export interface LoadOptions {
  url?: string
  users: number
  seconds: number
  simulations: number
}

export interface LoadReport {
  requests: number
  errors: number
  errorSamples: string[]
  overall: { p50: number; p95: number; p99: number; max: number }
  perRoute: Record<string, { n: number; p50: number; p95: number; p99: number }>
  simulations: { started: number; finished: number; failed: number; seconds: number | null }
  throughputPerS: number
}

const pct = (sorted: number[], p: number) => (sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]! : 0)

/** Starts `tsx server/main.ts` on a free port and waits for /api/health. */
async function startServer(): Promise<{ url: string; child: ChildProcess }> {
  const port = 3300 + Math.floor(Math.random() * 500)
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    cwd: root,
    env: { ...process.env, PORT: String(port), FAKE_SMTP_PORT: '0', DW_DB_NAME: 'driftwarden_load' },
    stdio: ['ignore', 'pipe', 'inherit'],
  })
  const url = `http://127.0.0.1:${port}`
  for (let i = 0; i < 240; i++) {
    if (child.exitCode !== null) throw new Error('server exited during start-up')
    try {
      if ((await fetch(`${url}/api/health`)).ok) return { url, child }
    } catch { /* not up yet */ }
    await new Promise((r) => setTimeout(r, 500))
  }
  throw new Error('server did not start within 120 s')
}

/** GET routes a page calls: parameter-free lists, and `/api/<things>/{id}[/<view>]` for ids those lists return. */
async function discoverUrls(s: HttpSession): Promise<string[]> {
  const doc = (await s.request('GET', '/api/openapi.json')).json
  const gets = Object.entries<any>(doc.paths).filter(([, ops]) => ops.get && !ops.get['x-roles'].includes('public')).map(([p]) => p)
  const lists = gets.filter((p) => !p.includes('{') && !p.startsWith('/api/admin') && !p.startsWith('/api/auth'))
  const urls = new Set<string>(lists)
  for (const list of lists) {
    const r = await s.request('GET', list)
    if (r.status !== 200 || typeof r.json !== 'object') continue
    const arr = Object.values<any>(r.json).find((v) => Array.isArray(v) && v.length && typeof v[0]?.id === 'number') as { id: number }[] | undefined
    if (!arr) continue
    for (const detail of gets.filter((p) => p.startsWith(`${list}/{id}`) && (p.match(/\{/g) ?? []).length === 1)) {
      if (/images|pdf|stream|frames|scenario$/.test(detail)) continue
      for (const { id } of arr.slice(0, 3)) urls.add(detail.replace('{id}', String(id)))
    }
  }
  // Keep what this role may open: a page never calls what its role is refused.
  const allowed: string[] = []
  for (const u of urls) if ((await s.request('GET', u)).status === 200) allowed.push(u)
  return allowed
}

export async function runLoad(opts: LoadOptions): Promise<LoadReport> {
  let server: { url: string; child: ChildProcess } | null = null
  const base = opts.url ?? (server = await startServer()).url
  try {
    const browsers = DEMO_ACCOUNTS.filter((a) => a.role !== 'admin')
    const sessions: HttpSession[] = []
    for (let i = 0; i < opts.users; i++) {
      const a = browsers[i % browsers.length]!
      const s = new HttpSession(base)
      await s.signIn(a.email, a.password)
      sessions.push(s)
    }
    const officer = new HttpSession(base)
    const off = DEMO_ACCOUNTS.find((a) => a.role === 'ehs_officer')!
    await officer.signIn(off.email, off.password)
    const urlsByRole = new Map<string, string[]>()
    for (const a of browsers) {
      const s = new HttpSession(base)
      await s.signIn(a.email, a.password)
      urlsByRole.set(a.email, await discoverUrls(s))
    }

    const sims: SimulationWatch = await startSimulations(officer, opts.simulations)
    const latencies: number[] = []
    const perRoute = new Map<string, number[]>()
    const errorSamples: string[] = []
    let errors = 0
    const t0 = performance.now()
    const deadline = t0 + opts.seconds * 1000
    await Promise.all(
      sessions.map(async (s, i) => {
        const urls = urlsByRole.get(browsers[i % browsers.length]!.email)!
        let k = i
        while (performance.now() < deadline) {
          const url = urls[k++ % urls.length]!
          const r = await s.request('GET', url).catch((e) => ({ status: 0, ms: 0, json: String(e) }))
          latencies.push(r.ms)
          const key = url.replace(/\/\d+/g, '/{id}')
          if (!perRoute.has(key)) perRoute.set(key, [])
          perRoute.get(key)!.push(r.ms)
          if (r.status !== 200) {
            errors++
            if (errorSamples.length < 10) errorSamples.push(`${url} → ${r.status} ${JSON.stringify(r.json).slice(0, 120)}`)
          }
          // A person reads a page for a moment before the next one.
          await new Promise((res) => setTimeout(res, 50 + Math.random() * 100))
        }
      }),
    )
    const elapsed = (performance.now() - t0) / 1000
    const simResult = await sims.waitAll(600_000)
    latencies.sort((a, b) => a - b)
    const routes: LoadReport['perRoute'] = {}
    for (const [k, v] of perRoute) {
      v.sort((a, b) => a - b)
      routes[k] = { n: v.length, p50: pct(v, 50), p95: pct(v, 95), p99: pct(v, 99) }
    }
    return {
      requests: latencies.length,
      errors,
      errorSamples,
      overall: { p50: pct(latencies, 50), p95: pct(latencies, 95), p99: pct(latencies, 99), max: latencies.at(-1) ?? 0 },
      perRoute: routes,
      simulations: simResult,
      throughputPerS: latencies.length / elapsed,
    }
  } finally {
    if (server) {
      server.child.kill('SIGTERM')
      await new Promise((r) => server!.child.once('exit', r))
    }
  }
}

function print(r: LoadReport, opts: LoadOptions) {
  const f = (x: number) => `${x.toFixed(1)} ms`
  console.log(`\nLoad: ${opts.users} users for ${opts.seconds} s, ${opts.simulations} simulations`)
  console.log(`requests ${r.requests} (${r.throughputPerS.toFixed(0)}/s), errors ${r.errors}`)
  console.log(`latency p50 ${f(r.overall.p50)}  p95 ${f(r.overall.p95)}  p99 ${f(r.overall.p99)}  max ${f(r.overall.max)}`)
  for (const [k, v] of Object.entries(r.perRoute)) console.log(`  ${k.padEnd(44)} n=${String(v.n).padStart(5)}  p50 ${f(v.p50)}  p95 ${f(v.p95)}  p99 ${f(v.p99)}`)
  console.log(`simulations: ${r.simulations.finished}/${r.simulations.started} finished, ${r.simulations.failed} failed${r.simulations.seconds !== null ? `, all done after ${r.simulations.seconds.toFixed(1)} s` : ''}`)
  console.log(`target p95 < 200 ms: ${r.overall.p95 < 200 ? 'met' : 'NOT met'}; errors: ${r.errors === 0 ? 'none' : r.errors}`)
  for (const e of r.errorSamples) console.log(`  error: ${e}`)
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const opts: LoadOptions = {
    url: process.env.LOAD_URL,
    users: Number(process.env.LOAD_USERS ?? 50),
    seconds: Number(process.env.LOAD_SECONDS ?? 60),
    simulations: Number(process.env.LOAD_SIMULATIONS ?? 4),
  }
  runLoad(opts).then((r) => {
    print(r, opts)
    process.exit(r.errors === 0 && r.simulations.failed === 0 ? 0 : 1)
  }, (e) => {
    console.error(e)
    process.exit(1)
  })
}
