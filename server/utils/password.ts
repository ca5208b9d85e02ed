/**
 * Password hashing: scrypt through @adonisjs/hash with its default parameters — the same scheme and
 * stored format (PHC string) that nuxt-auth-utils' hashPassword uses, so hashes made here and there
 * check against each other. Usable outside the server too (the demo seed).
 */
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'

let hash: Hash | undefined

function hasher(): Hash {
  hash ??= new Hash(new Scrypt({}))
  return hash
}

export function makePasswordHash(password: string): Promise<string> {
  return hasher().make(password)
}

export function passwordMatches(hashed: string, password: string): Promise<boolean> {
  return hasher().verify(hashed, password)
}
