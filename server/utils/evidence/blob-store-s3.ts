import { rm } from 'node:fs/promises'
import { createReadStream } from 'node:fs'
import type { Readable } from 'node:stream'
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  S3Client,
} from '@aws-sdk/client-s3'
import { Upload } from '@aws-sdk/lib-storage'

export interface S3Options {
  endpoint?: string
  region: string
  bucket: string
  accessKeyId: string
  secretAccessKey: string
}

/** Evidence in an S3-compatible store, for several app servers; objects are keyed by SHA-256. */
export class S3BlobStore {
  private client: S3Client
  constructor(private options: S3Options) {
    this.client = new S3Client({
      region: options.region,
      endpoint: options.endpoint || undefined,
      forcePathStyle: !!options.endpoint,
      credentials: { accessKeyId: options.accessKeyId, secretAccessKey: options.secretAccessKey },
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    })
  }

  private key = (sha: string) => `evidence/${sha}`

  /** Whether the bucket answers: the readiness check of an app server. */
  async ready() {
    await this.client.send(new HeadBucketCommand({ Bucket: this.options.bucket }))
  }

  async has(sha: string) {
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.options.bucket, Key: this.key(sha) }))
      return true
    }
    catch (e) {
      if ((e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return false
      throw e
    }
  }

  /** Streams the temporary file up in parts of 16 MB, two at a time: never the whole file in memory. */
  async put(sha: string, tmpPath: string, size: number, mediaType: string) {
    try {
      if (!(await this.has(sha))) {
        await new Upload({
          client: this.client,
          params: {
            Bucket: this.options.bucket,
            Key: this.key(sha),
            Body: createReadStream(tmpPath),
            ContentType: mediaType,
            ContentLength: size,
          },
          partSize: 16 * 1024 * 1024,
          queueSize: 2,
        }).done()
      }
    }
    finally {
      await rm(tmpPath, { force: true })
    }
  }

  async open(sha: string) {
    const r = await this.client.send(new GetObjectCommand({ Bucket: this.options.bucket, Key: this.key(sha) }))
    return r.Body as Readable
  }

  async remove(sha: string) {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.options.bucket, Key: this.key(sha) }))
  }

  async storedAt(sha: string) {
    try {
      const head = await this.client.send(new HeadObjectCommand({ Bucket: this.options.bucket, Key: this.key(sha) }))
      return head.LastModified ?? null
    }
    catch (e) {
      if ((e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return null
      throw e
    }
  }

  async* list() {
    let token: string | undefined
    do {
      const page = await this.client.send(
        new ListObjectsV2Command({ Bucket: this.options.bucket, Prefix: 'evidence/', ContinuationToken: token }),
      )
      for (const o of page.Contents ?? []) if (o.Key) yield o.Key.slice('evidence/'.length)
      token = page.NextContinuationToken
    } while (token)
  }
}
