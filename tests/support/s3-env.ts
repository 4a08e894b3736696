import { useS3ForServers } from './s3'

await useS3ForServers()
