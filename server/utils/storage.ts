import { resolve } from 'node:path'
import type { Driver } from 'unstorage'
import fsLiteDriver from 'unstorage/drivers/fs-lite'
import s3Driver from 'unstorage/drivers/s3'

/**
 * Where uploads live: `useStorage('uploads')`, mounted at start (server/plugins/03.storage.ts).
 * - default: the local filesystem under TIGHTWELL_UPLOADS_DIR (default .data/uploads)
 * - TIGHTWELL_STORAGE=s3: any S3-compatible service through unstorage's s3 driver
 *   (TIGHTWELL_S3_ENDPOINT, TIGHTWELL_S3_BUCKET, TIGHTWELL_S3_REGION, TIGHTWELL_S3_ACCESS_KEY_ID,
 *   TIGHTWELL_S3_SECRET_ACCESS_KEY).
 */
export function uploadsDriver(env: NodeJS.ProcessEnv = process.env): { driver: Driver, description: string } {
  if ((env.TIGHTWELL_STORAGE ?? 'fs') === 's3') {
    const missing = ['TIGHTWELL_S3_ENDPOINT', 'TIGHTWELL_S3_BUCKET', 'TIGHTWELL_S3_ACCESS_KEY_ID', 'TIGHTWELL_S3_SECRET_ACCESS_KEY'].filter(k => !env[k])
    if (missing.length) throw new Error(`Tightwell: TIGHTWELL_STORAGE=s3 needs ${missing.join(', ')}`)
    return {
      driver: s3Driver({
        endpoint: env.TIGHTWELL_S3_ENDPOINT!,
        bucket: env.TIGHTWELL_S3_BUCKET!,
        region: env.TIGHTWELL_S3_REGION || 'us-east-1',
        accessKeyId: env.TIGHTWELL_S3_ACCESS_KEY_ID!,
        secretAccessKey: env.TIGHTWELL_S3_SECRET_ACCESS_KEY!,
      }),
      description: `s3 ${env.TIGHTWELL_S3_ENDPOINT}/${env.TIGHTWELL_S3_BUCKET}`,
    }
  }
  const base = resolve(env.TIGHTWELL_UPLOADS_DIR || '.data/uploads')
  return { driver: fsLiteDriver({ base }), description: `filesystem ${base}` }
}

let mounted = false

/** The uploads storage, mounted on first use when the plugin has not run yet (tests of utils). */
export function uploadsStorage() {
  if (!mounted) {
    useStorage().mount('uploads', uploadsDriver().driver)
    mounted = true
  }
  return useStorage('uploads')
}
