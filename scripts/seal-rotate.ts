// npm run seal:rotate [-- --dir /path/to/seal]
// Retires the seal's current key set (moved to retired/<key id>/ in the same folder) and makes a new one,
// issued by the same certificate authority. Every app server then restarts on the new set; on start it
// registers the new key and marks the old one retired, and dossiers sealed before still verify with it.
// Default folder: $NUXT_SEAL_DIR, else $NUXT_DATA_DIR/seal, else .data/seal.
import { join, resolve } from 'node:path'
import { parseArgs } from 'node:util'
import { rotateKeySet } from '../server/utils/signing/seal-keys'

const { values } = parseArgs({ options: { dir: { type: 'string' } } })
const dir = resolve(values.dir ?? process.env.NUXT_SEAL_DIR ?? join(process.env.NUXT_DATA_DIR ?? '.data', 'seal'))
const { retired, current } = rotateKeySet(dir, join(dir, 'authority'))
console.log(`${retired ? `retired key ${retired}; ` : ''}new key ${current} in ${dir}`)
console.log('Restart every app server on this folder: each registers the new key at start.')
