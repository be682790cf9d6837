import { fileTypeFromBuffer } from 'file-type'

/** The audio formats Barsmith takes, recognised by their content, never by the file name. */
export const AUDIO_FORMATS = {
  wav: { label: 'WAV', mime: 'audio/wav', ext: 'wav' },
  mp3: { label: 'MP3', mime: 'audio/mpeg', ext: 'mp3' },
  flac: { label: 'FLAC', mime: 'audio/flac', ext: 'flac' },
  ogg: { label: 'OGG/Vorbis', mime: 'audio/ogg', ext: 'ogg' },
} as const

export type AudioFormat = keyof typeof AUDIO_FORMATS

export const ACCEPTED_FORMATS_TEXT = 'WAV, MP3, FLAC or OGG/Vorbis'

/** Bytes file-type needs to see to tell these formats apart. */
export const SNIFF_BYTES = 4100

/**
 * The format of a file from its first bytes (magic numbers through the `file-type`
 * detector), or null for anything Barsmith does not accept (Opus in Ogg included).
 */
export async function detectAudioFormat(head: Uint8Array): Promise<AudioFormat | null> {
  const type = await fileTypeFromBuffer(head)
  if (!type) return null
  if (type.ext === 'wav') return 'wav'
  if (type.ext === 'mp3') return 'mp3'
  if (type.ext === 'flac') return 'flac'
  if (type.ext === 'ogg' && isVorbisInOgg(head)) return 'ogg'
  return null
}

// file-type calls any unknown Ogg stream "ogg"; the first packet of a Vorbis stream says "\x01vorbis".
function isVorbisInOgg(head: Uint8Array): boolean {
  const text = Buffer.from(head.buffer, head.byteOffset, Math.min(head.length, 512)).toString('latin1')
  return text.includes('\x01vorbis')
}

/**
 * What a scratch take may be: what browsers record (MediaRecorder writes Opus in WebM in
 * Chromium, Opus in Ogg in Firefox) and the beat formats, all recognised by content.
 */
export const SCRATCH_FORMATS = {
  ...AUDIO_FORMATS,
  webm: { label: 'WebM/Opus', mime: 'audio/webm', ext: 'webm' },
  opus: { label: 'Ogg/Opus', mime: 'audio/ogg', ext: 'opus' },
} as const

export type ScratchFormat = keyof typeof SCRATCH_FORMATS

export const SCRATCH_FORMATS_TEXT = 'WebM or Ogg with Opus (what browsers record), WAV, MP3, FLAC or OGG/Vorbis'

/** The format of a scratch take from its first bytes, or null when it is not one Barsmith takes. */
export async function detectScratchFormat(head: Uint8Array): Promise<ScratchFormat | null> {
  const beat = await detectAudioFormat(head)
  if (beat) return beat
  const type = await fileTypeFromBuffer(head)
  if (type?.ext === 'opus') return 'opus'
  if (type?.ext === 'webm' && isOpusAudioInWebm(head)) return 'webm'
  return null
}

// file-type calls every WebM "video/webm"; a recording of a voice has an Opus track (codec id
// A_OPUS, Matroska codec specs) and no video track in its first bytes.
function isOpusAudioInWebm(head: Uint8Array): boolean {
  const text = Buffer.from(head.buffer, head.byteOffset, head.length).toString('latin1')
  return text.includes('A_OPUS') && !/V_(?:VP8|VP9|AV1|MPEG4|MPEGH)/.test(text)
}
