// npm run verify -- dossier.pdf --keys keys.json   (or --keys https://trapline.example.org/api/seal)
// Checks a Trapline dossier with only the installation's published public keys: no database, no server.
// The keys are what GET /api/seal answers (current and retired); the PDF's own signature is checked
// against the certificates listed there, the Ed25519 seal against the keys, each attached file against
// the sealed manifest. Prints each part with its verdict; exits 0 when all hold, 1 when not, 2 on misuse.
import { readFileSync } from 'node:fs'
import { parseArgs } from 'node:util'
import { checkDossierFile, type PublishedKey } from '../server/utils/dossier/file-check'

async function main() {
  const { values, positionals } = parseArgs({ options: { keys: { type: 'string' } }, allowPositionals: true })
  const [file] = positionals
  if (!file || !values.keys) {
    console.error('usage: npm run verify -- dossier.pdf --keys keys.json|https://…/api/seal')
    return 2
  }
  const keysText = /^https?:\/\//.test(values.keys)
    ? await (await fetch(values.keys)).text()
    : readFileSync(values.keys, 'utf8')
  const published = JSON.parse(keysText) as { keys?: PublishedKey[] }
  if (!Array.isArray(published.keys) || !published.keys.length) {
    console.error(`${values.keys} holds no keys (expected the answer of GET /api/seal)`)
    return 2
  }
  const check = await checkDossierFile(new Uint8Array(readFileSync(file)), published.keys)
  if (check.unreadable) {
    console.log(`✕ ${file}: ${check.unreadable}`)
    return 1
  }
  const sig = check.pdfSignature
  const line = (ok: boolean, name: string, detail = '') => console.log(`${ok ? '✓' : '✕'} ${name}${detail ? `: ${detail}` : ''}`)
  for (const item of check.items) {
    if (item.name === 'PDF signature') {
      line(item.ok, 'PDF signature (whole file)', item.ok
        ? `valid, certificate ${sig.subject?.replaceAll('\n', ', ')}, key ${sig.byPublishedKey!.keyId}`
        : sig.problem ?? 'not valid')
    }
    else if (item.name === 'manifest.json') {
      line(item.ok, 'Ed25519 seal over manifest.json', item.ok
        ? `valid, key ${check.sealKey!.keyId}${check.sealKey!.retiredAt ? ' (retired since)' : ''}`
        : 'no published key seals this manifest')
    }
    else {
      line(item.ok, item.name, item.ok ? 'matches the sealed manifest' : 'does not match what was sealed')
    }
  }
  const intact = check.items.every(i => i.ok)
  console.log(intact
    ? 'INTACT: the file is as sealed. Whether it is the latest version and how it was decided, ask the issuing '
    + 'installation\'s verification page.'
    : 'NOT INTACT')
  return intact ? 0 : 1
}

main().then(code => process.exit(code), (e: Error) => {
  console.error(e.message)
  process.exit(2)
})
