import { and, asc, eq, inArray } from 'drizzle-orm'
import type { BriefingInput, SignOnInput } from '#shared/schemas/officials'

export async function createBriefing(eventId: number, input: BriefingInput, userId: number) {
  const [row] = await useDb().insert(tables.briefings)
    .values({ eventId, title: input.title, heldAt: new Date(input.heldAt), notes: input.notes, createdBy: userId })
    .returning()
  return row!
}

/** The riders of the event's entries, each with the entries they ride: who a riders' briefing expects. */
async function ridersOf(eventId: number) {
  const rows = await useDb().select({ id: tables.riders.id, name: tables.riders.name, teamId: tables.riders.teamId,
    team: tables.teams.name, entryId: tables.entries.id })
    .from(tables.entries)
    .innerJoin(tables.riders, eq(tables.riders.id, tables.entries.riderId))
    .innerJoin(tables.teams, eq(tables.teams.id, tables.entries.teamId))
    .where(eq(tables.entries.eventId, eventId))
    .orderBy(asc(tables.riders.name), asc(tables.entries.id))
  const out = new Map<number, { id: number, name: string, teamId: number, team: string, entryIds: number[] }>()
  for (const { entryId, ...r } of rows) {
    const held = out.get(r.id) ?? { ...r, entryIds: [] }
    held.entryIds.push(entryId)
    out.set(r.id, held)
  }
  return [...out.values()]
}

/** Every briefing of the event, newest first, with who signed on (how and when) and which riders did not. */
export async function briefingsOf(eventId: number) {
  const list = await useDb().select().from(tables.briefings).where(eq(tables.briefings.eventId, eventId))
    .orderBy(asc(tables.briefings.heldAt))
  const ids = list.map(b => b.id)
  const signOns = ids.length
    ? await useDb().select({ s: tables.briefingSignOns, sha256: tables.signatures.contentSha256 })
        .from(tables.briefingSignOns)
        .innerJoin(tables.signatures, eq(tables.signatures.id, tables.briefingSignOns.signatureId))
        .where(inArray(tables.briefingSignOns.briefingId, ids)).orderBy(asc(tables.briefingSignOns.id))
    : []
  const riders = await ridersOf(eventId)
  return {
    riders,
    briefings: list.reverse().map((b) => {
      const mine = signOns.filter(x => x.s.briefingId === b.id).map(x => ({ ...x.s, sha256: x.sha256 }))
      return { ...b, signOns: mine, missing: riders.filter(r => !mine.some(s => s.riderId === r.id)) }
    }),
  }
}

/**
 * One attendee signs on to a briefing. On their own phone: their password or passkey, as themselves or as
 * the rider of an entry of their team (the typed name is the rider's). On the organiser's device: the rider
 * types their name and draws, in person; the organiser's session witnesses it.
 */
export async function signOnBriefing(
  briefingId: number,
  input: SignOnInput,
  user: { id: number, name: string },
  access: { teamIds: number[], organiser: boolean },
  signedAt?: Date,
) {
  const [briefing] = await useDb().select().from(tables.briefings).where(eq(tables.briefings.id, briefingId))
  if (!briefing) throw notFound('No such briefing')
  const inPerson = input.onDevice === 'organiser'
  if (inPerson && !access.organiser) throw forbidden('Only the organiser\'s device takes sign-ons in person')
  if (inPerson && input.riderId === undefined) throw fieldInvalid('riderId', 'choose the rider who signs on')
  if (inPerson && !input.drawingPng) throw fieldInvalid('drawingPng', 'the rider draws a signature on the device')
  const rider = input.riderId === undefined ? null : await riderAt(briefing.eventId, input.riderId)
  if (rider && !inPerson && !access.teamIds.includes(rider.teamId)) {
    throw fieldInvalid('riderId', 'is not a rider of your team: sign on as yourself, or at the organiser\'s device')
  }
  const proof = inPerson ? { method: 'in-person' as const } : await signerProof(user.id, input)
  const name = rider?.name ?? user.name
  return useDb().transaction(async (tx) => {
    // Sign-ons to one briefing one at a time: the check below then sees every one before it.
    await tx.select({ id: tables.briefings.id }).from(tables.briefings).where(eq(tables.briefings.id, briefingId))
      .for('update')
    const [taken] = await tx.select({ id: tables.briefingSignOns.id }).from(tables.briefingSignOns)
      .where(and(eq(tables.briefingSignOns.briefingId, briefingId), rider
        ? eq(tables.briefingSignOns.riderId, rider.id)
        : eq(tables.briefingSignOns.userId, user.id))).limit(1)
    if (taken) throw conflict(`${name} has already signed on to this briefing`)
    const [row] = await tx.insert(tables.briefingSignOns).values({
      briefingId, riderId: rider?.id ?? null, userId: rider ? null : user.id, name,
      onDevice: inPerson ? 'organiser' : 'own', ...(signedAt ? { signedAt } : {}),
    }).returning()
    const content = {
      eventId: briefing.eventId, briefing: briefing.id, title: briefing.title, heldAt: briefing.heldAt.toISOString(),
      attendee: name, riderId: rider?.id ?? null, onDevice: row!.onDevice, witness: inPerson ? user.name : null,
    }
    const signature = await insertSignature(tx, {
      proof, kind: 'briefing-sign-on', subjectId: row!.id, eventId: briefing.eventId, signerId: user.id,
      typedName: input.typedName, nameNote: input.nameNote, nameOnFile: rider?.name, content,
      drawingPng: input.drawingPng ?? null, ...(signedAt ? { signedAt } : {}),
    })
    const [signed] = await tx.update(tables.briefingSignOns).set({ signatureId: signature.id })
      .where(eq(tables.briefingSignOns.id, row!.id)).returning()
    return signed!
  })
}

async function riderAt(eventId: number, riderId: number) {
  const [r] = await useDb().select({ id: tables.riders.id, name: tables.riders.name, teamId: tables.riders.teamId })
    .from(tables.riders).innerJoin(tables.entries, eq(tables.entries.riderId, tables.riders.id))
    .where(and(eq(tables.riders.id, riderId), eq(tables.entries.eventId, eventId))).limit(1)
  if (!r) throw fieldInvalid('riderId', 'is not a rider of an entry of this event')
  return r
}
