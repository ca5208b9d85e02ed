/** A choice in a select: its value (null for "none chosen") and what it reads. */
export interface SelectOption { value: string | number | null, label: string }

/** Options from a list of values and their labels (the registers' constants). */
export function optionsOf<T extends string>(values: readonly T[], labels: Record<T, string>): SelectOption[] {
  return values.map(value => ({ value, label: labels[value] }))
}
