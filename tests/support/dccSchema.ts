/**
 * Validation of DCC files against PTB's published schema (dcc.xsd 3.1.2, which imports the D-SI
 * schema SI_Format.xsd 2.1.0) with xmllint from Debian's libxml2-utils. The schema files are not
 * part of the project: CI places them in `../shared/standards/dcc/` beside the clone (the path is
 * taken from the repository root, or the nearest parent folder holding `shared/standards/dcc`;
 * BANDLIGHT_DCC_SCHEMA_DIR names another folder). Tests that
 * validate are skipped (and reported as skipped) where xmllint is missing; a missing schema is an
 * error, never a pass.
 */
import { execFileSync, spawnSync } from 'node:child_process'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'

const ROOT = path.resolve(import.meta.dirname, '../..')

/**
 * `../shared/standards/dcc/dcc.xsd` from the repository root — or, for a working copy kept in a
 * subfolder (a git worktree), from the nearest parent folder that has `shared/standards/dcc`.
 */
function schemaPath(): string {
  if (process.env.BANDLIGHT_DCC_SCHEMA_DIR) return path.resolve(ROOT, process.env.BANDLIGHT_DCC_SCHEMA_DIR, 'dcc.xsd')
  const beside = path.resolve(ROOT, '../shared/standards/dcc/dcc.xsd')
  for (let dir = path.dirname(ROOT); ; dir = path.dirname(dir)) {
    const candidate = path.join(dir, 'shared/standards/dcc/dcc.xsd')
    if (fs.existsSync(candidate)) return candidate
    if (path.dirname(dir) === dir) return beside
  }
}

export const DCC_SCHEMA = schemaPath()

export const hasXmllint = (() => {
  try {
    execFileSync('which', ['xmllint'], { stdio: 'ignore' })
    return true
  }
  catch {
    return false
  }
})()

/**
 * `xmllint --noout --schema dcc.xsd file.xml` on the bytes: `valid` when xmllint exits 0 and says
 * "validates"; `output` is what xmllint printed (its verdict, or the errors with line numbers).
 */
export function validateDcc(xml: Uint8Array | string, name = 'dcc.xml'): { valid: boolean, output: string } {
  if (!fs.existsSync(DCC_SCHEMA)) throw new Error(`The DCC schema is not at ${DCC_SCHEMA}: place PTB's dcc.xsd and SI_Format.xsd in ../shared/standards/dcc/ beside the repository (or set BANDLIGHT_DCC_SCHEMA_DIR)`)
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'bandlight-dcc-'))
  const file = path.join(dir, name)
  fs.writeFileSync(file, xml)
  try {
    const r = spawnSync('xmllint', ['--noout', '--nonet', '--schema', DCC_SCHEMA, file], { encoding: 'utf8' })
    const output = `${r.stdout}${r.stderr}`.trim()
    return { valid: r.status === 0 && output.endsWith(`${file} validates`), output }
  }
  finally {
    fs.rmSync(dir, { recursive: true, force: true })
  }
}
