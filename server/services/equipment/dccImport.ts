/**
 * A supplier's digital calibration certificate (DCC XML) as the calibration record of a blackbody
 * source or reference instrument: the file is read (server/services/dcc/read.ts) into the values
 * the record keeps — certificate number, calibration date, the laboratory as provider, the results
 * as text — and shown first (preview); recording it (`commit`) creates the calibration with those
 * values and the due date the user enters (a DCC states none), and keeps the file as an upload of
 * purpose `equipment-certificate` (type application/xml), all in one transaction with audit rows.
 * A file that is not a DCC this product can read answers 400 naming `file`.
 */
import { createError } from 'h3'
import { calibrationCreateSchema, type CalibrationDccFields } from '#shared/schemas/calibration'
import { fieldErrors } from '#shared/schemas/errors'
import type { DccCalibrationPreview, EquipmentCalibrationDTO, SessionUser } from '#shared/types'
import { EquipmentCalibration } from '#server/models/EquipmentCalibration'
import { Upload } from '#server/models/Upload'
import { createAudited } from '#server/utils/audit'
import { invalidInput, notFound } from '#server/utils/errors'
import type { FileForm } from '#server/utils/multipart'
import { inTransaction } from '#server/utils/transaction'
import { DCC_MIME_TYPE } from '#server/services/dcc/format'
import { DccReadError, dccResultsText, readDcc, type DccReading } from '#server/services/dcc/read'
import { labToday } from '#server/services/settings/today'
import { maxUploadBytes, sanitizeFileName, storeUploadBytes } from '#server/services/uploads/uploads'
import { calibrationDTO } from './dto'
import { addCalibrationIn, type EquipmentRegister, type EquipmentRow } from './equipment'

/** The one file of the form, within the upload size limit (413 past it), read as a DCC (400 naming `file` when it is none). */
function readDccFile(files: FileForm['files']): { name: string, data: Buffer, reading: DccReading } {
  const parts = files.filter(f => f.name === 'file')
  if (parts.length !== 1) invalidInput({ file: 'Choose one DCC file (XML) and send it in the field "file"' })
  const file = parts[0]!
  if (!file.data.length) invalidInput({ file: 'The file is empty' })
  const max = maxUploadBytes()
  if (file.data.length > max) {
    const message = `The file is larger than ${Math.round(max / 1024)} KiB`
    throw createError({ statusCode: 413, statusMessage: 'Payload Too Large', message, data: { fields: { file: message } } })
  }
  let reading: DccReading
  try {
    reading = readDcc(file.data)
  }
  catch (err) {
    if (err instanceof DccReadError) invalidInput({ file: err.message })
    throw err
  }
  if (reading.certificateNumber.length > 80) invalidInput({ file: `The DCC’s certificate number is longer than the 80 characters a calibration record keeps: ${reading.certificateNumber.slice(0, 40)}…` })
  if (reading.provider.length > 160) invalidInput({ file: 'The name of the DCC’s calibration laboratory is longer than the 160 characters a calibration record keeps' })
  return { name: sanitizeFileName(file.filename), data: file.data, reading }
}

async function previewOf<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, row: R, fileName: string, r: DccReading): Promise<DccCalibrationPreview> {
  const warnings: string[] = []
  const serials = r.items.flatMap(i => i.serials)
  if (serials.length && !serials.some(s => s.trim().toLowerCase() === row.serial.trim().toLowerCase())) {
    warnings.push(`The DCC identifies its item as ${serials.join(', ')}; this ${reg.label} has serial ${row.serial}.`)
  }
  if (await EquipmentCalibration.count({ where: { equipmentType: reg.type, equipmentId: row.id, certificateNumber: r.certificateNumber } })) {
    warnings.push(`Certificate ${r.certificateNumber} is already recorded for this ${reg.label}.`)
  }
  if (r.calibrationDate > await labToday()) warnings.push(`The calibration date ${r.calibrationDate} is in the future.`)
  if (!r.resultCount) warnings.push('The DCC states no results.')
  return {
    fileName,
    schemaVersion: r.schemaVersion,
    certificateNumber: r.certificateNumber,
    calibrationDate: r.calibrationDate,
    provider: r.provider,
    previousReport: r.previousReport,
    items: r.items,
    resultCount: r.resultCount,
    results: dccResultsText(r),
    suggestedDueDate: r.recalibrationDate && r.recalibrationDate > r.calibrationDate ? r.recalibrationDate : null,
    warnings,
  }
}

export type DccCalibrationImport = { committed: false, preview: DccCalibrationPreview } | { committed: true, calibration: EquipmentCalibrationDTO, preview: DccCalibrationPreview }

/**
 * Preview (fields without `commit=true`) or record (with it and a `dueDate`) the calibration a
 * supplier's DCC states for equipment `id`: 404 for no such equipment, 400 naming `file` for a file
 * that is not a readable DCC, 400 naming `dueDate` when it is missing or not after the calibration
 * date, 409 when the certificate number is already recorded for this equipment.
 */
export async function importCalibrationDcc<R extends EquipmentRow, D>(reg: EquipmentRegister<R, D>, user: SessionUser, id: number, form: { fields: CalibrationDccFields, files: FileForm['files'] }): Promise<DccCalibrationImport> {
  const row = await reg.model.findByPk(id)
  if (!row) notFound(reg.label)
  const file = readDccFile(form.files)
  const preview = await previewOf(reg, row, file.name, file.reading)
  if (form.fields.commit !== 'true') return { committed: false, preview }
  const input = calibrationCreateSchema.safeParse({
    provider: preview.provider,
    certificateNumber: preview.certificateNumber,
    calibrationDate: preview.calibrationDate,
    dueDate: form.fields.dueDate,
    results: preview.results,
  })
  if (!input.success) {
    // Only the due date is the user's; the rest comes from the file.
    const fields = fieldErrors(input.error)
    invalidInput(Object.fromEntries(Object.entries(fields).map(([k, m]) => (k === 'dueDate' ? [k, m] : ['file', `The DCC’s ${k}: ${m}`]))))
  }
  const sha256 = await storeUploadBytes(file.data)
  const calibration = await inTransaction(async (t) => {
    const upload = await createAudited(t, user, Upload, {
      sha256, size: file.data.length, mimeType: DCC_MIME_TYPE, originalName: file.name, purpose: 'equipment-certificate', organizationId: null, uploadedBy: user.id,
    }, { entity: 'Upload', action: 'upload' })
    return addCalibrationIn(t, reg, user, id, { ...input.data, uploadId: upload.id })
  })
  return { committed: true, calibration: calibrationDTO(calibration), preview }
}
