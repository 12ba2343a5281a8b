// Command line: npm run --silent simulate -- scenario.json [--fields] [--grid-check]
// Prints one JSON result on stdout. Bad input: exit 2 with one line on stderr naming the field.
import { readFileSync } from 'node:fs'
import { resultToJson } from '../../shared/engine/result-json'
import { simulate } from '../../shared/engine/simulate'
import { ScenarioError } from '../../shared/engine/errors'

function fail(line: string, code: number): never {
  process.stderr.write(line.replace(/\s+/g, ' ').trim() + '\n')
  process.exit(code)
}

const args = process.argv.slice(2)
const file = args.find((a) => !a.startsWith('--'))
if (!file) fail('usage: simulate <scenario.json> [--fields] [--grid-check]', 2)
let input: unknown
try {
  input = JSON.parse(readFileSync(file, 'utf8'))
} catch (e) {
  fail(`${file}: ${e instanceof SyntaxError ? 'invalid JSON: ' + e.message : (e as Error).message}`, 2)
}
try {
  const fields = args.includes('--fields')
  // Without --fields no plan field (snapshots, fronts, peaks, TWA) is printed: skip computing them.
  // --grid-check: a companion run on a grid twice as coarse, reported as grid_sensitivity_pct per probe.
  const result = simulate(input, { planFields: fields, gridCheck: args.includes('--grid-check') })
  process.stdout.write(JSON.stringify(resultToJson(result, { fields })) + '\n')
} catch (e) {
  if (e instanceof ScenarioError) fail(e.message, 2)
  fail(`error: ${(e as Error).message}`, 1)
}
