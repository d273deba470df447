import { EVIDENCE_KINDS, type EvidenceKind } from '../constants'

export { EVIDENCE_KINDS, type EvidenceKind }

const MB = 1024 * 1024
const GB = 1024 * MB
const DOCUMENT_TYPES = ['application/pdf', 'image/jpeg', 'image/png']
/** "text" stands for content with no magic bytes that reads as text (CSV and similar logs). */
export const TEXT = 'text'

export interface KindRule {
  label: string
  /** Media types accepted, by what the content's magic bytes say. */
  accepts: string[]
  /** Default size limit in bytes; the server's configuration may change it. */
  maxBytes: number
  /** What it is usually attached to. */
  attachTo: string
}

export const evidenceKinds: Record<EvidenceKind, KindRule> = {
  'survey-certificate': {
    label: 'Course survey certificate',
    accepts: DOCUMENT_TYPES,
    maxBytes: 50 * MB,
    attachTo: 'course',
  },
  'calibration-certificate': {
    label: 'Timing calibration certificate',
    accepts: DOCUMENT_TYPES,
    maxBytes: 50 * MB,
    attachTo: 'timing system',
  },
  'scale-certificate': {
    label: 'Scale certificate',
    accepts: DOCUMENT_TYPES,
    maxBytes: 50 * MB,
    attachTo: 'inspection',
  },
  'rider-licence': { label: 'Rider licence', accepts: DOCUMENT_TYPES, maxBytes: 50 * MB, attachTo: 'entry' },
  'photo': {
    label: 'Photo',
    accepts: ['image/jpeg', 'image/png', 'image/webp', 'image/heic'],
    maxBytes: 50 * MB,
    attachTo: 'inspection item, run or entry',
  },
  'video': {
    label: 'Video',
    accepts: ['video/mp4', 'video/quicktime', 'video/webm', 'video/x-matroska'],
    maxBytes: 4 * GB,
    attachTo: 'run',
  },
  'data-log': {
    label: 'Data log',
    accepts: [TEXT, 'application/zip', 'application/gzip'],
    maxBytes: 2 * GB,
    attachTo: 'run',
  },
  'other-document': {
    label: 'Other document',
    accepts: [...DOCUMENT_TYPES, 'image/webp'],
    maxBytes: 50 * MB,
    attachTo: 'event',
  },
}

/** A file name we store and show: no path separators, no control characters, at most 200 characters. */
export function fileNameProblem(name: string): string | null {
  if (!name || !name.trim()) return 'the file has no name'
  if (/[/\\]/.test(name)) return 'the file name must not contain / or \\'
  // eslint-disable-next-line no-control-regex
  if (/[\u0000-\u001f\u007f]/.test(name)) return 'the file name must not contain control characters'
  if (name === '.' || name === '..') return 'the file name is not valid'
  if (name.length > 200) return 'the file name is longer than 200 characters'
  return null
}

/** What a file name's extension promises; the content's magic bytes must keep the promise. */
const EXTENSIONS: Record<string, string[]> = {
  pdf: ['application/pdf'],
  png: ['image/png'],
  jpg: ['image/jpeg'],
  jpeg: ['image/jpeg'],
  webp: ['image/webp'],
  heic: ['image/heic'],
  mp4: ['video/mp4'],
  mov: ['video/quicktime'],
  webm: ['video/webm'],
  mkv: ['video/x-matroska'],
  csv: [TEXT],
  txt: [TEXT],
  log: [TEXT],
  zip: ['application/zip'],
  gz: ['application/gzip'],
}

export function extensionMismatch(name: string, detected: string): string | null {
  const ext = /\.([a-z0-9]+)$/i.exec(name)?.[1]?.toLowerCase()
  const promised = ext ? EXTENSIONS[ext] : undefined
  if (!promised || promised.includes(detected)) return null
  return `the name ends in .${ext} but the content is ${detected === TEXT ? 'text' : detected}`
}

export const formatBytes = (n: number) =>
  n >= GB
    ? `${(n / GB).toFixed(2)} GB`
    : n >= MB
      ? `${(n / MB).toFixed(1)} MB`
      : n >= 1024
        ? `${(n / 1024).toFixed(0)} kB`
        : `${Math.round(n)} B`
