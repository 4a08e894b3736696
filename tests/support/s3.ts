import { rmSync } from 'node:fs'
import { AwsClient } from 'aws4fetch'
import { inject } from 'vitest'
import { S3_FAKE_BUCKET, S3_FAKE_KEY, S3_FAKE_SECRET, startS3Fake } from '../../scripts/s3-fake.mjs'

// The local S3-compatible server (s3rver, scripts/s3-fake.mjs) on a free port: the e2e-s3 project starts
// one for its run (s3GlobalSetup) and points the servers its files start at it (useS3ForServers).

declare module 'vitest' {
  export interface ProvidedContext { s3Endpoint: string }
}

/** globalSetup of the e2e-s3 project: one server for the run, stopped at the end. */
export async function s3GlobalSetup({ provide }: { provide: (key: 's3Endpoint', value: string) => void }) {
  const fake = await startS3Fake({ dir: `.data/s3-test-${process.pid}` })
  provide('s3Endpoint', fake.endpoint)
  return async () => {
    await fake.stop()
    rmSync(fake.dir, { recursive: true, force: true })
  }
}

/** setupFiles of the e2e-s3 project: the server setup() starts next keeps its files in the bucket. */
export async function useS3ForServers() {
  const endpoint = inject('s3Endpoint')
  Object.assign(process.env, {
    NUXT_UPLOADS_DRIVER: 's3', NUXT_UPLOADS_S3_ENDPOINT: endpoint, NUXT_UPLOADS_S3_REGION: 'us-east-1',
    NUXT_UPLOADS_S3_BUCKET: S3_FAKE_BUCKET, NUXT_UPLOADS_S3_ACCESS_KEY_ID: S3_FAKE_KEY, NUXT_UPLOADS_S3_SECRET_ACCESS_KEY: S3_FAKE_SECRET,
  })
}

/** Keys in the bucket the servers use (NUXT_UPLOADS_S3_*), under a prefix, read through the S3 API. */
export async function s3Keys(prefix: string): Promise<string[]> {
  const env = process.env
  const aws = new AwsClient({ accessKeyId: env.NUXT_UPLOADS_S3_ACCESS_KEY_ID!, secretAccessKey: env.NUXT_UPLOADS_S3_SECRET_ACCESS_KEY!, service: 's3', region: env.NUXT_UPLOADS_S3_REGION || 'us-east-1' })
  const res = await aws.fetch(`${env.NUXT_UPLOADS_S3_ENDPOINT}/${env.NUXT_UPLOADS_S3_BUCKET}?list-type=2&prefix=${encodeURIComponent(prefix)}`)
  if (!res.ok) throw new Error(`listing the bucket answered ${res.status}`)
  return [...(await res.text()).matchAll(/<Key>([^<]+)<\/Key>/g)].map(m => m[1]!.slice(prefix.length))
}
