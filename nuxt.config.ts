import { fileURLToPath } from 'node:url'
import { buildSync } from 'esbuild'

/**
 * The Monte Carlo worker, bundled to one CommonJS string at build time so the built server
 * can load it in its worker pool (server/services/calculations/pool.ts writes it to a private temporary file).
 */
function monteCarloWorkerSource(): string {
  const result = buildSync({
    entryPoints: [fileURLToPath(new URL('./server/workers/readingMonteCarlo.ts', import.meta.url))],
    bundle: true,
    platform: 'node',
    format: 'cjs',
    target: 'node20',
    write: false,
    logLevel: 'silent',
    // The same aliases the app and the scripts use (package.json "imports").
    alias: {
      '#shared': fileURLToPath(new URL('./shared', import.meta.url)),
      '#server': fileURLToPath(new URL('./server', import.meta.url)),
    },
  })
  return result.outputFiles[0]!.text
}

// Bandlight — Nuxt configuration. Files live at the repository root (srcDir '.'),
// there is no app/ folder. Nothing is fetched from outside at build or run time.
export default defineNuxtConfig({
  compatibilityDate: '2025-07-15',
  srcDir: '.',
  // Parallel builds on one machine (several engineers, CI beside a checkout) can each use
  // their own folders; by default Nuxt's own.
  buildDir: process.env.BANDLIGHT_BUILD_DIR || undefined,
  devtools: { enabled: false },
  telemetry: false,
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', 'nuxt-auth-utils', '@nuxt/eslint'],
  css: ['~/assets/css/main.css'],
  tailwindcss: {
    cssPath: false,
    configPath: 'tailwind.config.ts',
    viewer: false,
  },
  app: {
    head: {
      htmlAttrs: { lang: 'en' },
      title: 'Bandlight',
      meta: [
        { name: 'viewport', content: 'width=device-width, initial-scale=1' },
        { name: 'description', content: 'Calibration records and certificates for radiation thermometry laboratories' },
      ],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },
  runtimeConfig: {
    // Read at run time from NUXT_SESSION_PASSWORD (scripts/demo.ts creates one when missing).
    session: {
      name: 'bandlight-session',
      password: '',
      maxAge: 60 * 60 * 12,
    },
  },
  nitro: {
    output: process.env.BANDLIGHT_OUTPUT_DIR ? { dir: process.env.BANDLIGHT_OUTPUT_DIR } : undefined,
    experimental: { tasks: true },
    // Static files also as .br and .gz, served by Accept-Encoding; hashed files under /_nuxt/ are
    // cached for a year (immutable) by Nuxt's own route rule.
    compressPublicAssets: { gzip: true, brotli: true },
    // Hourly; the job itself checks the send hour in the lab's time zone (MailSettings).
    scheduledTasks: { '5 * * * *': ['reminders:daily'] },
    virtual: {
      // As base64: the build's text replacements (e.g. `typeof window`) must not reach into the worker's code.
      '#bandlight/mc-worker': () => `export default Buffer.from(${JSON.stringify(Buffer.from(monteCarloWorkerSource()).toString('base64'))}, 'base64').toString('utf8')`,
    },
  },
  typescript: {
    strict: true,
  },
  eslint: {
    config: { stylistic: false },
  },
})
