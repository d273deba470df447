import { constants, createReadStream } from 'node:fs'
import { access, mkdir, readdir, rename, rm, stat } from 'node:fs/promises'
import { join, resolve } from 'node:path'
import type { Readable } from 'node:stream'
import { S3BlobStore } from './blob-store-s3'

/** Where evidence files live, addressed by their SHA-256. One small interface, two drivers. */
export interface BlobStore {
  has(sha256: string): Promise<boolean>
  /** Moves a complete temporary file into place under its hash; the temporary file is gone after. */
  put(sha256: string, tmpPath: string, size: number, mediaType: string): Promise<void>
  open(sha256: string): Promise<Readable>
  /** Throws when the store cannot be written: the readiness check of an app server. */
  ready(): Promise<void>
  remove(sha256: string): Promise<void>
  list(): AsyncIterable<string>
  /** When the file was stored; null if it is not there. */
  storedAt(sha256: string): Promise<Date | null>
}

export class LocalBlobStore implements BlobStore {
  constructor(private dir: string) {}
  private path(sha: string) {
    return join(this.dir, sha.slice(0, 2), sha)
  }

  async ready() {
    await mkdir(this.dir, { recursive: true })
    await access(this.dir, constants.W_OK)
  }

  async has(sha: string) {
    return stat(this.path(sha)).then(
      () => true,
      () => false,
    )
  }

  async put(sha: string, tmpPath: string) {
    await mkdir(join(this.dir, sha.slice(0, 2)), { recursive: true })
    if (await this.has(sha)) await rm(tmpPath, { force: true })
    else await rename(tmpPath, this.path(sha)) // same file system: atomic, never a half file in place
  }

  async open(sha: string) {
    return createReadStream(this.path(sha))
  }

  async storedAt(sha: string) {
    return stat(this.path(sha)).then(s => s.mtime, () => null)
  }

  async remove(sha: string) {
    await rm(this.path(sha), { force: true })
  }

  async* list() {
    for (const d of await readdir(this.dir).catch(() => [] as string[])) {
      for (const f of await readdir(join(this.dir, d)).catch(() => [] as string[]))
        if (/^[0-9a-f]{64}$/.test(f)) yield f
    }
  }
}

let store: BlobStore | undefined

export function dataDir() {
  return resolve(useRuntimeConfig().dataDir || '.data')
}

/**
 * Temporary uploads, on the same file system as the local store so that a finished file is renamed into
 * place; one folder per app server (NUXT_SERVER_ID), so that a server's start sweeps only its own.
 */
export const uploadTmpDir = () =>
  join(dataDir(), 'uploads-tmp', String(useRuntimeConfig().serverId || 'main').replace(/[^\w.-]/g, '_'))

export function useBlobStore(): BlobStore {
  if (!store) {
    const { storage } = useRuntimeConfig()
    store
      = storage.driver === 's3'
        ? new S3BlobStore({
            endpoint: storage.s3.endpoint,
            region: storage.s3.region,
            bucket: storage.s3.bucket,
            accessKeyId: storage.s3.accessKeyId,
            secretAccessKey: storage.s3.secretAccessKey,
          })
        : new LocalBlobStore(join(dataDir(), 'evidence'))
  }
  return store
}
