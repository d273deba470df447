// A local fake of an S3-compatible object store (s3rver, from npm) for the cluster demo and the tests:
//   node scripts/s3-fake.mjs --port 4569 --dir .data/s3 --bucket trapline-evidence
import { mkdirSync } from 'node:fs'
import { parseArgs } from 'node:util'
import S3rver from 's3rver'

const { values } = parseArgs({
  options: { port: { type: 'string', default: '4569' }, dir: { type: 'string', default: '.data/s3' }, bucket: { type: 'string', default: 'trapline-evidence' } },
})
mkdirSync(values.dir, { recursive: true })
const server = new S3rver({
  port: Number(values.port), address: '127.0.0.1', silent: true, directory: values.dir,
  configureBuckets: [{ name: values.bucket, configs: [] }],
})
await server.run()
console.log(`[s3-fake] listening on http://127.0.0.1:${values.port}, bucket ${values.bucket}`)
const stop = async () => {
  await server.close()
  process.exit(0)
}
process.on('SIGTERM', stop)
process.on('SIGINT', stop)
