// The words of the forms (composables/forms/messages.ts): labels instead of schema keys, bounds in
// the user's unit. Conversions of the bounds follow the SI Brochure (9th ed., §2.3.1:
// t/°C = T/K − 273.15) and NIST SP 811 App. B (t/°F = T/K · 9/5 − 459.67).
import { describe, expect, it } from 'vitest'
import { runCreateSchema, pointCreateSchema } from '../../../shared/schemas/run'
import { instrumentCreateSchema } from '../../../shared/schemas/instrument'
import { humanize, issueMessages, specFor, words, type FieldSpecs } from '../../../composables/forms/messages'

const RUN: FieldSpecs = {
  instrumentId: { label: 'Instrument to calibrate', choice: true },
  procedureVersionId: { label: 'Procedure', choice: true },
  ambientTemperatureK: { label: 'Ambient temperature', quantity: 'temperature' },
  distanceMm: { label: 'Distance to the source', quantity: 'length' },
}

describe('messages name the field and speak the user\'s unit', () => {
  it('a bound in kelvin is given in °C or °F', () => {
    const bad = runCreateSchema.safeParse({ instrumentId: 1, procedureVersionId: 1, receivedDate: '2026-01-01', calibrationDate: '2026-01-02', ambientTemperatureK: 150, relativeHumidityPct: 40, distanceMm: 300, emissivitySetting: 0.95, reflectedTemperatureK: 296, instrumentTemperatureK: 296 })
    expect(bad.success).toBe(false)
    // 200 K = −73.15 °C = −99.67 °F
    expect(issueMessages(bad.error!, RUN, 'C').ambientTemperatureK).toBe('Ambient temperature must be at least −73.15 °C')
    expect(issueMessages(bad.error!, RUN, 'F').ambientTemperatureK).toBe('Ambient temperature must be at least −99.67 °F')
    expect(issueMessages(bad.error!, RUN, 'K').ambientTemperatureK).toBe('Ambient temperature must be at least 200 K')
  })
  it('"above 0 K" reads as absolute zero in the user\'s unit', () => {
    const bad = pointCreateSchema.safeParse({ sourceId: 1, setPointK: -5, sourceIndicatedK: 300, readingsK: [300] })
    expect(bad.success).toBe(false)
    const m = issueMessages(bad.error!, { setPointK: { label: 'Set-point', quantity: 'temperature' } }, 'C')
    expect(m.setPointK).toBe('Set-point must be above absolute zero (−273.15 °C)')
  })
  it('a temperature difference scales without the offset: at most 100 K = 180 °F', () => {
    const bad = instrumentCreateSchema.safeParse({ organizationId: 1, serial: 'S', maker: 'M', model: 'X', kind: 'spot-infrared', bandLambda1Um: 8, bandLambda2Um: 14, rangeMinK: 300, rangeMaxK: 400, defaultEmissivity: 0.95, resolutionK: 500, accuracy: { kind: 'absolute', b: 1 }, calibrationIntervalMonths: 12 })
    expect(bad.success).toBe(false)
    const m = issueMessages(bad.error!, { resolutionK: { label: 'Display resolution', quantity: 'temperatureDifference' } }, 'F')
    expect(m.resolutionK).toBe('Display resolution must be at most 180 °F')
  })
  it('an empty box asks for a number in its unit; a missing choice asks to choose', () => {
    const bad = runCreateSchema.safeParse({ instrumentId: null, procedureVersionId: null, receivedDate: '2026-01-01', calibrationDate: '2026-01-01', ambientTemperatureK: Number.NaN, relativeHumidityPct: 40, distanceMm: Number.NaN, emissivitySetting: 0.95, reflectedTemperatureK: 296, instrumentTemperatureK: 296 })
    expect(bad.success).toBe(false)
    const m = issueMessages(bad.error!, RUN, 'C')
    expect(m.ambientTemperatureK).toBe('Enter the ambient temperature (a number in °C)')
    expect(m.distanceMm).toBe('Enter the distance to the source (a number in mm)')
    expect(m.instrumentId).toBe('Choose the instrument to calibrate')
    expect(m.procedureVersionId).toBe('Choose the procedure')
  })
  it('no message of a whole form names a schema key', () => {
    const bad = instrumentCreateSchema.safeParse({})
    expect(bad.success).toBe(false)
    for (const m of Object.values(issueMessages(bad.error!, {}, 'C'))) expect(m).not.toMatch(/\b[a-z]+[A-Z]\w*\b/)
  })
})

describe('labels for paths', () => {
  it('finds a row\'s spec by pattern and numbers the row', () => {
    const specs: FieldSpecs = { 'corrections[*][0]': { label: 'Set-point, row {n}', quantity: 'temperature' } }
    expect(specFor(specs, 'corrections[2][0]')).toEqual({ label: 'Set-point, row 3', quantity: 'temperature' })
  })
  it('makes words of a key nobody described', () => {
    expect(words('ambientTemperatureK')).toBe('Ambient temperature')
    expect(words('organizationId')).toBe('Organization')
    expect(words('points[2].readingsK')).toBe('Readings')
    expect(words('band.lambda1Um')).toBe('Lambda1')
  })
  it('replaces keys in a server message with labels, and any other key with words', () => {
    expect(humanize('setPointK must be above 0 K', { setPointK: 'Set-point' })).toBe('Set-point must be above 0 K')
    expect(humanize('Give either sourceIndicatedK or referenceReadingK')).toBe('Give either source indicated or reference reading')
  })
})
