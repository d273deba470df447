/** The words a form uses for the fields a server may name, where they are not plain from the key. */
const labels: Record<string, string> = {
  'typedName': 'Full name, typed —',
  'nameNote': 'Why the typed name differs —',
  'password': 'Password —',
  'passkey': 'Passkey —',
  'entryId': 'Entry —',
  'startedAt': 'Start time —',
  'windSpeedMs': 'Wind speed —',
  'windFromDeg': 'Wind direction —',
  'temperatureC': 'Temperature —',
  'pressureHpa': 'Pressure —',
  'expectedCurrentId': 'The time shown —',
  '(body)': 'The form —',
}

/** "entryId" → "Entry —", "calibrationExpires" → "Calibration expires —", "traps.2.label" → "Traps 3, label —". */
export function fieldLabel(path: string): string {
  if (labels[path]) return labels[path]
  const words = path.split('.').map((part, i) => {
    if (/^\d+$/.test(part)) return String(Number(part) + 1)
    const w = part.replace(/Id$/, '').replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase()
    return i === 0 ? w.charAt(0).toUpperCase() + w.slice(1) : w
  })
  return `${words.join(', ')} —`
}
