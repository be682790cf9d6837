// The cadence room in Chromium as the demo writer: the hook of "Night Bus Home" on slots, one
// syllable moved, played over the beat (the AudioContext's scheduled tick times checked
// against the slot times), and the placement kept across a reload and a later version.
// It works on the demo's second draft ("Hook, slower take", picked with ?draft=) and never changes
// its words, so the main draft's history and the two drafts' comparison stay as seeded.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Browser, Locator } from 'playwright-core'
import { hydrated, launchBrowser, newPage, screenshot, signInDemo } from '../support/browser'
import { asDemo, type ApiClient } from '../support/http'

let browser: Browser
let close: () => Promise<void>
let writer: ApiClient
beforeAll(async () => {
  ({ browser, close } = await launchBrowser())
  writer = await asDemo('writer')
})
afterAll(async () => close?.())

/** Slot of each syllable of a row, read from the page: index → slot. */
async function slotsOf(row: Locator): Promise<number[]> {
  const cells = await row.locator('[data-syllable]').evaluateAll(els => els.map(e => [Number(e.getAttribute('data-syllable')), Number(e.getAttribute('data-slot'))] as const))
  const slots: number[] = []
  for (const [i, s] of cells) slots[i] = s
  return slots
}

describe('cadence room in Chromium', () => {
  it('shows the hook on slots, moves a syllable, plays it on the grid and keeps it', async () => {
    const [crew] = (await writer.get('/api/crews')).body
    const song = (await writer.get(`/api/crews/${crew.id}/songs`)).body.find((s: any) => s.title === 'Night Bus Home')
    const { grid } = (await writer.get(`/api/songs/${song.id}`)).body
    const draftId = (await writer.get(`/api/songs/${song.id}/drafts`)).body.find((d: any) => d.name === 'Hook, slower take').id as string
    const hook = (await writer.get(`/api/songs/${song.id}/sections`)).body.find((s: any) => s.kind === 'hook')
    expect([hook.startBar, hook.endBar]).toEqual([5, 12])

    const { page, external, pageErrors } = await newPage(browser, { width: 1400, height: 900 })
    await signInDemo(page, 'writer')
    const url = `/songs/${song.id}/cadence?section=${hook.id}&draft=${draftId}`
    await page.goto(url)
    await hydrated(page)
    const rows = page.locator('[data-testid^="cadence-line-"]')
    await rows.nth(7).waitFor()
    expect(await rows.count()).toBe(8)
    const bar5 = page.locator('[data-testid^="cadence-line-"][data-bar="5"]')
    const before = await slotsOf(bar5)
    // Bar 5 has 10 sung syllables (CMU Pronouncing Dictionary counts, as on the vocal map).
    expect(before).toHaveLength(10)
    // The automatic placement keeps order and gives each syllable its own slot.
    for (let i = 1; i < before.length; i++) expect(before[i]!).toBeGreaterThan(before[i - 1]!)
    await screenshot(page, 'cadence-hook')

    // Move one: the first syllable with a free slot after it goes one slot later (keyboard).
    const k = before.findIndex((s, i) => (before[i + 1] ?? 16) > s + 1)
    expect(k).toBeGreaterThanOrEqual(0)
    await bar5.getByTestId(`syllable-${k}`).click()
    await page.keyboard.press('ArrowRight')
    const moved = [...before]
    moved[k] = before[k]! + 1
    await page.waitForFunction(([sel, i, slot]) => document.querySelector(`${sel} [data-slot="${slot}"][data-syllable="${i}"]`) !== null, [`[data-testid^="cadence-line-"][data-bar="5"]`, k, moved[k]] as const)
    expect(await slotsOf(bar5)).toEqual(moved)
    await bar5.getByTestId('cadence-dirty').waitFor()

    // Drag: bar 6's last syllable onto the bar's last slot.
    const bar6 = page.locator('[data-testid^="cadence-line-"][data-bar="6"]')
    const six = await slotsOf(bar6)
    const last = six.length - 1
    if (six[last] !== 15) {
      await bar6.getByTestId(`syllable-${last}`).dragTo(bar6.locator('[data-slot="15"]'))
      await page.waitForFunction(sel => document.querySelector(`${sel} [data-slot="15"][data-syllable]`) !== null, '[data-testid^="cadence-line-"][data-bar="6"]')
    }
    expect(await slotsOf(bar6)).toEqual([...six.slice(0, last), 15])

    // Play the hook: every tick sits at bar start + slot × slot length on the audio clock.
    await page.getByTestId('cadence-play').click()
    await page.waitForFunction(() => (window as any).__barsmithCadence?.ticks?.length > 0)
    const schedule = await page.evaluate(() => (window as any).__barsmithCadence)
    expect(schedule.state).toBe('running')
    expect(schedule.beat).toBe(true)
    // Slot time = offset + ((bar − 1) × slots per bar + slot) × 60 / BPM × beats per bar / slots per bar (common practice), 16ths.
    const slotMs = (bar: number, slot: number) => grid.offsetMs + ((bar - 1) * 16 + slot) * (60 / grid.bpm) * grid.beatsPerBar / 16 * 1000
    expect(schedule.startMs).toBe(Math.round(slotMs(5, 0)))
    const expected: number[] = []
    for (let i = 0; i < 8; i++) {
      const row = rows.nth(i)
      const bar = Number(await row.getAttribute('data-bar'))
      for (const s of await slotsOf(row)) expected.push(slotMs(bar, s))
    }
    expected.sort((a, b) => a - b)
    const firstPass = schedule.ticks.filter((t: any) => t.pass === 0)
    expect(firstPass).toHaveLength(expected.length)
    firstPass.forEach((t: any, i: number) => {
      expect(t.at).toBeGreaterThan(t.scheduledAt)
      const heard = schedule.startMs + (t.at - schedule.contextStart) * 1000
      expect(Math.abs(heard - expected[i]!)).toBeLessThanOrEqual(5)
    })
    const movedTick = firstPass.find((t: any) => t.index === k && Math.abs(t.slotMs - slotMs(5, moved[k]!)) < 1)
    expect(movedTick).toBeTruthy()
    await screenshot(page, 'cadence-playing')
    await page.getByTestId('cadence-stop').click()

    // Save: a new version of the draft; a reload shows the moved placement.
    await page.getByTestId('cadence-save').click()
    await page.getByTestId('cadence-save-message').getByText(/Saved as version \d+\./).waitFor()
    await page.reload()
    await hydrated(page)
    await rows.nth(7).waitFor()
    expect(await slotsOf(bar5)).toEqual(moved)
    await bar5.getByText('placed by hand').waitFor()

    // A later save that sends no cadence (here a note on the same words) keeps the hook's placement.
    const drafts = (await writer.get(`/api/songs/${song.id}/drafts`)).body
    const head = (await writer.get(`/api/versions/${drafts.find((d: any) => d.id === draftId).headVersionId}`)).body
    const bar5Line = head.lines.find((l: any) => l.bar === 5)
    expect(head.cadence[bar5Line.id].slots).toEqual(moved)
    const next = await writer.post(`/api/drafts/${draftId}/versions`, { baseVersionId: head.id, lines: head.lines, note: 'Checked the hook against the beat' })
    expect(next.status).toBe(201)
    const after = (await writer.get(`/api/versions/${next.body.id}`)).body
    expect(after.cadence[bar5Line.id].slots).toEqual(moved)
    await page.reload()
    await hydrated(page)
    await rows.nth(7).waitFor()
    expect(await slotsOf(bar5)).toEqual(moved)
    await screenshot(page, 'cadence-after-reload')

    // The sheet of that version prints the hook's cadence under its lines.
    await page.goto(`/songs/${song.id}/sheet?version=${next.body.id}&cadence=5-12`)
    await hydrated(page)
    await page.getByTestId('sheet-cadence').nth(7).waitFor()
    const printed = page.locator('[data-testid="sheet-line"][data-bar="5"] [data-testid="sheet-cadence"]')
    const row = (await printed.textContent())!.replace(/\|/g, '')
    expect(moved.every(s => /[xX]/.test(row[s]!))).toBe(true)
    await screenshot(page, 'cadence-on-sheet')

    expect(pageErrors).toEqual([])
    expect(external).toEqual([])
  })
})
