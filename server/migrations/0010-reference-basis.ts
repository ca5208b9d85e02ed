import { dropColumns } from './lib'
import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * What a source's certificate means, its uncertainty in every budget, and checks that the setup fits:
 *
 * - blackbody_sources: the basis of the certified value (`certifiedBasis`: 'cavity-temperature',
 *   'surface-temperature' or 'radiance-temperature'), for a radiance temperature its band (λ1–λ2 µm,
 *   wavelengths in vacuum or air) and the surroundings' temperature at calibration (T_w0), the certified
 *   expanded uncertainty U with its coverage factor k, and an emissivity table over wavelength;
 * - procedure_versions: correlations between template lines, whether the budget takes the reference
 *   equipment's lines from the registers, and the margin of aperture over spot;
 * - calibration_runs: a spot diameter stated for the run (when the maker states one at the distance).
 *
 * The default basis of the sources already recorded. Before this migration the engine used a source's
 * corrected value as the source temperature T_s in ε_i·S(T_meas) + (1 − ε_i)·S(T_d) = ε_s·S(T_s) +
 * (1 − ε_s)·S(T_w): for a cavity its cavity temperature, for a flat plate its surface temperature. This
 * migration records exactly that meaning — 'cavity-temperature' for cavities, 'surface-temperature' for
 * plates — so that every result already stored (and every certificate issued from it) keeps the basis it
 * was computed on and says so, and nothing is silently recomputed. It does not guess a radiance
 * temperature's band or T_w0, which only the source's certificate can give: where a certificate states
 * radiance temperatures (the register's correction table was described that way), the laboratory must
 * change the source's basis and enter the band and T_w0 from it. Each source gets an audit row saying
 * which basis this migration recorded and why, so an assessor can see where the basis of every number
 * came from. The certified U and k are left empty (not recorded before): a procedure that takes the
 * equipment's lines refuses points on such a source until they are entered.
 *
 * Procedure versions already written keep their budgets as they were (`budgetFromEquipment` false: the
 * template is the whole budget; no correlations; no margin, so the spot must only fit inside the aperture).
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const sources = {
    certifiedBasis: { type: DataTypes.STRING(30), allowNull: false, defaultValue: 'surface-temperature' },
    certifiedBandLambda1Um: { type: DataTypes.DOUBLE, allowNull: true },
    certifiedBandLambda2Um: { type: DataTypes.DOUBLE, allowNull: true },
    certifiedBandMedium: { type: DataTypes.STRING(10), allowNull: true },
    certifiedReflectedTemperatureK: { type: DataTypes.DOUBLE, allowNull: true },
    certifiedExpandedUncertaintyK: { type: DataTypes.DOUBLE, allowNull: true },
    certifiedCoverageFactor: { type: DataTypes.DOUBLE, allowNull: true },
    emissivityTable: { type: DataTypes.JSON, allowNull: true },
  }
  for (const [name, def] of Object.entries(sources)) await qi.addColumn('blackbody_sources', name, def)
  await qi.sequelize.query(`UPDATE blackbody_sources SET "certifiedBasis" = 'cavity-temperature' WHERE kind = 'cavity'`)

  const [rows] = await qi.sequelize.query('SELECT id, "assetTag", kind FROM blackbody_sources') as [{ id: number, assetTag: string, kind: string }[], unknown]
  if (rows.length) {
    const at = new Date()
    await qi.bulkInsert('audit_events', rows.map(r => ({
      at,
      userId: null,
      action: 'migrate-basis',
      entity: 'BlackbodySource',
      entityId: r.id,
      before: null,
      after: JSON.stringify({
        certifiedBasis: r.kind === 'cavity' ? 'cavity-temperature' : 'surface-temperature',
        reason: `Migration 0010 recorded the basis the engine had used for ${r.assetTag}: its corrected value as the ${r.kind === 'cavity' ? 'cavity' : 'surface'} temperature T_s. If its certificate states radiance temperatures, change the basis and enter the band and the surroundings' temperature from the certificate.`,
      }),
    })))
  }

  await qi.addColumn('procedure_versions', 'correlations', { type: DataTypes.JSON, allowNull: false, defaultValue: '[]' })
  await qi.addColumn('procedure_versions', 'budgetFromEquipment', { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false })
  await qi.addColumn('procedure_versions', 'spotMargin', { type: DataTypes.DOUBLE, allowNull: true })

  await qi.addColumn('calibration_runs', 'spotDiameterMm', { type: DataTypes.DOUBLE, allowNull: true })
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await dropColumns(qi, 'calibration_runs', ['spotDiameterMm'])
  await dropColumns(qi, 'procedure_versions', ['spotMargin', 'budgetFromEquipment', 'correlations'])
  await dropColumns(qi, 'blackbody_sources', ['emissivityTable', 'certifiedCoverageFactor', 'certifiedExpandedUncertaintyK', 'certifiedReflectedTemperatureK', 'certifiedBandMedium', 'certifiedBandLambda2Um', 'certifiedBandLambda1Um', 'certifiedBasis'])
}
