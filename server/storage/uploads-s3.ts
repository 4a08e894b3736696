import s3Driver from 'unstorage/drivers/s3'

// Included only in builds made with BAYWARD_UPLOADS_DRIVER=s3 (see nuxt.config.ts): mounts the
// 'uploads' storage on an S3-compatible bucket, with the credentials read at start from
// NUXT_UPLOADS_S3_ENDPOINT, NUXT_UPLOADS_S3_REGION, NUXT_UPLOADS_S3_BUCKET,
// NUXT_UPLOADS_S3_ACCESS_KEY_ID and NUXT_UPLOADS_S3_SECRET_ACCESS_KEY.
export default defineNitroPlugin(() => {
  const { s3 } = useRuntimeConfig().uploads as { s3: { endpoint: string, region: string, bucket: string, accessKeyId: string, secretAccessKey: string } }
  if (!s3.endpoint || !s3.bucket || !s3.accessKeyId || !s3.secretAccessKey) {
    throw new Error('Uploads are set to S3 but NUXT_UPLOADS_S3_ENDPOINT, _BUCKET, _ACCESS_KEY_ID or _SECRET_ACCESS_KEY is missing.')
  }
  useStorage().mount('uploads', s3Driver({ ...s3 }))
})
