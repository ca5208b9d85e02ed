import type { RequestStatus } from '../schemas/request'

export interface CalibrationRequestDTO {
  id: number
  organizationId: number
  organizationName: string | null
  requestedBy: number
  requestedByName: string | null
  instruments: { id: number, serial: string, maker: string, model: string }[]
  preferredDate: string | null
  notes: string | null
  status: RequestStatus
  handledByName: string | null
  handledAt: string | null
  response: string | null
  runIds: number[]
  version: number
  createdAt: string
}
