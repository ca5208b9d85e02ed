/**
 * The lines of quotes, invoices and credit notes, worked out from plain facts (pure, no framework):
 *
 * - a quote's first lines come from the price list: per instrument its calibration (the price of
 *   its procedure, else of its kind of instrument, else the list's general price, with the points
 *   that price includes) and the points beyond those; one on-site line when the terms say on site.
 *   The laboratory edits them before sending.
 * - what is owed on a line once the work is done: nothing for an instrument whose certificate was
 *   withdrawn (and not replaced), and for additional points no more than the certificate holds
 *   beyond the included ones; otherwise what was quoted.
 * - a credit note gives back, line by line, what was invoiced less what was credited before less
 *   what is owed now.
 */
import type { LineKind } from './constants'

/** One price of the price list: for a procedure, for a kind of instrument, or general (both null). */
export interface PriceItem {
  label: string
  procedureId: number | null
  instrumentKind: string | null
  /** Price of one calibration including `includedPoints` points, minor units. */
  priceMinor: number
  includedPoints: number
  /** Price of each point beyond the included ones, minor units. */
  extraPointMinor: number
}

/** The price list's extras, minor units each. */
export interface PriceExtras {
  expressMinor: number
  onSiteMinor: number
  adjustmentMinor: number
}

/** A line of a quote or invoice. */
export interface BillingLine {
  kind: LineKind
  /** The instrument the line is about (null: the whole order, e.g. the on-site visit). */
  instrumentId: number | null
  description: string
  quantity: number
  unitPriceMinor: number
  /** For `extra-points`: how many points the calibration line already includes. */
  includedPoints: number | null
}

/**
 * The price that applies: the procedure's own, else the instrument kind's (of an item naming no
 * procedure), else the general one (naming neither); null when the list has none of them.
 * @example priceItemFor(items, 4, 'spot-infrared') // the item with procedureId 4, if there is one
 */
export function priceItemFor(items: readonly PriceItem[], procedureId: number, instrumentKind: string): PriceItem | null {
  return items.find(i => i.procedureId === procedureId)
    ?? items.find(i => i.procedureId === null && i.instrumentKind === instrumentKind)
    ?? items.find(i => i.procedureId === null && i.instrumentKind === null)
    ?? null
}

export interface QuoteFacts {
  instruments: readonly { id: number, kind: string, label: string }[]
  procedureId: number
  /** Calibration points agreed in the terms. */
  pointsCount: number
  onSite: boolean
}

/**
 * The first lines of a quote from the price list, and the instruments it has no price for (their
 * calibration line is priced 0 for the laboratory to fill in).
 */
export function quoteLinesFrom(items: readonly PriceItem[], extras: PriceExtras, facts: QuoteFacts): { lines: BillingLine[], unpriced: string[] } {
  const lines: BillingLine[] = []
  const unpriced: string[] = []
  for (const inst of facts.instruments) {
    const item = priceItemFor(items, facts.procedureId, inst.kind)
    if (!item) unpriced.push(inst.label)
    const included = item?.includedPoints ?? facts.pointsCount
    lines.push({
      kind: 'calibration',
      instrumentId: inst.id,
      description: `Calibration of ${inst.label}${item ? ` — ${item.label}, up to ${included} point${included === 1 ? '' : 's'}` : ''}`,
      quantity: 1,
      unitPriceMinor: item?.priceMinor ?? 0,
      includedPoints: null,
    })
    const extra = facts.pointsCount - included
    if (item && extra > 0) {
      lines.push({
        kind: 'extra-points',
        instrumentId: inst.id,
        description: `Additional calibration points for ${inst.label}`,
        quantity: extra,
        unitPriceMinor: item.extraPointMinor,
        includedPoints: included,
      })
    }
  }
  if (facts.onSite) {
    lines.push({ kind: 'on-site', instrumentId: null, description: 'Calibration on site', quantity: 1, unitPriceMinor: extras.onSiteMinor, includedPoints: null })
  }
  return { lines, unpriced }
}

/** What the records say about one instrument of an order. */
export interface InstrumentWork {
  /** `none`: no certificate yet; `valid`: a valid certificate; `withdrawn`: withdrawn and not replaced. */
  certificate: 'none' | 'valid' | 'withdrawn'
  /** Distinct calibration points on the valid certificate (null when there is none). */
  certifiedPoints: number | null
}

/**
 * How much of a line is owed given the work as recorded.
 * @param line - the quoted (or invoiced) line
 * @param work - the facts of the line's instrument (ignored for lines of the whole order)
 * @returns a whole number between 0 and the line's quantity
 * @example owedQuantity({ kind: 'extra-points', quantity: 3, includedPoints: 5, … }, { certificate: 'valid', certifiedPoints: 6 }) // 1
 */
export function owedQuantity(line: BillingLine, work: InstrumentWork | undefined): number {
  if (line.instrumentId === null || !work) return line.quantity
  if (work.certificate === 'withdrawn') return 0
  if (line.kind === 'extra-points' && work.certificate === 'valid' && work.certifiedPoints !== null && line.includedPoints !== null) {
    return Math.min(line.quantity, Math.max(0, work.certifiedPoints - line.includedPoints))
  }
  return line.quantity
}

/** The lines owed now, with zero-quantity lines left out (for an invoice made from a quote). */
export function owedLines(lines: readonly BillingLine[], work: ReadonlyMap<number, InstrumentWork>): BillingLine[] {
  return lines
    .map(l => ({ ...l, quantity: owedQuantity(l, l.instrumentId === null ? undefined : work.get(l.instrumentId)) }))
    .filter(l => l.quantity > 0)
}

/** A line of a credit note: which invoice line it gives back, and how much of it. */
export interface CreditLine extends BillingLine {
  /** Index of the invoice line credited. */
  invoiceLine: number
}

/**
 * What a credit note must give back now: per invoice line, the quantity invoiced less what earlier
 * credit notes gave back less what is owed; lines with nothing to give back are left out.
 * @param invoiced - the invoice's lines
 * @param credited - quantities already credited, by invoice line index
 * @param work - the facts of each instrument, by id
 */
export function creditLinesFor(invoiced: readonly BillingLine[], credited: ReadonlyMap<number, number>, work: ReadonlyMap<number, InstrumentWork>): CreditLine[] {
  const out: CreditLine[] = []
  invoiced.forEach((line, i) => {
    const owed = owedQuantity(line, line.instrumentId === null ? undefined : work.get(line.instrumentId))
    const give = line.quantity - (credited.get(i) ?? 0) - owed
    if (give > 0) out.push({ ...line, quantity: give, invoiceLine: i, description: `Credit: ${line.description}` })
  })
  return out
}
