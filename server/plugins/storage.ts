import fsDriver from 'unstorage/drivers/fs'
import s3Driver from 'unstorage/drivers/s3'

// Where certificates, photos and job files (a label sheet's PDF) are kept, chosen when the server starts:
// local disk under .data/uploads (NUXT_UPLOADS_DRIVER=disk, the default), or an S3-compatible bucket
// (NUXT_UPLOADS_DRIVER=s3 with NUXT_UPLOADS_S3_ENDPOINT, _REGION, _BUCKET, _ACCESS_KEY_ID and
// _SECRET_ACCESS_KEY; path-style URLs, signed with AWS Signature V4). Several app servers need the bucket.
export default defineNitroPlugin(() => {
  const { driver, s3 } = useRuntimeConfig().uploads as { driver: string, s3: { endpoint: string, region: string, bucket: string, accessKeyId: string, secretAccessKey: string } }
  if (driver === 's3') {
    if (!s3.endpoint || !s3.bucket || !s3.accessKeyId || !s3.secretAccessKey) {
      throw new Error('Uploads are set to S3 (NUXT_UPLOADS_DRIVER=s3) but NUXT_UPLOADS_S3_ENDPOINT, _BUCKET, _ACCESS_KEY_ID or _SECRET_ACCESS_KEY is missing.')
    }
    useStorage().mount('uploads', s3Driver({ ...s3 }))
  }
  else if (driver === 'disk' || !driver) {
    useStorage().mount('uploads', fsDriver({ base: './.data/uploads' }))
  }
  else {
    throw new Error(`NUXT_UPLOADS_DRIVER is "${driver}"; use disk or s3.`)
  }
})
