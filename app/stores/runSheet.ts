import { defineStore } from 'pinia'

/** Writes of the timekeeper's run sheet; every action refreshes the sheet afterwards. */
export const useRunSheetStore = defineStore('run-sheet', () => {
  const lastError = ref('')
  const saving = ref(0)
  async function send<T>(url: string, body: Record<string, unknown>): Promise<T> {
    saving.value++
    try {
      return await ($fetch as (u: string, o: object) => Promise<T>)(url, { method: 'POST', body })
    }
    finally {
      saving.value--
    }
  }
  return {
    lastError,
    saving,
    startRun: (eventId: string, body: { entryId: number, direction: 'out' | 'back', startedAt: string }) =>
      send<{ id: number }>(`/api/events/${eventId}/runs`, body),
    enterReading: (runId: number, body: { trapId: number, systemId: number, time: string }) =>
      send(`/api/runs/${runId}/readings`, body),
    correctReading: (readingId: number, body: { time: string, reason: string, expectedCurrentId: number }) =>
      send(`/api/readings/${readingId}/corrections`, body),
    abortRun: (runId: number, reason: string) => send(`/api/runs/${runId}/abort`, { reason }),
    addWeather: (runId: number, body: Record<string, string>) => send(`/api/runs/${runId}/weather`, body),
    importCsv: (eventId: string, body: Record<string, unknown>) =>
      send<{ ok: boolean, written: number }>(`/api/events/${eventId}/imports`, body),
    sign: (attemptId: number, body: { password: string, typedName: string }) =>
      send(`/api/attempts/${attemptId}/signatures`, body),
    reopen: (attemptId: number, body: { password: string, typedName: string, reason: string }) =>
      send(`/api/attempts/${attemptId}/reopen`, body),
  }
})
