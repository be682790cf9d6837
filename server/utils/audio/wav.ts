/** 16-bit PCM WAV bytes from planar float samples (clipped to ±1). */
export function encodeWav16(channelData: Float32Array[], sampleRate: number): Buffer {
  const channels = channelData.length
  const frames = channelData[0]?.length ?? 0
  const dataBytes = frames * channels * 2
  const buf = Buffer.alloc(44 + dataBytes)
  buf.write('RIFF', 0, 'ascii')
  buf.writeUInt32LE(36 + dataBytes, 4)
  buf.write('WAVE', 8, 'ascii')
  buf.write('fmt ', 12, 'ascii')
  buf.writeUInt32LE(16, 16)
  buf.writeUInt16LE(1, 20)
  buf.writeUInt16LE(channels, 22)
  buf.writeUInt32LE(sampleRate, 24)
  buf.writeUInt32LE(sampleRate * channels * 2, 28)
  buf.writeUInt16LE(channels * 2, 32)
  buf.writeUInt16LE(16, 34)
  buf.write('data', 36, 'ascii')
  buf.writeUInt32LE(dataBytes, 40)
  const out = new Int16Array(buf.buffer, buf.byteOffset + 44, frames * channels)
  for (let i = 0; i < frames; i++) {
    for (let c = 0; c < channels; c++) {
      const v = Math.max(-1, Math.min(1, channelData[c]![i]!))
      out[i * channels + c] = Math.round(v * 32767)
    }
  }
  return buf
}
