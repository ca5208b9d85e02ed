import type { EquipmentType } from '#shared/registers/constants'
import type { Page } from '#shared/types'
import type { BlackbodySourceDTO, ReferenceInstrumentDTO } from '#shared/types/registers'
import type { SelectOption } from './forms/options'

/**
 * The laboratory's own equipment as one list to choose from (check plans, the item a
 * nonconformity affects): its blackbody sources and reference instruments, each as
 * `source:12` / `reference:4`, labelled by asset tag and what it is. `equipmentRef` and
 * `equipmentOf` turn a choice into the API's `equipmentType` and `equipmentId` and back.
 */
export async function useEquipmentOptions() {
  const [{ data: sources }, { data: references }] = await Promise.all([
    useFetch<Page<BlackbodySourceDTO>>('/api/sources', { key: 'equipment-options-sources', query: { pageSize: 500, sort: 'assetTag' } }),
    useFetch<Page<ReferenceInstrumentDTO>>('/api/reference-instruments', { key: 'equipment-options-references', query: { pageSize: 500, sort: 'assetTag' } }),
  ])
  const options = computed<SelectOption[]>(() => [
    ...(sources.value?.rows ?? []).map(s => ({ value: equipmentRef('source', s.id), label: `${s.assetTag} · blackbody source ${s.maker} ${s.model}` })),
    ...(references.value?.rows ?? []).map(r => ({ value: equipmentRef('reference', r.id), label: `${r.assetTag} · reference instrument ${r.maker} ${r.model}` })),
  ])
  return { options }
}

/** "source:12" */
export function equipmentRef(type: EquipmentType, id: number): string {
  return `${type}:${id}`
}

/** "source:12" → { equipmentType: 'source', equipmentId: 12 }; nothing chosen → nulls. */
export function equipmentOf(ref: unknown): { equipmentType: EquipmentType | null, equipmentId: number | null } {
  const m = /^(source|reference):(\d+)$/.exec(String(ref ?? ''))
  return m ? { equipmentType: m[1] as EquipmentType, equipmentId: Number(m[2]) } : { equipmentType: null, equipmentId: null }
}
