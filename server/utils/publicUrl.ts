import { config } from './config'

/** The laboratory's public address (links in certificates and e-mail): PUBLIC_BASE_URL, no trailing slash. */
export function publicBaseUrl(): string {
  return config().publicBaseUrl
}
