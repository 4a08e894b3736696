export const S3_FAKE_BUCKET: string
export const S3_FAKE_KEY: string
export const S3_FAKE_SECRET: string

export interface S3Fake {
  endpoint: string
  dir: string
  /** NUXT_UPLOADS_DRIVER=s3 and the NUXT_UPLOADS_S3_* settings that point a server at it */
  env: Record<string, string>
  stop: () => Promise<void>
}

export function startS3Fake(options?: { port?: number, dir?: string, bucket?: string }): Promise<S3Fake>
