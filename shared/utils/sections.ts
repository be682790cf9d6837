/** Bar ranges of sections: overlap checks and re-arranging, shared by server and client. */
export interface BarRange { id: string, startBar: number, endBar: number }

/** The first section (other than `except`) sharing a bar with `candidate`, or null. */
export function overlapping<T extends BarRange>(sections: readonly T[], candidate: { startBar: number, endBar: number }, except?: string): T | null {
  return sections.find(s => s.id !== except && s.startBar <= candidate.endBar && candidate.startBar <= s.endBar) ?? null
}

/** Number of bars a section spans (both ends included). */
export const barsIn = (s: { startBar: number, endBar: number }) => s.endBar - s.startBar + 1

/**
 * Lays the sections out again in a new order: each keeps its length; they start at the
 * earliest first bar, and the gap that followed the n-th section still follows the n-th.
 * Returns the new ranges in the new order, or null when `order` is not the same set of ids.
 */
export function rearrange<T extends BarRange>(sections: readonly T[], order: readonly string[]): Array<T & { position: number }> | null {
  const byStart = [...sections].sort((a, b) => a.startBar - b.startBar)
  if (order.length !== byStart.length || new Set(order).size !== order.length) return null
  const byId = new Map(byStart.map(s => [s.id, s]))
  if (!order.every(id => byId.has(id))) return null
  const gaps = byStart.map((s, i) => (i + 1 < byStart.length ? byStart[i + 1]!.startBar - s.endBar - 1 : 0))
  let bar = byStart[0]?.startBar ?? 1
  return order.map((id, i) => {
    const s = byId.get(id)!
    const placed = { ...s, startBar: bar, endBar: bar + barsIn(s) - 1, position: i }
    bar = placed.endBar + 1 + gaps[i]!
    return placed
  })
}
