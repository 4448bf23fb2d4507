import type { H3Event } from 'h3'
import { createError } from 'h3'
import { createHash, randomBytes } from 'node:crypto'
import { createWriteStream } from 'node:fs'
import { mkdir, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { Transform } from 'node:stream'
import { pipeline } from 'node:stream/promises'

/** Largest upload accepted (bytes): TESSERA_MAX_UPLOAD_MB, default 512 MB. */
export function maxUploadBytes(): number {
  return Number(process.env.TESSERA_MAX_UPLOAD_MB ?? 512) * 1024 * 1024
}

export interface ReceivedFile { path: string; bytes: number; sha256: string; cleanup: () => Promise<void> }

/**
 * Streams the raw request body to a temporary file, hashing it on the way, and stops with 413
 * as soon as the cap is passed (the partial file is removed). The caller must call cleanup().
 */
export async function receiveUpload(event: H3Event): Promise<ReceivedFile> {
  const cap = maxUploadBytes()
  const declared = Number(event.node.req.headers['content-length'] ?? 0)
  const tooLarge = () => createError({ statusCode: 413, statusMessage: 'Payload Too Large', message: `The file is larger than the ${Math.round(cap / 1048576)} MB limit.` })
  if (declared > cap) throw tooLarge()
  const dir = join(process.env.TESSERA_UPLOAD_DIR ?? join(tmpdir(), 'tessera-uploads'))
  await mkdir(dir, { recursive: true })
  const path = join(dir, `${Date.now()}-${randomBytes(6).toString('hex')}.upload`)
  const cleanup = () => rm(path, { force: true })
  const hash = createHash('sha256')
  let bytes = 0
  const meter = new Transform({
    transform(chunk: Buffer, _enc, done) {
      bytes += chunk.length
      if (bytes > cap) return done(tooLarge())
      hash.update(chunk)
      done(null, chunk)
    },
  })
  try {
    await pipeline(event.node.req, meter, createWriteStream(path))
  } catch (err) {
    await cleanup()
    if ((err as { statusCode?: number }).statusCode === 413) throw err
    throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'The upload was interrupted; nothing was stored. Try again.' })
  }
  if (bytes === 0) { await cleanup(); throw createError({ statusCode: 400, statusMessage: 'Bad Request', message: 'The file is empty.' }) }
  return { path, bytes, sha256: hash.digest('hex'), cleanup }
}
