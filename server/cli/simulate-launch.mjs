// Fast start-up for `npm run simulate`: bundles server/cli/simulate.ts (and everything it imports)
// once with esbuild into node_modules/.cache/driftwarden/simulate-cli.cjs, then runs the bundle
// with plain node, so tsx's loader (and its per-file transpilation) is not paid on every run.
//
// The bundle's first line records every input file esbuild read (sources under shared/ and
// server/cli, and the node_modules files it pulled in) with its mtime, plus this launcher's own
// mtime and the esbuild version. A run rebuilds when any of them changed or is missing, or when the
// cache is absent (clean clone). The bundle is written to a temporary file and renamed into place,
// so concurrent first runs never see (or leave) a partial file; the last rename wins and every
// candidate is complete. If the cache directory cannot be written, the fresh bundle is run from
// memory instead.
//
// V8 code cache: the bundle runs as a vm.Script, and after a successful run the compiled code (the
// functions that run compiled, not only the top level) is saved beside it, named by a hash of the
// bundle's text, so a changed bundle never meets a stale cache (V8 itself checks only the source
// length, its version and flags, and rejects a mismatch of those). The next run skips parsing and
// compiling (about 40 ms here). A cache that cannot be read or written is simply not used.
import { createHash } from 'node:crypto'
import { mkdirSync, readdirSync, readFileSync, renameSync, statSync, unlinkSync, writeFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { Script } from 'node:vm'

const HERE = fileURLToPath(import.meta.url)
const ROOT = resolve(dirname(HERE), '../..')
const ENTRY = join(ROOT, 'server/cli/simulate.ts')
const CACHE_DIR = join(ROOT, 'node_modules/.cache/driftwarden')
const BUNDLE = join(CACHE_DIR, 'simulate-cli.cjs')
const CODE_CACHE_PREFIX = 'simulate-cli.'
const CODE_CACHE_SUFFIX = '.v8cache'
const TAG = '// driftwarden-bundle '

function mtime(path) {
  try { return statSync(path).mtimeMs } catch { return -1 }
}

/** The cached bundle if it is complete and every recorded input is unchanged, else null. */
function freshBundle() {
  let text
  try { text = readFileSync(BUNDLE, 'utf8') } catch { return null }
  if (!text.startsWith(TAG)) return null
  const eol = text.indexOf('\n')
  let manifest
  try { manifest = JSON.parse(text.slice(TAG.length, eol)) } catch { return null }
  if (manifest.launcher !== mtime(HERE)) return null
  for (const [file, t] of Object.entries(manifest.inputs)) {
    if (t < 0 || mtime(join(ROOT, file)) !== t) return null
  }
  return text
}

async function buildBundle() {
  const { build, version } = await import('esbuild')
  const started = Date.now()
  const res = await build({
    entryPoints: [ENTRY], absWorkingDir: ROOT, bundle: true, platform: 'node', format: 'cjs', target: 'node20',
    write: false, metafile: true, logLevel: 'silent', legalComments: 'none', minify: true, keepNames: false,
  })
  const inputs = {}
  for (const file of Object.keys(res.metafile.inputs)) {
    const t = mtime(join(ROOT, file))
    // A file modified while esbuild was reading it is recorded as stale: the next run rebuilds.
    inputs[file] = t >= started - 5 ? -1 : t
  }
  // A different esbuild could bundle differently: its package file counts as an input too.
  inputs['node_modules/esbuild/package.json'] = mtime(join(ROOT, 'node_modules/esbuild/package.json'))
  const manifest = { esbuild: version, launcher: mtime(HERE), inputs }
  return TAG + JSON.stringify(manifest) + '\n' + res.outputFiles[0].text
}

/** Write a file atomically (temporary file, then rename); false when it cannot be written. */
function writeAtomic(path, data) {
  const tmp = `${path}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`
  try {
    mkdirSync(CACHE_DIR, { recursive: true })
    writeFileSync(tmp, data)
    renameSync(tmp, path)
    return true
  } catch {
    try { unlinkSync(tmp) } catch { /* never written */ }
    return false
  }
}

let code = freshBundle()
let cached = code !== null
if (code === null) {
  try {
    code = await buildBundle()
  } catch (e) {
    // A broken source: one line, as for every other failure of the CLI (exit 1).
    const first = e?.errors?.[0]
    const where = first?.location ? `${first.location.file}:${first.location.line}: ` : ''
    process.stderr.write(`error: cannot bundle server/cli/simulate.ts: ${where}${first?.text ?? e?.message ?? e}`.replace(/\s+/g, ' ').trim() + '\n')
    process.exit(1)
  }
  cached = writeAtomic(BUNDLE, code)
}

// The bundle as a CommonJS module body; the first line is the manifest comment, so the wrapper's
// opening ends with a newline.
const source = '(function (exports, require, module, __filename, __dirname) {\n' + code + '\n})'
const codeCache = join(CACHE_DIR, CODE_CACHE_PREFIX + createHash('sha1').update(source).digest('hex').slice(0, 20) + CODE_CACHE_SUFFIX)
let cachedData
if (cached) { try { cachedData = readFileSync(codeCache) } catch { /* first run of this bundle */ } }
const script = new Script(source, { filename: BUNDLE, cachedData })
if (cached && (cachedData === undefined || script.cachedDataRejected)) {
  process.on('exit', (status) => {
    if (status !== 0) return // a failed run compiled too little to be worth keeping
    if (!writeAtomic(codeCache, script.createCachedData())) return
    // Caches of earlier bundles are dead weight.
    try {
      for (const f of readdirSync(CACHE_DIR)) {
        if (f.startsWith(CODE_CACHE_PREFIX) && f.endsWith(CODE_CACHE_SUFFIX) && join(CACHE_DIR, f) !== codeCache) unlinkSync(join(CACHE_DIR, f))
      }
    } catch { /* another run is tidying too */ }
  })
}
const mod = { exports: {} }
script.runInThisContext()(mod.exports, createRequire(BUNDLE), mod, BUNDLE, CACHE_DIR)
