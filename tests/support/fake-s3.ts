import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { CreateBucketCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3'
import S3rver from 's3rver'
import type { S3Settings } from '../../server/utils/file-drivers/s3'

// The SDK warns once per process that its releases after January 2027 need Node 22 (DEVELOPERS.md).
process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true'

export interface FakeS3 {
  /** Settings for the s3 driver, pointing at the fake. */
  settings: S3Settings
  /** The same as NUXT_STORAGE_* variables, for an app server. */
  env: Record<string, string>
  /** Keys of the objects in the bucket under the settings' prefix. */
  keys: () => Promise<string[]>
  /** Where the fake keeps its objects on disk (nothing of the app's own storage). */
  directory: string
  stop: () => Promise<void>
}

/**
 * An S3 stand-in (s3rver) on a free loopback port with a throwaway folder and one bucket, so the
 * s3 driver runs against the S3 protocol without any network beyond this machine.
 */
export async function startFakeS3(prefix = 'mantissa-test/'): Promise<FakeS3> {
  const directory = await mkdtemp(join(tmpdir(), 'mantissa-s3-'))
  const server = new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory })
  const { port } = await server.run()
  const settings: S3Settings = {
    bucket: 'mantissa-originals',
    region: 'us-east-1',
    endpoint: `http://127.0.0.1:${port}`,
    forcePathStyle: true,
    // s3rver's fixed credentials.
    accessKeyId: 'S3RVER',
    secretAccessKey: 'S3RVER',
    prefix,
  }
  const client = new S3Client({ ...settings, credentials: { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey } })
  await client.send(new CreateBucketCommand({ Bucket: settings.bucket }))
  return {
    settings,
    env: {
      NUXT_STORAGE_DRIVER: 's3',
      NUXT_STORAGE_BUCKET: settings.bucket,
      NUXT_STORAGE_REGION: settings.region,
      NUXT_STORAGE_ENDPOINT: settings.endpoint,
      NUXT_STORAGE_FORCE_PATH_STYLE: 'true',
      NUXT_STORAGE_ACCESS_KEY_ID: settings.accessKeyId,
      NUXT_STORAGE_SECRET_ACCESS_KEY: settings.secretAccessKey,
      NUXT_STORAGE_PREFIX: prefix,
    },
    async keys() {
      const listed = await client.send(new ListObjectsV2Command({ Bucket: settings.bucket, Prefix: prefix }))
      return (listed.Contents ?? []).map(object => object.Key!)
    },
    directory,
    async stop() {
      client.destroy()
      await server.close()
      await rm(directory, { recursive: true, force: true })
    },
  }
}
