/**
 * The invented demo scenario: one fictional laboratory's staff and three fictional
 * customer organizations. Idempotent: every row is looked up by its natural key
 * first, so running it again changes nothing. Not part of the server: `npm run db:seed`
 * (scripts/seed.ts) writes it, and `npm run demo` and the test runner call that first.
 */
import type { Transaction } from 'sequelize'
import type { Role } from '#shared/roles'
import { Organization } from '#server/models/Organization'
import { User } from '#server/models/User'
import { recordAudit, snapshot } from '#server/utils/audit'
import { writeTransaction } from '#server/utils/db'
import { seedBilling } from './billing'
import { seedCertificates } from './certificates'
import { seedRegisters } from './registers'
import { seedQuality } from './quality'
import { seedRequests } from './requests'
import { seedRuns } from './runs'
import { makePasswordHash } from '#server/utils/password'

/** The demo password of every demo account (demo only — change it on a real installation). */
export const DEMO_PASSWORD = 'bandlight-demo'

export const DEMO_ORGANIZATIONS = [
  { name: 'Kestrelmoor Foundry Ltd', contactEmails: ['metrology@kestrelmoor.example', 'plant.quality@kestrelmoor.example'] },
  { name: 'Pellucid Float Glass', contactEmails: ['instruments@pellucid-glass.example'] },
  { name: 'Brackenridge Food Processing', contactEmails: ['qa@brackenridge-foods.example'] },
] as const

export const DEMO_USERS: readonly { email: string, name: string, role: Role, organization?: string }[] = [
  { email: 'admin@bandlight.test', name: 'Ada Marwick', role: 'admin' },
  { email: 'technician@bandlight.test', name: 'Tomas Reyne', role: 'technician' },
  { email: 'quality@bandlight.test', name: 'Quinn Halvorsen', role: 'quality' },
  { email: 'customer@bandlight.test', name: 'Cora Lindqvist', role: 'customer', organization: 'Kestrelmoor Foundry Ltd' },
]

async function ensureOrganization(t: Transaction, spec: (typeof DEMO_ORGANIZATIONS)[number]): Promise<[Organization, boolean]> {
  const found = await Organization.findOne({ where: { name: spec.name }, transaction: t })
  if (found) return [found, false]
  const org = await Organization.create({ name: spec.name, contactEmails: [...spec.contactEmails] }, { transaction: t })
  await recordAudit(t, { userId: null, action: 'seed', entity: 'Organization', entityId: org.id, after: snapshot(org) })
  return [org, true]
}

/** Make sure the demo scenario exists; returns a one-line summary of what was created. */
export async function seedDemo(): Promise<string> {
  const demoHash = await makePasswordHash(DEMO_PASSWORD)
  let created = 0
  await writeTransaction(async (t) => {
    const orgs = new Map<string, Organization>()
    for (const spec of DEMO_ORGANIZATIONS) {
      const [org, isNew] = await ensureOrganization(t, spec)
      orgs.set(org.name, org)
      if (isNew) created++
    }
    for (const spec of DEMO_USERS) {
      if (await User.findOne({ where: { email: spec.email }, transaction: t })) continue
      const user = await User.create(
        {
          email: spec.email,
          name: spec.name,
          role: spec.role,
          organizationId: spec.organization ? orgs.get(spec.organization)!.id : null,
          passwordHash: demoHash,
        },
        { transaction: t },
      )
      await recordAudit(t, { userId: null, action: 'seed', entity: 'User', entityId: user.id, after: snapshot(user) })
      created++
    }
    created += await seedRegisters(t)
    created += await seedRuns(t)
    created += await seedCertificates(t)
    created += await seedRequests(t)
    created += await seedQuality(t)
    created += await seedBilling(t)
  })
  return created ? `${created} records created` : 'already present, nothing changed'
}
