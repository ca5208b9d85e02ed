/** Plain JSON for uploaded files (shared/types/registers.ts). */
import type { UploadDTO } from '#shared/types'
import type { Upload } from '#server/models/Upload'

export function uploadDTO(u: Upload): UploadDTO {
  return {
    id: u.id,
    sha256: u.sha256,
    size: u.size,
    mimeType: u.mimeType,
    originalName: u.originalName,
    purpose: u.purpose,
    organizationId: u.organizationId ?? null,
    uploadedBy: u.uploadedBy ?? null,
    createdAt: u.createdAt.toISOString(),
  }
}
