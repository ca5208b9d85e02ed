import { TEMPLATE_DISTRIBUTION_LABELS, type ComponentUnit, type TemplateDistribution } from '#shared/calibration/constants'

/** Unit names of budget components, short enough for a table cell (the full name is the title). */
export const COMPONENT_UNIT_SHORT: Record<ComponentUnit, string> = { 'K': 'K', 'mK': 'mK', 'emissivity': 'ε (absolute)', 'percent-of-emissivity': '% of ε' }

/** What the stated value of a component is for each distribution (GUM 4.3.7, 4.3.9). */
export const COMPONENT_VALUE_MEANING: Record<TemplateDistribution, string> = {
  'normal': 'expanded, u = U/k',
  'rectangular': 'half-width, u = a/√3',
  'triangular': 'half-width, u = a/√6',
  'u-shaped': 'half-width, u = a/√2',
  'standard': 'standard uncertainty',
}

/** "Normal (expanded uncertainty with k)" → "Normal". */
export const shortDistribution = (d: TemplateDistribution) => TEMPLATE_DISTRIBUTION_LABELS[d].replace(/ \(.*\)$/, '')
