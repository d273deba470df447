import { createHash, randomUUID } from 'node:crypto'
import { createWriteStream } from 'node:fs'
import { mkdir, rm } from 'node:fs/promises'
import { join } from 'node:path'
import { Transform } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import type { IncomingMessage, ServerResponse } from 'node:http'
import type { H3Event } from 'h3'
import multer from 'multer'
import { evidenceKinds, fileNameProblem, type EvidenceKind } from '#shared/evidence/kinds'

export interface StagedFile {
  path: string
  size: number
  sha256: string
  head: Buffer
  originalname: string
}

const HEAD_BYTES = 4100
const LIMIT_KEYS: Record<EvidenceKind, string> = {
  'survey-certificate': 'survey',
  'calibration-certificate': 'calibration',
  'scale-certificate': 'scale',
  'rider-licence': 'licence',
  'photo': 'photo',
  'video': 'video',
  'data-log': 'dataLog',
  'other-document': 'other',
}

export function limitFor(kind: EvidenceKind): number {
  const configured = Number(
    (useRuntimeConfig().evidenceLimits as Record<string, number | string>)[LIMIT_KEYS[kind]] ?? 0,
  )
  return configured > 0 ? configured : evidenceKinds[kind].maxBytes
}

/** The most bytes an upload may have, and what sets that limit (said when it is passed). */
export interface UploadLimit {
  bytes: number
  what: string
}

export class UploadError extends Error {
  constructor(
    public statusCode: number,
    public field: string,
    message: string,
  ) {
    super(message)
  }
}

/**
 * A multer storage engine that streams the file to a temporary file while computing its SHA-256
 * and size, keeps its first bytes for the type check, and stops at the kind's size limit. The
 * form fields before the file are checked first by `beforeFile`.
 */
class HashingStagingStorage implements multer.StorageEngine {
  constructor(private beforeFile: (fields: Record<string, unknown>) => Promise<UploadLimit>) {}

  _handleFile(
    req: IncomingMessage & { body?: Record<string, unknown> },
    file: Express.Multer.File,
    cb: (error?: unknown, info?: Partial<StagedFile>) => void,
  ) {
    const tmp = join(uploadTmpDir(), `${randomUUID()}.part`)
    ;(async () => {
      const problem = fileNameProblem(file.originalname)
      if (problem) throw new UploadError(422, 'file', problem)
      // The fields as they stand when the file begins: any field parsed later is not among them.
      const { bytes: limit, what } = await this.beforeFile({ ...(req.body ?? {}) })
      await mkdir(uploadTmpDir(), { recursive: true })
      const hash = createHash('sha256')
      let size = 0
      const head: Buffer[] = []
      let headLength = 0
      const meter = new Transform({
        highWaterMark: 1 << 20,
        transform(chunk: Buffer, _enc, done) {
          size += chunk.length
          if (size > limit)
            return done(new UploadError(413, 'file', `is over ${what}: ${limit} bytes`))
          hash.update(chunk)
          if (headLength < HEAD_BYTES) {
            head.push(chunk.subarray(0, HEAD_BYTES - headLength))
            headLength += Math.min(chunk.length, HEAD_BYTES - headLength)
          }
          done(null, chunk)
        },
      })
      try {
        await pipeline(file.stream, meter, createWriteStream(tmp, { flags: 'wx', highWaterMark: 1 << 20 }))
      }
      catch (e) {
        file.stream.resume()
        await rm(tmp, { force: true })
        throw e
      }
      return { path: tmp, size, sha256: hash.digest('hex'), head: Buffer.concat(head) }
    })().then(
      info => cb(null, info),
      (e) => {
        file.stream.resume()
        cb(e)
      },
    )
  }

  _removeFile(
    _req: IncomingMessage,
    file: Express.Multer.File & Partial<StagedFile>,
    cb: (error: Error | null) => void,
  ) {
    rm(file.path ?? '', { force: true }).then(() => cb(null), cb)
  }
}

/** Runs multer on the raw request; resolves with the staged file and the form fields. */
export function receiveUpload(event: H3Event, beforeFile: (fields: Record<string, unknown>) => Promise<UploadLimit>) {
  return receiveUploadWith(
    event,
    beforeFile,
    Math.max(...Object.keys(evidenceKinds).map(k => limitFor(k as EvidenceKind))),
  )
}

function receiveUploadWith(
  event: H3Event,
  beforeFile: (fields: Record<string, unknown>) => Promise<UploadLimit>,
  maxBytes = 6 * 1024 * 1024 * 1024,
) {
  const handler = multer({
    storage: new HashingStagingStorage(beforeFile),
    preservePath: true, // so that a name with a path is refused, not silently shortened
    defParamCharset: 'utf8',
    limits: { files: 1, fields: 12, fieldSize: 2000, parts: 14, fileSize: maxBytes },
  }).single('file')
  const req = event.node.req as IncomingMessage & {
    file?: StagedFile & Express.Multer.File
    body?: Record<string, unknown>
  }
  return new Promise<{ file: StagedFile | null, fields: Record<string, unknown> }>((resolve, reject) => {
    handler(req as never, event.node.res as ServerResponse as never, (err: unknown) => {
      if (err) return reject(toHttpError(err))
      resolve({ file: req.file ?? null, fields: { ...(req.body ?? {}) } })
    })
  })
}

function toHttpError(err: unknown) {
  const issue = (statusCode: number, path: string, message: string) => fieldInvalid(path, message, statusCode)
  if (err instanceof UploadError) return issue(err.statusCode, err.field, err.message)
  if ((err as { statusCode?: number }).statusCode) return err
  const code = (err as { code?: string }).code
  if (code === 'LIMIT_FILE_SIZE') return issue(413, 'file', 'is over the size limit')
  if (code?.startsWith('LIMIT_')) return issue(422, 'file', (err as Error).message)
  if ((err as Error).message === 'Malformed part header')
    return issue(422, 'file', 'the part header is malformed; a file name must not contain control characters')
  return issue(400, 'file', `the upload did not arrive whole: ${(err as Error).message}`)
}

/** The largest PDF the verification page takes: a dossier is a few MB (its evidence travels by hash). */
export const VERIFY_LIMIT = 50 * 1024 * 1024

/** The verification page's upload: a PDF up to 50 MB, streamed to disk, no form fields needed. */
export function receiveVerifyUpload(event: H3Event) {
  return receiveUploadWith(
    event,
    async () => ({ bytes: VERIFY_LIMIT, what: 'the 50 MB a dossier never reaches (they are a few MB)' }),
    VERIFY_LIMIT * 2, // the meter stops the file first, with the reason
  )
}
