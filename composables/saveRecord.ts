/**
 * Create or update a register record: POST to the collection for a new one, PATCH to the record
 * with the version last seen for an existing one (409 when someone else changed it meanwhile).
 *
 * @example saveRecord<CustomerDTO>('/api/customers', props.customer, body)
 */
export function saveRecord<T>(endpoint: string, record: { id: number, version: number } | null | undefined, body: object): Promise<T> {
  const url = record ? `${endpoint}/${record.id}` : endpoint
  const request = record ? $fetch(url, { method: 'PATCH', body: { ...body, version: record.version } }) : $fetch(url, { method: 'POST', body })
  return request as Promise<T>
}
