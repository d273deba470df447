// The yardstick for upload throughput: a bare Node http server that writes the request body to
// disk while computing its SHA-256, and nothing else.
import { createHash } from 'node:crypto'
import { createWriteStream } from 'node:fs'
import { createServer } from 'node:http'
import { Transform } from 'node:stream'
import { pipeline } from 'node:stream/promises'

const [port, file] = [Number(process.argv[2]), process.argv[3]]
createServer(async (req, res) => {
  const hash = createHash('sha256')
  const hashing = new Transform({
    transform(chunk, _encoding, done) {
      hash.update(chunk)
      done(null, chunk)
    },
  })
  await pipeline(req, hashing, createWriteStream(file))
  res.end(hash.digest('hex'))
}).listen(port, '127.0.0.1', () => console.log('ready'))
