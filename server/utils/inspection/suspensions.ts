import { eq } from 'drizzle-orm'
import type { SuspensionInput } from '#shared/schemas/inspection'

type SuspensionRow = typeof tables.machineSuspensions.$inferSelect

/** What a scrutineer signs in suspending a machine. */
export const suspensionContent = (s: SuspensionRow, scrutineerName: string) => ({
  suspension: s.id,
  machine: s.machineId,
  reason: s.reason,
  scrutineer: scrutineerName,
})

/**
 * Suspends a machine, signed: every entry it makes stops running until an inspection signed after
 * this clears it again. Signed records are never edited; a suspension is lifted only by that inspection.
 */
export async function suspendMachine(
  eventId: number,
  machineId: number,
  input: SuspensionInput,
  user: { id: number, name: string },
) {
  const [machine] = await useDb().select({ teamId: tables.machines.teamId }).from(tables.machines)
    .where(eq(tables.machines.id, machineId))
  if (machine) {
    await refuseConflicted(useDb(), { eventId, userId: user.id }, [machine.teamId], 'suspend this team\'s machine')
  }
  const proof = await signerProof(user.id, input)
  return useDb().transaction(async (tx) => {
    const [row] = await tx.insert(tables.machineSuspensions)
      .values({ eventId, machineId, reason: input.reason, scrutineerId: user.id })
      .returning()
    const sig = await insertSignature(tx, {
      proof,
      kind: 'suspension',
      subjectId: row!.id,
      eventId,
      signerId: user.id,
      typedName: input.typedName,
      nameNote: input.nameNote,
      content: suspensionContent(row!, user.name),
    })
    const [signed] = await tx.update(tables.machineSuspensions).set({ signatureId: sig.id })
      .where(eq(tables.machineSuspensions.id, row!.id)).returning()
    return signed!
  })
}
