import { create, createUnitDependencies, unitDependencies, type Unit } from 'mathjs'

/**
 * Parsing and display of the physical quantities typed into the floor-plan editor.
 *
 * Everything is stored in SI (metres, m³/s, m/s, Pa, m³, kg); air change rates are stored per hour,
 * the unit every ventilation standard quotes them in. What people type ("12 ft", "12' 6\"", "300 cfm",
 * "2 L/min", "0.5 m3/h", "90 fpm", "2000 psi") is parsed by mathjs, which also does the conversion.
 */

/**
 * A private mathjs instance, so the units defined here never leak into other users of mathjs. Only the
 * unit machinery is built in (not all of mathjs), which keeps the editor's download small.
 */
const math = create({ unitDependencies, createUnitDependencies })

// Units mathjs lacks but EHS people type every day. Definitions from NIST SP 811 (2008), Appendix B.
math.createUnit('cfm', { definition: '1 ft^3/min', aliases: ['CFM', 'scfm', 'SCFM'] })
math.createUnit('cfh', { definition: '1 ft^3/h', aliases: ['CFH', 'scfh', 'SCFH'] })
math.createUnit('lpm', { definition: '1 L/min', aliases: ['LPM', 'slpm', 'SLPM'] })
math.createUnit('sccm', { definition: '1 cm^3/min', aliases: ['SCCM'] })
math.createUnit('fpm', { definition: '1 ft/min', aliases: ['FPM'] })
math.createUnit('ach', { definition: '1 h^-1', aliases: ['ACH'] })
// Cylinder pressures are gauge pressures and are typed as such; we store gauge pressure.
math.createUnit('psig', { definition: '1 psi', aliases: ['PSIG'] })
math.createUnit('barg', { definition: '1 bar' })

/** The kinds of quantity the editor's fields hold. */
export type QuantityKind =
  | 'length'
  | 'smallLength'
  | 'flow'
  | 'leakFlow'
  | 'speed'
  | 'pressure'
  | 'volume'
  | 'mass'
  | 'airChanges'

export type UnitSystem = 'metric' | 'imperial'

interface KindSpec {
  /** Unit the stored number is in. */
  stored: string
  /** Unit shown (and assumed for a bare number) per display system. */
  display: Record<UnitSystem, { unit: string; label: string }>
  /** Smallest value allowed; most physical quantities here cannot be negative. */
  min: number
}

const KINDS: Record<QuantityKind, KindSpec> = {
  length: { stored: 'm', min: -Infinity, display: { metric: { unit: 'm', label: 'm' }, imperial: { unit: 'ft', label: 'ft' } } },
  smallLength: { stored: 'm', min: 0, display: { metric: { unit: 'mm', label: 'mm' }, imperial: { unit: 'in', label: 'in' } } },
  flow: { stored: 'm^3/s', min: 0, display: { metric: { unit: 'm^3/h', label: 'm³/h' }, imperial: { unit: 'cfm', label: 'cfm' } } },
  leakFlow: { stored: 'm^3/s', min: 0, display: { metric: { unit: 'L/min', label: 'L/min' }, imperial: { unit: 'cfh', label: 'cfh' } } },
  speed: { stored: 'm/s', min: 0, display: { metric: { unit: 'm/s', label: 'm/s' }, imperial: { unit: 'fpm', label: 'fpm' } } },
  pressure: { stored: 'Pa', min: 0, display: { metric: { unit: 'bar', label: 'bar' }, imperial: { unit: 'psi', label: 'psi' } } },
  volume: { stored: 'm^3', min: 0, display: { metric: { unit: 'L', label: 'L' }, imperial: { unit: 'ft^3', label: 'ft³' } } },
  mass: { stored: 'kg', min: 0, display: { metric: { unit: 'kg', label: 'kg' }, imperial: { unit: 'lb', label: 'lb' } } },
  airChanges: { stored: 'ach', min: 0, display: { metric: { unit: 'ach', label: '/h' }, imperial: { unit: 'ach', label: '/h' } } },
}

/** Human name of each kind, used in error messages ("not a length"). */
const KIND_NAMES: Record<QuantityKind, string> = {
  length: 'length',
  smallLength: 'length',
  flow: 'flow rate',
  leakFlow: 'flow rate',
  speed: 'speed',
  pressure: 'pressure',
  volume: 'volume',
  mass: 'mass',
  airChanges: 'air change rate',
}

export type ParseResult = { ok: true; value: number } | { ok: false; error: string }

const NUMBER = String.raw`[-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?(?:\s*/\s*\d+(?:\.\d*)?)?`
const UNIT = String.raw`\/?[A-Za-zµμ°][A-Za-z0-9µμ°^/*·\-]*`
const TERM = new RegExp(String.raw`\s*\+?\s*(${NUMBER})\s*(${UNIT})?`, 'gy')

/** Turn typography people paste (m³, 12′ 6″, thousands separators, "per hour") into what mathjs reads. */
function normalise(text: string): string {
  return text
    .trim()
    .replace(/(\d),(\d{3})(?!\d)/g, '$1$2')
    .replace(/²/g, '^2')
    .replace(/³/g, '^3')
    .replace(/[′’']/g, ' ft ')
    .replace(/[″”"]/g, ' in ')
    .replace(/\bper\s+hour\b/gi, '/h')
    .replace(/\bper\s+(min|minute)\b/gi, '/min')
    .replace(/\bper\s+(s|sec|second)\b/gi, '/s')
    .replace(/\s*\/\s*/g, '/')
    .replace(/\s+/g, ' ')
    .trim()
}

function parseNumber(text: string): number {
  const [num, den] = text.split('/')
  return den === undefined ? Number(num) : Number(num) / Number(den)
}

function toUnit(unitText: string): Unit | null {
  const text = unitText.trim()
  // "6 /h" means 6 h^-1; mathjs reads a leading slash only inside expressions.
  const name = text.startsWith('/') ? `${text.slice(1)}^-1` : text
  try {
    return math.unit(1, name)
  } catch {
    return null
  }
}

/**
 * Parse what a person typed into a number in the stored unit of `kind`.
 *
 * A bare number is read in the display unit of `system` (so "12" in an imperial length field is 12 ft).
 * Several terms of the same dimension add up ("12 ft 6 in", "1 m 20 cm").
 * @example parseQuantity('300 cfm', 'flow', 'metric') // { ok: true, value: 0.14158… } (m³/s)
 */
export function parseQuantity(text: string, kind: QuantityKind, system: UnitSystem): ParseResult {
  const spec = KINDS[kind]
  const stored = toUnit(spec.stored)!
  const input = normalise(text)
  if (input === '') return { ok: false, error: 'Enter a value' }
  const terms = [...input.matchAll(TERM)]
  const consumed = terms.reduce((n, t) => n + t[0].length, 0)
  if (terms.length === 0 || consumed !== input.length) {
    return { ok: false, error: `Cannot read “${text.trim()}” as a ${KIND_NAMES[kind]}` }
  }
  let total = 0
  for (const [, numberText, unitText] of terms) {
    const amount = parseNumber(numberText!)
    if (!Number.isFinite(amount)) return { ok: false, error: `“${numberText}” is not a number` }
    const unit = unitText ? toUnit(unitText) : toUnit(spec.display[system].unit)
    if (!unit) return { ok: false, error: `Unknown unit “${unitText!.trim()}”` }
    if (!unit.equalBase(stored)) {
      return { ok: false, error: `“${unitText!.trim()}” is not a unit of ${KIND_NAMES[kind]}` }
    }
    total += amount * unit.toNumber(spec.stored)
  }
  if (total < spec.min) return { ok: false, error: `A ${KIND_NAMES[kind]} cannot be negative` }
  return { ok: true, value: total }
}

/** Convert a stored value to the display unit of `system`. */
export function toDisplayNumber(value: number, kind: QuantityKind, system: UnitSystem): number {
  const spec = KINDS[kind]
  return math.unit(value, spec.stored).toNumber(spec.display[system].unit)
}

/** The label of the unit a kind is displayed in ("ft", "m³/h"). */
export function displayUnitLabel(kind: QuantityKind, system: UnitSystem): string {
  return KINDS[kind].display[system].label
}

/** Round to `digits` significant figures without trailing zeros or exponent noise for everyday magnitudes. */
export function formatNumber(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return '—'
  if (value === 0) return '0'
  const magnitude = Math.abs(value)
  if (magnitude >= 1e-4 && magnitude < 1e7) {
    const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(magnitude)))
    return Number(value.toFixed(Math.min(decimals, 10))).toString()
  }
  return value.toPrecision(digits).replace(/\.?0+e/, 'e')
}

/**
 * Format a stored value for display, e.g. `formatQuantity(3.6576, 'length', 'imperial')` → "12 ft".
 * @param digits significant figures @default 4
 */
export function formatQuantity(value: number, kind: QuantityKind, system: UnitSystem, digits = 4): string {
  return `${formatNumber(toDisplayNumber(value, kind, system), digits)} ${displayUnitLabel(kind, system)}`
}

/** Stored unit of a kind, for documentation and tests ("m^3/s"). */
export function storedUnit(kind: QuantityKind): string {
  return KINDS[kind].stored
}
