import crypto from 'node:crypto'

/**
 * A Content-Security-Policy for every rendered page, with a fresh nonce per response: only the
 * scripts the server itself puts in the page (Nuxt's bundles and its inline start-up script) may
 * run; no `eval`, no inline event handlers, no foreign hosts, no framing. Styles allow inline
 * `style` attributes (Vue binds some), nothing from outside. Also drops Nuxt's x-powered-by.
 */
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('render:html', (html, { event }) => {
    const nonce = crypto.randomBytes(18).toString('base64')
    const withNonce = (chunk: string) => chunk.replace(/<script\b/g, `<script nonce="${nonce}"`)
    html.head = html.head.map(withNonce)
    html.bodyPrepend = html.bodyPrepend.map(withNonce)
    html.bodyAppend = html.bodyAppend.map(withNonce)
    event.node.res.setHeader('content-security-policy', [
      "default-src 'self'",
      `script-src 'self' 'nonce-${nonce}'`,
      "style-src 'self' 'unsafe-inline'",
      "img-src 'self' data: blob:",
      "font-src 'self'",
      "connect-src 'self'",
      "object-src 'none'",
      "base-uri 'self'",
      "form-action 'self'",
      "frame-ancestors 'none'",
    ].join('; '))
  })
  nitroApp.hooks.hook('render:response', (response) => {
    if (response.headers) delete response.headers['x-powered-by']
  })
})
