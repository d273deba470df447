import { readdirSync } from 'node:fs'
import { join, relative, resolve } from 'node:path'

/** Every server route as "METHOD /api/path", from the files under server/api (named by method). */
export function routeFiles(): string[] {
  const dir = resolve(import.meta.dirname, '../../server/api')
  const walk = (d: string): string[] => readdirSync(d, { withFileTypes: true })
    .flatMap(e => (e.isDirectory() ? walk(join(d, e.name)) : [join(d, e.name)]))
  return walk(dir).map((f) => {
    const m = /^(.*?)\.(get|post|patch|put|delete)\.ts$/.exec(relative(dir, f))
    if (!m) throw new Error(`route file without a method in its name: ${f}`)
    const path = `/api/${m[1]!.replace(/(^|\/)index$/, '')}`.replace(/\/$/, '')
    return `${m[2]!.toUpperCase()} ${path}`
  })
}
