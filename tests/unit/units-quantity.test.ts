import { describe, expect, it } from 'vitest'
import { formatNumber, formatQuantity, parseQuantity, type QuantityKind } from '../../shared/units/quantity'

/** Parse and unwrap, failing the test with the parser's own message. */
function si(text: string, kind: QuantityKind, system: 'metric' | 'imperial' = 'metric'): number {
  const r = parseQuantity(text, kind, system)
  if (!r.ok) throw new Error(r.error)
  return r.value
}

// Reference values: NIST Special Publication 811 (2008 edition), Appendix B.8/B.9 "Factors for units
// listed alphabetically / by kind of quantity". "exact" where SP 811 prints the factor in bold (exact).
describe('parseQuantity against NIST SP 811 conversion factors', () => {
  const table: Array<{ text: string; kind: QuantityKind; si: number; digits: number; source: string }> = [
    { text: '1 ft', kind: 'length', si: 0.3048, digits: 15, source: 'SP 811 B.9 foot → metre, 3.048 E-01 (exact)' },
    { text: '1 in', kind: 'smallLength', si: 0.0254, digits: 15, source: 'SP 811 B.9 inch → metre, 2.54 E-02 (exact)' },
    { text: '1 cfm', kind: 'flow', si: 4.719474e-4, digits: 9, source: 'SP 811 B.9 cubic foot per minute → m³/s, 4.719 474 E-04' },
    { text: '1 ft^3/min', kind: 'flow', si: 4.719474e-4, digits: 9, source: 'SP 811 B.9 cubic foot per minute → m³/s, 4.719 474 E-04' },
    { text: '1 L/min', kind: 'leakFlow', si: 1.666667e-5, digits: 10, source: 'SP 811 B.8 liter = 1.0 E-03 m³ and minute = 6.0 E+01 s (both exact)' },
    { text: '1 m3/h', kind: 'flow', si: 2.777778e-4, digits: 9, source: 'SP 811 B.8 hour = 3.6 E+03 s (exact)' },
    { text: '1 ft/min', kind: 'speed', si: 5.08e-3, digits: 15, source: 'SP 811 B.9 foot per minute → m/s, 5.08 E-03 (exact)' },
    { text: '1 psi', kind: 'pressure', si: 6.894757e3, digits: 3, source: 'SP 811 B.9 pound-force per square inch → Pa, 6.894 757 E+03' },
    { text: '1 bar', kind: 'pressure', si: 1e5, digits: 9, source: 'SP 811 B.9 bar → Pa, 1.0 E+05 (exact)' },
    { text: '1 gal', kind: 'volume', si: 3.785412e-3, digits: 9, source: 'SP 811 B.9 gallon (U.S.) → m³, 3.785 412 E-03' },
    { text: '1 ft³', kind: 'volume', si: 2.831685e-2, digits: 8, source: 'SP 811 B.9 cubic foot → m³, 2.831 685 E-02' },
    { text: '1 lb', kind: 'mass', si: 0.45359237, digits: 15, source: 'SP 811 B.9 pound (avoirdupois) → kg, 4.535 924 E-01 (exact 0.453 592 37)' },
  ]
  for (const row of table) {
    it(`${row.text} = ${row.si} SI (${row.source})`, () => {
      expect(si(row.text, row.kind)).toBeCloseTo(row.si, row.digits)
    })
  }

  it('1 cfm = 0.000471947 m³/s to the six figures SP 811 prints (B.9)', () => {
    expect(Number(si('1 cfm', 'flow').toPrecision(6))).toBe(0.000471947)
  })
  it('1 ft = 0.3048 m exactly (SP 811 B.9, bold = exact; international foot, 1959)', () => {
    expect(si('1 ft', 'length')).toBe(0.3048)
  })
})

describe('parseQuantity: what people type', () => {
  it('reads the examples from the issue', () => {
    expect(si('12 ft', 'length')).toBeCloseTo(3.6576, 12)
    expect(si('300 cfm', 'flow')).toBeCloseTo(0.14158423296, 12)
    expect(si('2 L/min', 'leakFlow')).toBeCloseTo(2e-3 / 60, 15)
    expect(si('0.5 m3/h', 'flow')).toBeCloseTo(0.5 / 3600, 15)
  })
  it('adds up feet and inches, with or without prime marks', () => {
    expect(si('12 ft 6 in', 'length')).toBeCloseTo(3.81, 12)
    expect(si('12\' 6"', 'length')).toBeCloseTo(3.81, 12)
    expect(si('12′ 6″', 'length')).toBeCloseTo(3.81, 12)
  })
  it('reads a bare number in the display unit of the user’s system', () => {
    expect(si('12', 'length', 'imperial')).toBeCloseTo(3.6576, 12)
    expect(si('12', 'length', 'metric')).toBe(12)
    expect(si('4', 'smallLength', 'metric')).toBeCloseTo(0.004, 12)
    expect(si('300', 'flow', 'imperial')).toBeCloseTo(0.14158423296, 12)
  })
  it('reads air change rates as per hour', () => {
    for (const t of ['6', '6 /h', '6 ACH', '6 ach', '6 per hour', '6 h^-1']) expect(si(t, 'airChanges')).toBeCloseTo(6, 12)
  })
  it('accepts fractions, superscripts, thousands separators and gauge pressure units', () => {
    expect(si('1/4 in', 'smallLength')).toBeCloseTo(0.00635, 12)
    expect(si('1,000 cfm', 'flow')).toBeCloseTo(0.4719474432, 10)
    expect(si('0.5 m³/h', 'flow')).toBeCloseTo(0.5 / 3600, 15)
    expect(si('2000 psig', 'pressure') / 2000).toBeCloseTo(6894.757, 3)
    expect(si('90 fpm', 'speed')).toBeCloseTo(0.4572, 12)
  })
  it('explains what is wrong', () => {
    expect(parseQuantity('', 'length', 'metric')).toEqual({ ok: false, error: 'Enter a value' })
    expect(parseQuantity('abc', 'length', 'metric')).toEqual({ ok: false, error: 'Cannot read “abc” as a length' })
    expect(parseQuantity('3 kg', 'length', 'metric')).toEqual({ ok: false, error: '“kg” is not a unit of length' })
    expect(parseQuantity('3 furlongz', 'length', 'metric')).toEqual({ ok: false, error: 'Unknown unit “furlongz”' })
    expect(parseQuantity('-2 cfm', 'flow', 'metric')).toEqual({ ok: false, error: 'A flow rate cannot be negative' })
  })
  it('allows negative coordinates (lengths on the plan can be west or south of the origin)', () => {
    expect(si('-2 m', 'length')).toBe(-2)
  })
})

describe('formatQuantity', () => {
  it('shows stored SI values in the user’s system', () => {
    expect(formatQuantity(3.6576, 'length', 'imperial')).toBe('12 ft')
    expect(formatQuantity(3.6576, 'length', 'metric')).toBe('3.658 m')
    expect(formatQuantity(0.14158423296, 'flow', 'imperial')).toBe('300 cfm')
    expect(formatQuantity(0.14158423296, 'flow', 'metric')).toBe('509.7 m³/h')
    expect(formatQuantity(3.3333333e-5, 'leakFlow', 'metric')).toBe('2 L/min')
    expect(formatQuantity(0.0015, 'smallLength', 'metric')).toBe('1.5 mm')
    expect(formatQuantity(6, 'airChanges', 'imperial')).toBe('6 /h')
  })
  it('round-trips through parseQuantity', () => {
    for (const v of [0.3048, 2.5, 17.25]) {
      expect(si(formatQuantity(v, 'length', 'imperial', 12), 'length')).toBeCloseTo(v, 9)
    }
  })
  it('formats numbers to significant figures', () => {
    expect(formatNumber(0)).toBe('0')
    expect(formatNumber(1234.5678)).toBe('1235')
    expect(formatNumber(0.000123456)).toBe('0.0001235')
    expect(formatNumber(1.5e-7)).toBe('1.5e-7')
  })
})
