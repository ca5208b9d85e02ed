// The instrument search (issue 17): any part of a serial or asset tag, through a trigram index
// (SQLite FTS5 with the trigram tokenizer, PostgreSQL pg_trgm); makers and models by their
// beginning. Each test works in an organization of its own, so other tests' instruments never
// count. Serials and asset tags are invented (none the same as a demo serial: the browser tests pick demo
// instruments by serial).
import { describe, expect, it } from 'vitest'
import { signedIn, unique, type Client } from '../support/http'
import { makeCustomer, makeInstrument } from '../support/factories'

async function search(c: Client, organizationId: number, q: string, extra = ''): Promise<{ total: number, serials: string[] }> {
  const r = await c.get(`/api/instruments?organizationId=${organizationId}&q=${encodeURIComponent(q)}&pageSize=50&sort=serial${extra}`)
  expect(r.status, q).toBe(200)
  return { total: r.body.total, serials: r.body.rows.map((i: { serial: string }) => i.serial) }
}

describe('instrument search', () => {
  it('finds a serial by any part of it: "KF01037" finds "ZQ16-KF01037"', async () => {
    const tech = await signedIn('technician')
    const org = await makeCustomer(await signedIn('admin'))
    await makeInstrument(tech, org.id, { serial: 'ZQ16-KF01037' })
    await makeInstrument(tech, org.id, { serial: 'ZQ16-KF01038' })
    await makeInstrument(tech, org.id, { serial: 'ZX-900' })
    expect(await search(tech, org.id, 'KF01037')).toEqual({ total: 1, serials: ['ZQ16-KF01037'] })
    // case does not matter; a part in the middle, across the dash, at the end
    expect(await search(tech, org.id, 'kf0103')).toEqual({ total: 2, serials: ['ZQ16-KF01037', 'ZQ16-KF01038'] })
    expect((await search(tech, org.id, '16-KF')).total).toBe(2)
    expect(await search(tech, org.id, '1038')).toEqual({ total: 1, serials: ['ZQ16-KF01038'] })
    // shorter than three characters (no trigram): still any part, read from the table
    expect((await search(tech, org.id, '16')).total).toBe(2)
    expect(await search(tech, org.id, 'X-')).toEqual({ total: 1, serials: ['ZX-900'] })
    expect((await search(tech, org.id, 'KF01039')).total).toBe(0)
  })

  it('finds an asset tag by any part of it, and a maker or model by its beginning', async () => {
    const tech = await signedIn('technician')
    const org = await makeCustomer(await signedIn('admin'))
    const tag = unique('LAB').toUpperCase()
    await makeInstrument(tech, org.id, { serial: 'S-1', assetTag: `${tag}-0042`, maker: 'Quillfield Sensing', model: 'QS 300' })
    await makeInstrument(tech, org.id, { serial: 'S-2', assetTag: null, maker: 'Ormsby Radiometrics', model: 'Spot 8' })
    expect(await search(tech, org.id, `${tag.slice(3)}-004`)).toEqual({ total: 1, serials: ['S-1'] })
    expect(await search(tech, org.id, 'quillf')).toEqual({ total: 1, serials: ['S-1'] })
    expect(await search(tech, org.id, 'Spot')).toEqual({ total: 1, serials: ['S-2'] })
    // maker and model are looked up by their beginning only
    expect((await search(tech, org.id, 'Sensing')).total).toBe(0)
  })

  it('follows changes: a new serial is found by its parts and the old one no longer is; archived instruments only with archived=all', async () => {
    const tech = await signedIn('technician')
    const org = await makeCustomer(await signedIn('admin'))
    const made = await makeInstrument(tech, org.id, { serial: 'OLD-77123' })
    expect((await search(tech, org.id, '77123')).total).toBe(1)
    const changed = await tech.patch(`/api/instruments/${made.id}`, { serial: 'NEW-55321', version: made.version })
    expect(changed.status).toBe(200)
    expect((await search(tech, org.id, '77123')).total).toBe(0)
    expect(await search(tech, org.id, '55321')).toEqual({ total: 1, serials: ['NEW-55321'] })
    expect((await tech.post(`/api/instruments/${made.id}/archive`, { archived: true, version: changed.body.version })).status).toBe(200)
    expect((await search(tech, org.id, '55321')).total).toBe(0)
    expect((await search(tech, org.id, '55321', '&archived=all')).total).toBe(1)
  })

  it('takes quotes, % and _ as characters, and a customer finds only its own instruments', async () => {
    const tech = await signedIn('technician')
    const org = await makeCustomer(await signedIn('admin'))
    await makeInstrument(tech, org.id, { serial: 'Q"T_1%' })
    await makeInstrument(tech, org.id, { serial: 'QXTA1B' })
    expect(await search(tech, org.id, '"T_1%')).toEqual({ total: 1, serials: ['Q"T_1%'] })
    expect(await search(tech, org.id, 'T_1')).toEqual({ total: 1, serials: ['Q"T_1%'] })
    const customer = await signedIn('customer')
    const theirs = await customer.get(`/api/instruments?q=${encodeURIComponent('Q"T_1%')}`)
    expect(theirs.status).toBe(200)
    expect(theirs.body.total).toBe(0)
  })
})
