import { evidenceKinds, formatBytes, type EvidenceKind } from '#shared/evidence/kinds'

export interface UploadItem {
  id: number
  name: string
  size: number
  sent: number
  startedAt: number
  /** When the last byte was answered: the speed shown stops there. */
  finishedAt?: number
  state: 'sending' | 'done' | 'failed' | 'cancelled'
  message: string
  sha256?: string
  xhr?: XMLHttpRequest
}

/**
 * Uploads files one request each with XMLHttpRequest, which reports upload progress (fetch does
 * not): the fields go first, then the file, as the server expects.
 */
export function useUploads(eventId: Ref<string>, onDone: () => void) {
  const items = ref<UploadItem[]>([])
  let next = 1
  function send(file: File, kind: EvidenceKind, targets: Record<string, string | number | undefined>) {
    const item = reactive<UploadItem>({
      id: next++,
      name: file.name,
      size: file.size,
      sent: 0,
      startedAt: Date.now(),
      state: 'sending',
      message: '',
    })
    items.value.unshift(item)
    if (file.size > evidenceKinds[kind].maxBytes) {
      Object.assign(item, {
        state: 'failed',
        message: `over the limit of ${formatBytes(evidenceKinds[kind].maxBytes)} for a `
          + `${evidenceKinds[kind].label.toLowerCase()}`,
      })
      return
    }
    const body = new FormData()
    body.append('kind', kind)
    for (const [k, v] of Object.entries(targets)) if (v !== undefined && v !== '') body.append(k, String(v))
    body.append('file', file, file.name)
    const xhr = new XMLHttpRequest()
    item.xhr = xhr
    xhr.open('POST', `/api/events/${eventId.value}/evidence`)
    // The request carries the form's fields and boundaries as well as the file: its share of the file, never
    // more than the file itself (a bar past 100 % read as a fault).
    xhr.upload.onprogress = (e) => {
      const share = e.lengthComputable && e.total > 0 ? e.loaded / e.total : 0
      item.sent = Math.min(item.size, Math.round(share * item.size))
    }
    xhr.onload = () => {
      let res: { sha256?: string, message?: string, data?: { issues?: { path: string, message: string }[] } } = {}
      try {
        res = JSON.parse(xhr.responseText)
      }
      catch {
        /* not JSON */
      }
      item.finishedAt = Date.now()
      if (xhr.status === 201) {
        Object.assign(item, { state: 'done', sent: item.size, sha256: res.sha256 })
        onDone()
      }
      else
        Object.assign(item, {
          state: 'failed',
          message:
            res.data?.issues?.map(i => `${fieldLabel(i.path)} ${i.message}`).join('; ')
            ?? res.message
            ?? `refused (${xhr.status})`,
        })
    }
    xhr.onerror = () =>
      Object.assign(item, { state: 'failed', message: 'the connection dropped; nothing was kept' })
    xhr.onabort = () => Object.assign(item, { state: 'cancelled', message: 'cancelled; nothing was kept' })
    xhr.send(body)
  }
  const cancel = (item: UploadItem) => item.xhr?.abort()
  return { items, send, cancel }
}

/** Speed and time left of an upload, for its progress line. */
export function uploadFigures(item: UploadItem, now: number) {
  const seconds = Math.max(0.001, ((item.finishedAt ?? now) - item.startedAt) / 1000)
  const rate = item.sent / seconds
  const left = rate > 0 ? (item.size - item.sent) / rate : Infinity
  return {
    percent: item.size ? Math.min(100, Math.floor((item.sent / item.size) * 100)) : 100,
    rate: `${formatBytes(rate)}/s`,
    left: Number.isFinite(left) ? `${Math.ceil(left)} s left` : '',
  }
}
