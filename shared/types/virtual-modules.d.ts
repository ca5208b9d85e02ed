// Virtual modules made at build time by nuxt.config.ts (nitro.virtual), for the server only:
// the Monte Carlo worker bundled as CommonJS source (server/utils/monteCarlo.ts).
declare module '#bandlight/mc-worker' {
  const code: string
  export default code
}
