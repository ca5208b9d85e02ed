/**
 * Version of the calculation engine (shared/radiometry and shared/uncertainty). Store it with every
 * computed result so that a stored budget or expected reading can be traced to the code that made it.
 * Bump the minor version when a result can change in its last digits, the major version when an
 * input or output changes meaning.
 */
export const ENGINE_VERSION = '1.3.0'
