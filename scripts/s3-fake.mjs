// A local S3-compatible server standing in for a bucket (s3rver): objects are kept under <dir>, on
// 127.0.0.1 only. The demo starts one when NUXT_UPLOADS_DRIVER=s3 names no endpoint; the tests start
// their own on a free port.
// Usage: node scripts/s3-fake.mjs   (BAYWARD_S3_FAKE_PORT, default 4569; BAYWARD_S3_FAKE_DIR, default .data/s3)
import { mkdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import S3rver from 's3rver'

// s3rver takes any key pair; these are what it documents.
export const S3_FAKE_BUCKET = 'bayward'
export const S3_FAKE_KEY = 'S3RVER'
export const S3_FAKE_SECRET = 'S3RVER'

/** Starts the server (port 0: a free one) and answers its endpoint and the settings that point Bayward at it. */
export async function startS3Fake({ port = 0, dir = '.data/s3', bucket = S3_FAKE_BUCKET } = {}) {
  const folder = resolve(dir)
  mkdirSync(folder, { recursive: true })
  const server = new S3rver({ port, address: '127.0.0.1', silent: true, directory: folder, configureBuckets: [{ name: bucket }] })
  const address = await server.run()
  const endpoint = `http://127.0.0.1:${address.port}`
  return {
    endpoint,
    dir: folder,
    env: {
      NUXT_UPLOADS_DRIVER: 's3', NUXT_UPLOADS_S3_ENDPOINT: endpoint, NUXT_UPLOADS_S3_REGION: 'us-east-1',
      NUXT_UPLOADS_S3_BUCKET: bucket, NUXT_UPLOADS_S3_ACCESS_KEY_ID: S3_FAKE_KEY, NUXT_UPLOADS_S3_SECRET_ACCESS_KEY: S3_FAKE_SECRET,
    },
    stop: () => server.close(),
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const fake = await startS3Fake({ port: Number(process.env.BAYWARD_S3_FAKE_PORT ?? 4569), dir: process.env.BAYWARD_S3_FAKE_DIR ?? '.data/s3' })
  console.log(`s3-fake: listening on ${fake.endpoint}, bucket ${S3_FAKE_BUCKET}, keeping objects in ${fake.dir}`)
  const stop = () => fake.stop().then(() => process.exit(0))
  process.on('SIGTERM', stop)
  process.on('SIGINT', stop)
}
