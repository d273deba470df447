import { describe, expect, it } from 'vitest'
import { uploadFigures, type UploadItem } from '../../app/composables/useUploads'
import { formatBytes } from '#shared/evidence/kinds'

const item = (over: Partial<UploadItem>): UploadItem =>
  ({ id: 1, name: 'log.csv', size: 10 * 1024 * 1024, sent: 0, startedAt: 0, state: 'sending', message: '', ...over })

describe('an upload\'s progress line', () => {
  it('never shows more than 100 %, even when the request carried more than the file', () => {
    expect(uploadFigures(item({ sent: 11 * 1024 * 1024 }), 1000).percent).toBe(100)
    expect(uploadFigures(item({ sent: 5 * 1024 * 1024 }), 1000).percent).toBe(50)
  })
  it('gives the speed in whole bytes, kB or MB per second, and stops the clock when done', () => {
    // 5 MiB in 2 s is 2.5 MiB/s (1 MB = 1024 × 1024 bytes here, as the size limits are written).
    expect(uploadFigures(item({ sent: 5 * 1024 * 1024 }), 2000).rate).toBe('2.5 MB/s')
    expect(uploadFigures(item({ size: 1000, sent: 333 }), 1000).rate).toBe('333 B/s')
    expect(formatBytes(333.3333)).toBe('333 B')
    const done = item({ sent: 10 * 1024 * 1024, state: 'done', finishedAt: 4000 })
    expect(uploadFigures(done, 60_000).rate).toBe('2.5 MB/s')
  })
})
