/**
 * The price list in the laboratory's settings: every save is its next version (never changed
 * afterwards), audited; the highest version is the one quotes are made from. Quotes keep the
 * version they were priced from.
 */
import type { Transaction } from 'sequelize'
import { basisPointsToPercent, percentToBasisPoints } from '#shared/billing/money'
import type { PriceListInput } from '#shared/schemas/billing'
import type { SessionUser } from '#shared/types'
import type { PriceListDTO, PriceListsDTO } from '#shared/types/billing'
import { PriceList } from '#server/models/PriceList'
import { Procedure } from '#server/models/Procedure'
import { User } from '#server/models/User'
import { createAudited } from '#server/utils/audit'
import { conflict, invalidInput } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'

/** The current price list (highest version), or null before the first is saved. */
export async function currentPriceList(t?: Transaction): Promise<PriceList | null> {
  return PriceList.findOne({ order: [['versionNumber', 'DESC']], transaction: t })
}

/** The current price list; 409 naming `prices` when there is none yet. */
export async function requirePriceList(t?: Transaction): Promise<PriceList> {
  const list = await currentPriceList(t)
  if (!list) conflict('The laboratory has no price list yet: an administrator enters it under Prices first', 'prices')
  return list
}

function priceListDTO(p: PriceList, names: Map<number, string>): PriceListDTO {
  return {
    id: p.id,
    versionNumber: p.versionNumber,
    currency: p.currency,
    taxRatePercent: basisPointsToPercent(p.taxRateBp),
    paymentTermsDays: p.paymentTermsDays,
    quoteValidDays: p.quoteValidDays,
    bankDetails: p.bankDetails ?? null,
    note: p.note ?? null,
    items: p.items,
    extras: p.extras,
    createdByName: p.createdBy ? names.get(p.createdBy) ?? null : null,
    createdAt: p.createdAt.toISOString(),
  }
}

/** GET /api/prices: the current list and the history of versions. */
export async function priceLists(): Promise<PriceListsDTO> {
  const rows = await PriceList.findAll({ order: [['versionNumber', 'DESC']] })
  const ids = [...new Set(rows.map(r => r.createdBy).filter((v): v is number => v !== null))]
  const names = new Map((ids.length ? await User.findAll({ where: { id: ids }, attributes: ['id', 'name'] }) : []).map(u => [u.id, u.name]))
  return {
    current: rows[0] ? priceListDTO(rows[0], names) : null,
    versions: rows.map(r => ({ id: r.id, versionNumber: r.versionNumber, note: r.note ?? null, createdByName: r.createdBy ? names.get(r.createdBy) ?? null : null, createdAt: r.createdAt.toISOString() })),
  }
}

/** Save the price list as its next version (400 naming `items[i].procedureId` for an unknown procedure). */
export async function savePriceListIn(t: Transaction, actor: { id: number } | null, input: PriceListInput): Promise<PriceList> {
  const procedureIds = [...new Set(input.items.map(i => i.procedureId).filter((v): v is number => v !== null))]
  if (procedureIds.length) {
    const known = new Set((await Procedure.findAll({ where: { id: procedureIds }, attributes: ['id'], transaction: t })).map(p => p.id))
    const i = input.items.findIndex(item => item.procedureId !== null && !known.has(item.procedureId))
    if (i >= 0) invalidInput({ [`items[${i}].procedureId`]: 'No procedure with this id' })
  }
  const last = await currentPriceList(t)
  return createAudited(t, actor, PriceList, {
    versionNumber: (last?.versionNumber ?? 0) + 1,
    currency: input.currency,
    taxRateBp: percentToBasisPoints(input.taxRatePercent),
    paymentTermsDays: input.paymentTermsDays,
    quoteValidDays: input.quoteValidDays,
    bankDetails: input.bankDetails ?? null,
    note: input.note ?? null,
    items: input.items,
    extras: input.extras,
    createdBy: actor?.id ?? null,
  }, { entity: 'PriceList', action: last ? 'new-version' : 'create' })
}

export async function savePriceList(actor: SessionUser, input: PriceListInput): Promise<PriceListsDTO> {
  await inTransaction(t => savePriceListIn(t, actor, input))
  return priceLists()
}
