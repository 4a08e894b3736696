export { s3GlobalSetup as default } from './s3'
