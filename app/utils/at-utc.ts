/** "2026-05-02 18:00 UTC": the same on the server and in every browser, so pages hydrate cleanly. */
export function atUtc(value: string | Date | null | undefined): string {
  if (!value) return ''
  const iso = typeof value === 'string' ? value : value.toISOString()
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`
}
