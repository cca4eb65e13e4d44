import { createReadStream } from 'node:fs'
import { Readable } from 'node:stream'
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3'
import { Upload } from '@aws-sdk/lib-storage'
import type { FileDriver } from './store'

export interface S3Settings {
  bucket: string
  /** Empty: the SDK's own (AWS_REGION, the shared config file). */
  region: string
  /** Empty: AWS itself; otherwise an S3-compatible store's address. */
  endpoint: string
  forcePathStyle: boolean
  /** Both empty: the SDK's default credential chain (environment, shared files, instance role). */
  accessKeyId: string
  secretAccessKey: string
  /** Put before every key, e.g. "mantissa/" to share a bucket. */
  prefix: string
}

const statusOf = (error: unknown) => (error instanceof S3ServiceException ? error.$metadata.httpStatusCode : undefined)

/** Objects in one S3 bucket (or an S3-compatible store), read as streams and never held whole. */
export function s3Driver(settings: S3Settings): FileDriver {
  const client = new S3Client({
    region: settings.region || undefined,
    endpoint: settings.endpoint || undefined,
    forcePathStyle: settings.forcePathStyle,
    credentials: settings.accessKeyId ? { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey } : undefined,
    // By default the SDK sends streamed bodies aws-chunked with a trailing CRC32, which several
    // S3-compatible stores keep as part of the object. The file's SHA-256 is checked by us, and TLS
    // guards the transfer, so checksums are sent only where an operation requires them.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  })
  const Bucket = settings.bucket
  const prefix = settings.prefix && !settings.prefix.endsWith('/') ? `${settings.prefix}/` : settings.prefix
  const objectKey = (key: string) => prefix + key

  async function exists(key: string) {
    try {
      await client.send(new HeadObjectCommand({ Bucket, Key: objectKey(key) }))
      return true
    }
    catch (error) {
      if (statusOf(error) === 404) return false
      throw error
    }
  }

  return {
    async put(stagedPath, key) {
      if (await exists(key)) return
      // lib-storage sends files past its part size as a multipart upload, a few parts in memory at a time.
      await new Upload({ client, params: { Bucket, Key: objectKey(key), Body: createReadStream(stagedPath), ContentType: 'application/octet-stream' } }).done()
    },
    async open(key, start = 0, end) {
      const Range = start > 0 || end !== undefined ? `bytes=${start}-${end ?? ''}` : undefined
      try {
        const { Body } = await client.send(new GetObjectCommand({ Bucket, Key: objectKey(key), Range }))
        return Body as Readable
      }
      catch (error) {
        // A range that starts at the end (a file that is only a byte-order mark) reads as nothing, as on disk.
        if (statusOf(error) === 416) return Readable.from([])
        throw error
      }
    },
    exists,
    async remove(key) {
      await client.send(new DeleteObjectCommand({ Bucket, Key: objectKey(key) }))
    },
  }
}
