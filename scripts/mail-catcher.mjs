// The local mail catcher: an SMTP server on loopback that keeps every message it receives as a
// JSON file, and a small web inbox to read them (HTML at /, JSON at /api/messages).
// Usage: node scripts/mail-catcher.mjs --smtp PORT --http PORT --dir FOLDER
import { createServer } from 'node:http'
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { parseArgs } from 'node:util'
import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'

const { values } = parseArgs({ options: { smtp: { type: 'string' }, http: { type: 'string' }, dir: { type: 'string' } } })
const smtpPort = Number(values.smtp ?? 1025)
const httpPort = Number(values.http ?? 1080)
const dir = values.dir ?? '.data/mail'
mkdirSync(dir, { recursive: true })

let counter = readdirSync(dir).length
const smtp = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS'],
  logger: false,
  onData(stream, _session, done) {
    simpleParser(stream).then((mail) => {
      const id = `${Date.now()}-${++counter}`
      const message = {
        id,
        receivedAt: new Date().toISOString(),
        from: mail.from?.text ?? '',
        to: mail.to ? [].concat(mail.to).map(a => a.text).join(', ') : '',
        subject: mail.subject ?? '',
        text: mail.text ?? '',
        attachments: (mail.attachments ?? []).map(a => ({ filename: a.filename, contentType: a.contentType, size: a.size, content: a.content.toString('base64') })),
      }
      writeFileSync(join(dir, `${id}.json`), JSON.stringify(message))
      done()
    }, done)
  },
})

const list = () => readdirSync(dir).filter(f => f.endsWith('.json')).sort().reverse()
  .map(f => JSON.parse(readFileSync(join(dir, f), 'utf8')))
const esc = s => String(s).replace(/[&<>"]/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;' })[c])

const http = createServer((req, res) => {
  const url = new URL(req.url ?? '/', 'http://localhost')
  if (url.pathname === '/api/messages') {
    const summary = list().map(({ attachments, ...m }) => ({ ...m, attachments: attachments.map(a => ({ ...a, content: undefined })) }))
    res.writeHead(200, { 'content-type': 'application/json' }).end(JSON.stringify(summary))
    return
  }
  const attachment = /^\/messages\/([\w-]+)\/attachments\/(\d+)$/.exec(url.pathname)
  if (attachment) {
    const m = list().find(x => x.id === attachment[1])
    const a = m?.attachments[Number(attachment[2])]
    if (!a) return res.writeHead(404).end('not found')
    res.writeHead(200, { 'content-type': a.contentType, 'content-disposition': `attachment; filename="${a.filename}"` })
    return res.end(Buffer.from(a.content, 'base64'))
  }
  const rows = list().map(m => `<article><h2>${esc(m.subject)}</h2><p><b>To:</b> ${esc(m.to)} · <b>From:</b> ${esc(m.from)} · ${esc(m.receivedAt)}</p>
<pre>${esc(m.text)}</pre>${m.attachments.map((a, i) => `<p><a href="/messages/${m.id}/attachments/${i}">${esc(a.filename)}</a> (${a.size} bytes)</p>`).join('')}</article>`).join('<hr>')
  res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' })
  res.end(`<!doctype html><meta charset="utf-8"><title>Trapline mail catcher</title>
<style>body{font:16px/1.5 system-ui,sans-serif;max-width:60rem;margin:2rem auto;padding:0 1rem}pre{white-space:pre-wrap;background:#f3f1ea;padding:1rem}</style>
<h1>Mail caught on this machine (${list().length})</h1><p>Nothing here left the machine.</p>${rows || '<p>No mail yet.</p>'}`)
})

smtp.listen(smtpPort, '127.0.0.1', () => {
  http.listen(httpPort, '127.0.0.1', () => console.log(`mail catcher: smtp 127.0.0.1:${smtpPort}, inbox http://127.0.0.1:${httpPort}`))
})
const stop = () => {
  smtp.close(() => {})
  http.close()
  process.exit(0)
}
process.on('SIGTERM', stop)
process.on('SIGINT', stop)
