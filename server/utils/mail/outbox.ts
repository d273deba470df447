import { and, asc, desc, eq, gt, inArray, isNull, sql } from 'drizzle-orm'

/**
 * Writes mail to the outbox, then tries to send it; what fails is retried by the outbox plugin. With
 * `wait: false` the answer does not wait for the mail server (its speed or failure tells nothing).
 */
export async function queueMail(
  mails: { to: string, subject: string, text: string, attachmentSha256?: string, attachmentName?: string }[],
  options: { wait?: boolean } = {},
) {
  if (!mails.length) return { queued: 0, sent: 0 }
  const rows = await useDb().insert(tables.mailOutbox).values(mails).returning({ id: tables.mailOutbox.id })
  const ids = rows.map(r => r.id)
  if (options.wait === false) {
    deliver(ids).catch(() => {})
    return { queued: rows.length, sent: 0 }
  }
  const sent = await deliver(ids)
  return { queued: rows.length, sent }
}

/**
 * Claims pending mail for this process: each row is leased for two minutes under
 * `FOR UPDATE SKIP LOCKED`, so the retry timer, the request that queued it and other app servers
 * never send the same message twice.
 */
async function claim(ids?: number[]) {
  const only = ids ? sql`and id in ${sql.raw(`(${ids.map(Number).join(',') || 'null'})`)}` : sql``
  const { rows } = await useDb().execute<{ id: number }>(sql`
    update mail_outbox set claimed_until = now() + interval '2 minutes'
    where id in (
      select id from mail_outbox
      where sent_at is null and tries < ${MAX_TRIES} and (claimed_until is null or claimed_until < now()) ${only}
      order by id limit 50
      for update skip locked
    )
    returning id`)
  if (!rows.length) return []
  return useDb().select().from(tables.mailOutbox)
    .where(inArray(tables.mailOutbox.id, rows.map(r => r.id)))
    .orderBy(asc(tables.mailOutbox.id))
}

/** Tries before a message is given up and shown to the administrator as undelivered. */
export const MAX_TRIES = 50

/** Sends the given (or every pending) outbox mail that this process claims; returns how many went out. */
export async function deliver(ids?: number[]) {
  const { mailOutbox } = tables
  let sent = 0
  for (const m of await claim(ids)) {
    try {
      const attachments = m.attachmentSha256
        ? [
            {
              filename: m.attachmentName ?? 'attachment',
              content: await streamToBuffer(await useBlobStore().open(m.attachmentSha256)),
              contentType: 'application/pdf',
            },
          ]
        : undefined
      await sendMail({ to: m.to, subject: m.subject, text: m.text, attachments })
      await useDb()
        .update(mailOutbox)
        .set({ sentAt: new Date(), tries: m.tries + 1, lastError: null, claimedUntil: null })
        .where(eq(mailOutbox.id, m.id))
      sent++
    }
    catch (e) {
      await useDb()
        .update(mailOutbox)
        .set({ tries: m.tries + 1, lastError: (e as Error).message, claimedUntil: null })
        .where(eq(mailOutbox.id, m.id))
    }
  }
  return sent
}

async function streamToBuffer(stream: NodeJS.ReadableStream) {
  const chunks: Buffer[] = []
  for await (const c of stream) chunks.push(c as Buffer)
  return Buffer.concat(chunks)
}

/** Mail not sent yet that has failed at least once, newest first: addresses and subjects, not the text. */
export function undeliveredMail() {
  const { mailOutbox } = tables
  return useDb()
    .select({
      id: mailOutbox.id,
      to: mailOutbox.to,
      subject: mailOutbox.subject,
      tries: mailOutbox.tries,
      lastError: mailOutbox.lastError,
      createdAt: mailOutbox.createdAt,
      givenUp: sql<boolean>`${mailOutbox.tries} >= ${MAX_TRIES}`,
    })
    .from(mailOutbox)
    .where(and(isNull(mailOutbox.sentAt), gt(mailOutbox.tries, 0)))
    .orderBy(desc(mailOutbox.id))
    .limit(200)
}
