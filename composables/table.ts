import type { RowData } from '@tanstack/vue-table'

declare module '@tanstack/vue-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Let the cell's text wrap (the register tables keep cells on one line otherwise). */
    wrap?: boolean
  }
}

/**
 * Table options whose data and columns are read live from a component's props (getters: a spread
 * would read them once).
 */
export function withLiveData<O extends object, T, C>(data: () => T[], columns: () => C[], options: O): O & { data: T[], columns: C[] } {
  return Object.defineProperties(options, {
    data: { get: data, enumerable: true },
    columns: { get: columns, enumerable: true },
  }) as O & { data: T[], columns: C[] }
}
