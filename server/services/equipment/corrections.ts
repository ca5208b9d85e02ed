/** A source's certificate correction at a set-point, as the run form shows it before a point is saved. */
import { correctionAt, CorrectionRangeError } from '#shared/registers/correction'
import type { CorrectionDTO } from '#shared/types'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { invalidInput, notFound } from '#server/utils/errors'

/** Interpolated linearly in the source's table; 400 on `setPointK` outside it (never extrapolated). */
export async function sourceCorrection(id: number, setPointK: number): Promise<CorrectionDTO> {
  const source = await BlackbodySource.findByPk(id)
  if (!source) notFound('source')
  try {
    return { setPointK, correctionK: correctionAt(source.corrections ?? [], setPointK) }
  }
  catch (err) {
    if (err instanceof CorrectionRangeError) invalidInput({ setPointK: err.message })
    throw err
  }
}
