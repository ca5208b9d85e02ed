/** Plain JSON for responsivity tables (shared/types/registers.ts). */
import type { SpectralResponseDTO } from '#shared/types'
import type { SpectralResponse } from '#server/models/SpectralResponse'

export function spectralResponseDTO(s: SpectralResponse): SpectralResponseDTO {
  const points = s.points ?? []
  return {
    id: s.id,
    name: s.name,
    sha256: s.sha256,
    points,
    pointCount: points.length,
    lambdaMinUm: points[0]?.[0] ?? 0,
    lambdaMaxUm: points[points.length - 1]?.[0] ?? 0,
    createdAt: s.createdAt.toISOString(),
  }
}
