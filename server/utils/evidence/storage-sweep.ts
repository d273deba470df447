import { existsSync, readdirSync, rmSync } from 'node:fs'
import { join } from 'node:path'
import { sql } from 'drizzle-orm'

/** Removes what this server's uploads cut off by a crash left in its own staging folder; synchronous, at start. */
export function sweepStaging() {
  const tmp = uploadTmpDir()
  for (const f of existsSync(tmp) ? readdirSync(tmp) : []) rmSync(join(tmp, f), { force: true })
}

/** Removes stored files that no row names and that are older than an hour (see below). */
export async function sweepStorage() {
  await demoSeeded()
  const store = useBlobStore()
  const { rows } = await useDb().execute<{ sha: string }>(
    sql`select sha256 as sha from evidence union select pdf_sha256 from dossiers
      union select public_pdf_sha256 from dossiers where public_pdf_sha256 is not null`,
  )
  const known = new Set(rows.map(r => r.sha))
  const recent = Date.now() - 3600_000
  for await (const sha of store.list()) {
    if (known.has(sha)) continue
    // A file stored in the last hour may be an upload whose row is about to be written (files are
    // stored before their row, so that no connection is held while the bytes move).
    const at = await store.storedAt(sha)
    if (!at || at.getTime() > recent) continue
    // Under the same lock as an upload that is storing this hash, so a file about to get its row stays.
    await useDb().transaction(async (tx) => {
      await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${sha}, 0))`)
      const { rows } = await tx.execute(
        sql`select 1 from evidence where sha256 = ${sha} union all select 1 from dossiers
          where pdf_sha256 = ${sha} or public_pdf_sha256 = ${sha} limit 1`,
      )
      if (!rows.length) await store.remove(sha)
    })
  }
}
