/**
 * Reads the encoder delay and padding that LAME writes in its Xing/Info frame. A decoder
 * that honours it (as browsers and mpg123 do) trims delay + 529 samples at the start and
 * the padding − 529 at the end, so the decoded audio lines up with the encoder's input.
 * Without the tag nothing can be trimmed: the audio then plays 576 + 529 samples late
 * everywhere, and the grid is laid on that decoded timeline.
 */
export interface GaplessInfo {
  frames: number
  samplesPerFrame: number
  delay: number
  padding: number
}

/** The decoder delay of an MPEG-1 Layer III decoder (the polyphase filter bank), in samples. */
export const MP3_DECODER_DELAY = 529

function skipId3(bytes: Uint8Array): number {
  if (bytes.length >= 10 && bytes[0] === 0x49 && bytes[1] === 0x44 && bytes[2] === 0x33) {
    const size = ((bytes[6]! & 0x7F) << 21) | ((bytes[7]! & 0x7F) << 14) | ((bytes[8]! & 0x7F) << 7) | (bytes[9]! & 0x7F)
    return 10 + size + ((bytes[5]! & 0x10) ? 10 : 0)
  }
  return 0
}

/** The LAME tag of the first frame, or null when the file has none. */
export function readGaplessInfo(bytes: Uint8Array): GaplessInfo | null {
  let i = skipId3(bytes)
  const limit = Math.min(bytes.length - 4, i + 65_536)
  while (i < limit && !(bytes[i] === 0xFF && (bytes[i + 1]! & 0xE0) === 0xE0)) i++
  if (i >= limit) return null
  const b1 = bytes[i + 1]!
  const b3 = bytes[i + 3]!
  const mpeg1 = ((b1 >> 3) & 3) === 3
  const layer = (b1 >> 1) & 3
  if (layer !== 1) return null // Layer III only
  const mono = ((b3 >> 6) & 3) === 3
  const sideInfo = mpeg1 ? (mono ? 17 : 32) : (mono ? 9 : 17)
  let p = i + 4 + sideInfo
  const tag = String.fromCharCode(...bytes.subarray(p, p + 4))
  if (tag !== 'Xing' && tag !== 'Info') return null
  const flags = (bytes[p + 4]! << 24) | (bytes[p + 5]! << 16) | (bytes[p + 6]! << 8) | bytes[p + 7]!
  p += 8
  let frames = 0
  if (flags & 1) {
    frames = ((bytes[p]! << 24) | (bytes[p + 1]! << 16) | (bytes[p + 2]! << 8) | bytes[p + 3]!) >>> 0
    p += 4
  }
  if (flags & 2) p += 4
  if (flags & 4) p += 100
  if (flags & 8) p += 4
  const encoder = String.fromCharCode(...bytes.subarray(p, p + 4))
  if (encoder !== 'LAME' && encoder !== 'Lavf' && encoder !== 'Lavc') return null
  const d = p + 21
  if (d + 3 > bytes.length) return null
  const delay = (bytes[d]! << 4) | (bytes[d + 1]! >> 4)
  const padding = ((bytes[d + 1]! & 0x0F) << 8) | bytes[d + 2]!
  return { frames, samplesPerFrame: mpeg1 ? 1152 : 576, delay, padding }
}

/**
 * What to cut from decoded samples so they match the encoder's input, given what the
 * decoder already did: null when nothing is to be cut (no tag, or the decoder trimmed).
 */
export function gaplessTrim(info: GaplessInfo | null, decodedLength: number): { start: number, length: number } | null {
  if (!info || !info.frames) return null
  const full = info.frames * info.samplesPerFrame
  const wanted = full - info.delay - info.padding
  if (wanted <= 0) return null
  // Within a frame of the untrimmed length (with or without the tag frame itself): trim here.
  if (Math.abs(decodedLength - full) <= info.samplesPerFrame) {
    return { start: Math.min(decodedLength, info.delay + MP3_DECODER_DELAY), length: wanted }
  }
  return null
}
