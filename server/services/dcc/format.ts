/**
 * The vocabulary of the digital calibration certificate (DCC) as this product writes and reads it:
 * PTB's DCC schema 3.1.2 (namespace https://ptb.de/dcc) with the D-SI schema 2.1.0 for quantities
 * (https://ptb.de/si), both GNU LGPL v3. The schema files are not part of the product; tests
 * validate against the copies in `../shared/standards/dcc/`. One place for the namespaces, the
 * D-SI unit strings, the reference types (`refType`) of the DCC good practice, and the mapping of
 * the product's ILAC-G8 verdicts to the DCC's conformity values.
 */
import type { CertificatePoint } from '#server/services/certificates/pdf'

export const DCC_NS = 'https://ptb.de/dcc'
export const SI_NS = 'https://ptb.de/si'
export const XSI_NS = 'http://www.w3.org/2001/XMLSchema-instance'
export const XMLNS_NS = 'http://www.w3.org/2000/xmlns/'
export const DCC_SCHEMA_VERSION = '3.1.2'
export const DCC_SCHEMA_LOCATION = `${DCC_NS} https://ptb.de/dcc/v${DCC_SCHEMA_VERSION}/dcc.xsd`
export const DCC_MIME_TYPE = 'application/xml'

/**
 * Version of the DCC writer (server/services/dcc/build.ts), stated as the `dccSoftware` release.
 * The writer is deterministic: the same certificate gives the same bytes. Bump it when the XML
 * written for the same certificate changes.
 */
export const DCC_WRITER_RELEASE = '1.0.0'

/**
 * D-SI unit strings (D-SI 2.1.0, `si:unitType`: BIPM SI brochure, 9th edition, written as
 * `\prefix\unit`): kelvin for every temperature (the issue asks for kelvin), percent for relative
 * humidity, millimetre for the measuring distance, `\one` for a quantity of dimension one (the
 * emissivity setting, a count).
 */
export const UNIT = {
  kelvin: '\\kelvin',
  percent: '\\percent',
  millimetre: '\\milli\\metre',
  one: '\\one',
} as const

/**
 * Reference types of the DCC good practice (PTB's "basic_" namespace) this product writes, and
 * reads from a supplier's DCC to find the reference value, the indication and the error.
 */
export const REF = {
  referenceValue: 'basic_referenceValue',
  measuredValue: 'basic_measuredValue',
  measurementError: 'basic_measurementError',
  conformity: 'basic_conformity',
  acceptanceLimitLower: 'basic_acceptanceLimitLower',
  acceptanceLimitUpper: 'basic_acceptanceLimitUpper',
  uncertainty: 'basic_uncertainty',
  temperature: 'basic_temperature',
  humidityRelative: 'basic_humidityRelative',
  recalibration: 'basic_recalibration',
} as const

type Verdict = CertificatePoint['verdict']

/** ILAC-G8:09/2019 statements (the product's verdicts) as DCC 3.1.2 `stringConformityStatementStatusType`. */
export const DCC_CONFORMITY: Record<Verdict, 'pass' | 'fail' | 'conditionalPass' | 'conditionalFail'> = {
  'pass': 'pass',
  'conditional-pass': 'conditionalPass',
  'conditional-fail': 'conditionalFail',
  'fail': 'fail',
}

let regionCodes: Map<string, string> | undefined

/** Region names (CLDR, English) → ISO 3166-1 alpha-2 code, canonical codes only (not aliases such as UK or DD). */
function regions(): Map<string, string> {
  if (regionCodes) return regionCodes
  const map = new Map<string, string>()
  const names = new Intl.DisplayNames(['en'], { type: 'region', fallback: 'none' })
  for (let a = 65; a <= 90; a++) {
    for (let b = 65; b <= 90; b++) {
      const code = String.fromCharCode(a, b)
      // Skip "unknown" and the aliases of deprecated or reserved codes (DD → DE, UK → GB, SU → RU …).
      if (code === 'ZZ' || Intl.getCanonicalLocales(`und-${code}`)[0] !== `und-${code}`) continue
      let name: string | undefined
      try {
        name = names.of(code)
      }
      catch {
        continue
      }
      if (name && !map.has(name.toLowerCase())) map.set(name.toLowerCase(), code)
    }
  }
  const aliases: Record<string, string> = {
    'uk': 'GB', 'great britain': 'GB', 'england': 'GB', 'scotland': 'GB', 'wales': 'GB', 'northern ireland': 'GB',
    'usa': 'US', 'u.s.a.': 'US', 'united states of america': 'US', 'deutschland': 'DE', 'the netherlands': 'NL', 'holland': 'NL',
  }
  for (const [k, v] of Object.entries(aliases)) map.set(k, v)
  regionCodes = map
  return map
}

/**
 * The ISO 3166-1 alpha-2 code of a country written in words ("United Kingdom" → "GB") or as a
 * code ("de" → "DE"); null when it is not recognized. Names from the Unicode CLDR (through
 * `Intl.DisplayNames`), with a few common aliases.
 * @example countryCode('United Kingdom') === 'GB'
 */
export function countryCode(country: string | null | undefined): string | null {
  const s = (country ?? '').trim().replace(/\s+/g, ' ').toLowerCase()
  if (!s) return null
  const map = regions()
  const named = map.get(s)
  if (named) return named
  if (/^[a-z]{2}$/.test(s)) {
    const code = s.toUpperCase()
    return [...map.values()].includes(code) ? code : null
  }
  return null
}
