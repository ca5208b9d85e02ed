// Unit checks of the small framework-free helpers the server is built on.
import path from 'node:path'
import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import { NAV_ITEMS, navFor, rolesForPath } from '../../../shared/navigation'
import { ROLES } from '../../../shared/roles'
import { fieldErrors, fieldName } from '../../../shared/schemas/errors'
import { userCreateSchema } from '../../../shared/schemas/user'
import { databasePath } from '../../../server/utils/db'

describe('field names in error answers', () => {
  it('joins paths the way the API documents them', () => {
    expect(fieldName([])).toBe('body')
    expect(fieldName(['email'])).toBe('email')
    expect(fieldName(['band', 'lambda1Um'])).toBe('band.lambda1Um')
    expect(fieldName(['components', 2, 'halfWidth'])).toBe('components[2].halfWidth')
    expect(fieldName(['band', 'points', 0, 1])).toBe('band.points[0][1]')
  })
  it('keeps the first message per field', () => {
    const r = z.object({ a: z.string().min(3).email() }).safeParse({ a: 'x' })
    expect(r.success).toBe(false)
    if (!r.success) expect(Object.keys(fieldErrors(r.error))).toEqual(['a'])
  })
  it('a customer user without an organization is refused on organizationId', () => {
    const r = userCreateSchema.safeParse({ email: 'c@x.example', name: 'C', role: 'customer', password: 'long-enough-pass' })
    expect(r.success).toBe(false)
    if (!r.success) expect(fieldErrors(r.error)).toHaveProperty('organizationId')
  })
})

describe('DATABASE_URL', () => {
  it('resolves relative paths from the working directory', () => {
    expect(databasePath('sqlite:./data/bandlight.sqlite')).toBe(path.resolve(process.cwd(), 'data/bandlight.sqlite'))
    expect(databasePath('sqlite:/var/lib/x.sqlite')).toBe('/var/lib/x.sqlite')
    expect(databasePath('sqlite:///var/lib/y.sqlite')).toBe('/var/lib/y.sqlite')
    expect(databasePath('sqlite::memory:')).toBe(':memory:')
  })
  it('refuses anything but sqlite', () => {
    expect(() => databasePath('postgres://x')).toThrow(/sqlite/)
    expect(() => databasePath('sqlite:')).toThrow()
  })
})

describe('navigation', () => {
  it('gives every role the overview and only admins the administration pages', () => {
    for (const role of ROLES) expect(navFor(role)[0]!.to).toBe('/')
    expect(navFor('technician').some(i => i.group === 'Administration')).toBe(false)
    expect(rolesForPath('/admin/users/12')).toEqual(['admin'])
    expect(rolesForPath('/')).toBeUndefined()
    expect(new Set(NAV_ITEMS.map(i => i.to)).size).toBe(NAV_ITEMS.length)
  })
})
