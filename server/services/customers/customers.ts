/**
 * Customers: the existing organizations with the address printed on certificates, and their
 * contacts. Used by server/api/customers and server/api/contacts.
 */
import type { H3Event } from 'h3'
import { fn, col, type Order } from 'sequelize'
import { z } from 'zod'
import type { CsvImportInput, CustomerQuery } from '#shared/schemas/registerQuery'
import { contactCreateSchema, customerCreateSchema, type ContactCreateInput, type ContactUpdateInput, type CustomerCreateInput, type CustomerUpdateInput } from '#shared/schemas/customer'
import type { ContactDTO, CustomerDTO, CustomerDetailDTO, ImportPreview, ImportResult, Page, SessionUser } from '#shared/types'
import { Contact } from '#server/models/Contact'
import { Organization } from '#server/models/Organization'
import { checkCsvRows, csvFromRows, markDuplicates, previewOf, refuseUnlessAllValid, rowError, sendCsv, withCsvShape, type CsvColumns } from '#server/utils/csv'
import { contactDTO, customerDTO } from './dto'
import { createAudited, recordAudit, snapshot, updateAudited } from '#server/utils/audit'
import { assertVersion, notFound } from '#server/utils/errors'
import { changes } from '#server/utils/validation'
import { auditTrail } from '#server/services/audit/trail'
import { ListFilter } from '#server/utils/search'
import { inTransaction } from '#server/utils/transaction'

function customerFilter(q: Pick<CustomerQuery, 'q' | 'active'>): ListFilter {
  const f = new ListFilter()
  if (q.active !== 'all') f.add({ active: q.active === 'true' })
  // Organizations number in the hundreds: a substring search is fine here.
  if (q.q) f.text('Organization', ['name', 'city'], q.q, 'contains')
  return f
}

function customerOrder(q: Pick<CustomerQuery, 'sort' | 'dir'>): Order {
  const d = q.dir === 'desc' ? 'DESC' : 'ASC'
  return [[q.sort, d], ['id', d]]
}

/** Active contacts per organization. */
export async function contactCounts(ids: readonly number[]): Promise<Map<number, number>> {
  if (!ids.length) return new Map()
  const rows = await Contact.findAll({
    where: { organizationId: [...ids], active: true },
    attributes: ['organizationId', [fn('COUNT', col('id')), 'n']],
    group: ['organizationId'],
    raw: true,
  }) as unknown as { organizationId: number, n: number }[]
  return new Map(rows.map(r => [r.organizationId, Number(r.n)]))
}

export async function listCustomers(q: CustomerQuery): Promise<Page<CustomerDTO>> {
  const filter = customerFilter(q).options()
  const [total, rows] = await Promise.all([
    Organization.count(filter),
    Organization.findAll({ ...filter, order: customerOrder(q), limit: q.pageSize, offset: (q.page - 1) * q.pageSize }),
  ])
  const counts = await contactCounts(rows.map(r => r.id))
  return { rows: rows.map(o => customerDTO(o, counts.get(o.id) ?? 0)), total, page: q.page, pageSize: q.pageSize }
}

// ---------------------------------------------------------------- CSV: one row per contact

const CUSTOMER_COLUMNS: CsvColumns = {
  name: 'text', contactEmails: 'list', addressLines: 'text', city: 'text', postcode: 'text', country: 'text',
  contactName: 'text', contactEmail: 'text', contactPhone: 'text', contactReceivesReminders: 'boolean',
}
const CUSTOMER_EXPORT = [...Object.keys(CUSTOMER_COLUMNS), 'id', 'active'] as const

/** One CSV row: the organization, and optionally one contact. */
const customerRowSchema = customerCreateSchema
  .extend({
    contactName: z.string().optional(),
    contactEmail: z.string().optional(),
    contactPhone: z.string().optional(),
    contactReceivesReminders: z.boolean().optional(),
  })
  .transform((v, ctx) => {
    const { contactName, contactEmail, contactPhone, contactReceivesReminders, ...org } = v
    if (contactName === undefined && contactEmail === undefined && contactPhone === undefined) return { org, contact: null }
    const c = contactCreateSchema.safeParse({ name: contactName, email: contactEmail, phone: contactPhone, receivesReminders: contactReceivesReminders })
    if (!c.success) {
      for (const issue of c.error.issues) {
        const key = String(issue.path[0] ?? 'name')
        ctx.addIssue({ code: 'custom', path: ['contact' + key[0]!.toUpperCase() + key.slice(1)], message: issue.message })
      }
      return z.NEVER
    }
    return { org, contact: c.data }
  })

export async function exportCustomers(event: H3Event, q: CustomerQuery): Promise<string> {
  const orgs = await Organization.findAll({ ...customerFilter(q).options(), order: customerOrder(q), limit: 100_000 })
  const contacts = orgs.length ? await Contact.findAll({ where: { organizationId: orgs.map(o => o.id), active: true }, order: [['id', 'ASC']] }) : []
  const byOrg = new Map<number, Contact[]>()
  for (const c of contacts) byOrg.set(c.organizationId, [...(byOrg.get(c.organizationId) ?? []), c])
  const rows: Record<string, unknown>[] = []
  for (const o of orgs) {
    const base = { id: o.id, name: o.name, contactEmails: (o.contactEmails ?? []).join('; '), addressLines: o.addressLines, city: o.city, postcode: o.postcode, country: o.country, active: o.active }
    const list = byOrg.get(o.id) ?? []
    if (!list.length) rows.push(base)
    for (const c of list) rows.push({ ...base, contactName: c.name, contactEmail: c.email, contactPhone: c.phone, contactReceivesReminders: c.receivesReminders })
  }
  return sendCsv(event, 'customers', csvFromRows(CUSTOMER_EXPORT, rows))
}

/**
 * Rows with the same organization name make one organization (the first row's fields) with one
 * contact per row. An organization that already exists is refused on `name`.
 */
export async function importCustomers(user: SessionUser, input: CsvImportInput): Promise<ImportPreview | ImportResult> {
  const rows = withCsvShape(() => checkCsvRows(input.csv, CUSTOMER_COLUMNS, customerRowSchema))
  markDuplicates(rows, v => (v.contact ? `${v.org.name}\u0000${v.contact.email}` : null), 'contactEmail')
  const names = [...new Set(rows.filter(r => r.value).map(r => r.value!.org.name))]
  if (names.length) {
    const existing = await Organization.findAll({ where: { name: names }, attributes: ['name'] })
    const taken = new Set(existing.map(o => o.name))
    for (const row of rows) if (row.value && taken.has(row.value.org.name)) rowError(row, 'name', 'An organization with this name exists')
  }
  if (!input.commit) return previewOf(rows)
  const values = refuseUnlessAllValid(rows)
  let created = 0
  await inTransaction(async (t) => {
    const orgs = new Map<string, Organization>()
    for (const v of values) {
      let org = orgs.get(v.org.name)
      if (!org) {
        const o: CustomerCreateInput = v.org
        org = await Organization.create({ name: o.name, contactEmails: o.contactEmails, addressLines: o.addressLines, city: o.city, postcode: o.postcode ?? null, country: o.country }, { transaction: t })
        await recordAudit(t, { userId: user.id, action: 'import', entity: 'Organization', entityId: org.id, after: snapshot(org) })
        orgs.set(org.name, org)
        created++
      }
      if (v.contact) {
        const c = await Contact.create({ organizationId: org.id, ...v.contact }, { transaction: t })
        await recordAudit(t, { userId: user.id, action: 'import', entity: 'Contact', entityId: c.id, after: snapshot(c) })
        created++
      }
    }
  })
  return { created }
}

// ---------------------------------------------------------------- one customer, its contacts

const activation = (before: Record<string, unknown>, after: Record<string, unknown>) =>
  before.active && !after.active ? 'deactivate' : !before.active && after.active ? 'reactivate' : 'update'

/** A customer with its contacts (active first) and its audit trail. */
export async function customerDetail(id: number): Promise<CustomerDetailDTO> {
  const org = await Organization.findByPk(id)
  if (!org) notFound('customer')
  const contacts = await Contact.findAll({ where: { organizationId: id }, order: [['active', 'DESC'], ['name', 'ASC'], ['id', 'ASC']] })
  return {
    ...customerDTO(org, contacts.filter(c => c.active).length),
    contacts: contacts.map(contactDTO),
    audit: await auditTrail('Organization', id),
  }
}

export async function createCustomer(actor: SessionUser, input: CustomerCreateInput): Promise<CustomerDTO> {
  const org = await inTransaction(t => createAudited(t, actor, Organization, {
    name: input.name, contactEmails: input.contactEmails, addressLines: input.addressLines, city: input.city, postcode: input.postcode ?? null, country: input.country,
  }, { entity: 'Organization' }))
  return customerDTO(org, 0)
}

export async function updateCustomer(actor: SessionUser, id: number, input: CustomerUpdateInput): Promise<CustomerDTO> {
  const org = await inTransaction(async (t) => {
    const org = await Organization.findByPk(id, { transaction: t })
    if (!org) notFound('customer')
    assertVersion(org.version, input.version)
    const set = Object.fromEntries(Object.entries(changes(input)).filter(([, v]) => v !== undefined))
    await updateAudited(t, actor, org, set, { entity: 'Organization', action: activation })
    return org
  })
  return customerDTO(org, (await contactCounts([id])).get(id) ?? 0)
}

export async function addContact(actor: SessionUser, organizationId: number, input: ContactCreateInput): Promise<ContactDTO> {
  const contact = await inTransaction(async (t) => {
    const org = await Organization.findByPk(organizationId, { transaction: t })
    if (!org) notFound('customer')
    return createAudited(t, actor, Contact, { organizationId, name: input.name, email: input.email, phone: input.phone ?? null, receivesReminders: input.receivesReminders }, { entity: 'Contact' })
  })
  return contactDTO(contact)
}

export async function updateContact(actor: SessionUser, id: number, input: ContactUpdateInput): Promise<ContactDTO> {
  const contact = await inTransaction(async (t) => {
    const contact = await Contact.findByPk(id, { transaction: t })
    if (!contact) notFound('contact')
    assertVersion(contact.version, input.version)
    await updateAudited(t, actor, contact, Object.fromEntries(Object.entries(changes(input)).filter(([, v]) => v !== undefined)), { entity: 'Contact', action: activation })
    return contact
  })
  return contactDTO(contact)
}
