import { describe, expect, it } from 'vitest'
import { detectAudioFormat, detectScratchFormat } from '../../server/utils/audio/formats'
import { encodeWav16 } from '../../server/utils/audio/wav'

// The first page of an Ogg stream holding Opus: the Ogg page header (RFC 3533 §6) with one
// segment, then the identification header "OpusHead" (RFC 7845 §5.1), 19 bytes.
function oggOpusHead(): Uint8Array {
  const head = Buffer.alloc(27 + 1 + 19)
  head.write('OggS', 0, 'latin1')
  head[5] = 0x02 // beginning of stream
  head[26] = 1 // one segment
  head[27] = 19
  head.write('OpusHead', 28, 'latin1')
  head[36] = 1 // version
  head[37] = 1 // one channel
  head.writeUInt16LE(312, 38) // pre-skip
  head.writeUInt32LE(48_000, 40) // input sample rate
  return head
}

describe('scratch take formats (by content, through the npm file-type detector)', () => {
  it('takes Opus in Ogg, which beats do not', async () => {
    expect(await detectScratchFormat(oggOpusHead())).toBe('opus')
    expect(await detectAudioFormat(oggOpusHead())).toBeNull()
  })

  it('takes the beat formats and refuses text, whatever its name', async () => {
    const wav = encodeWav16([new Float32Array(4800)], 48_000)
    expect(await detectScratchFormat(wav)).toBe('wav')
    expect(await detectScratchFormat(Buffer.from('(yeah) not audio at all, just words\n'.repeat(50)))).toBeNull()
  })
})
