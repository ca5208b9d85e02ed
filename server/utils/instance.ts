/**
 * This server process's name among the instances that share a database: it claims outbox rows,
 * runs calculation jobs and holds task leases under it. No Nitro auto-imports.
 */
import crypto from 'node:crypto'
import os from 'node:os'

/** `host:pid:random`, fixed for the life of the process. */
export const INSTANCE_ID = `${os.hostname()}:${process.pid}:${crypto.randomBytes(3).toString('hex')}`
