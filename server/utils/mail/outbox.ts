import { and, asc, eq, isNull, lt } from 'drizzle-orm'

/** Writes mail to the outbox, then tries to send it; what fails is retried by the outbox plugin. */
export async function queueMail(
  mails: { to: string, subject: string, text: string, attachmentSha256?: string, attachmentName?: string }[],
) {
  if (!mails.length) return { queued: 0, sent: 0 }
  const rows = await useDb().insert(tables.mailOutbox).values(mails).returning({ id: tables.mailOutbox.id })
  const sent = await deliver(rows.map(r => r.id))
  return { queued: rows.length, sent }
}

/** Sends the given (or every pending) outbox mail; returns how many went out. */
export async function deliver(ids?: number[]) {
  const { mailOutbox } = tables
  const pending = await useDb()
    .select()
    .from(mailOutbox)
    .where(and(isNull(mailOutbox.sentAt), lt(mailOutbox.tries, 50)))
    .orderBy(asc(mailOutbox.id))
    .limit(50)
  let sent = 0
  for (const m of pending.filter(p => !ids || ids.includes(p.id))) {
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
        .set({ sentAt: new Date(), tries: m.tries + 1, lastError: null })
        .where(eq(mailOutbox.id, m.id))
      sent++
    }
    catch (e) {
      await useDb()
        .update(mailOutbox)
        .set({ tries: m.tries + 1, lastError: (e as Error).message })
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
