/** Second-order IIR sections (RBJ Audio EQ Cookbook coefficients), run in place or by sample. */
export interface Biquad { b0: number, b1: number, b2: number, a1: number, a2: number }

/** Low-pass (Q = 1/√2: Butterworth) at `hz`. */
export function lowpass(hz: number, sampleRate: number, q = Math.SQRT1_2): Biquad {
  const w = (2 * Math.PI * hz) / sampleRate
  const alpha = Math.sin(w) / (2 * q)
  const cos = Math.cos(w)
  const a0 = 1 + alpha
  return { b0: (1 - cos) / 2 / a0, b1: (1 - cos) / a0, b2: (1 - cos) / 2 / a0, a1: (-2 * cos) / a0, a2: (1 - alpha) / a0 }
}

/** High-pass (Butterworth) at `hz`. */
export function highpass(hz: number, sampleRate: number, q = Math.SQRT1_2): Biquad {
  const w = (2 * Math.PI * hz) / sampleRate
  const alpha = Math.sin(w) / (2 * q)
  const cos = Math.cos(w)
  const a0 = 1 + alpha
  return { b0: (1 + cos) / 2 / a0, b1: -(1 + cos) / a0, b2: (1 + cos) / 2 / a0, a1: (-2 * cos) / a0, a2: (1 - alpha) / a0 }
}

/** A cascade of biquads with its own state, fed one sample at a time. */
export class FilterChain {
  private readonly s: Float64Array
  constructor(private readonly stages: Biquad[]) {
    this.s = new Float64Array(stages.length * 2)
  }

  /** Transposed direct form II. */
  next(x: number): number {
    let y = x
    for (let i = 0; i < this.stages.length; i++) {
      const f = this.stages[i]!
      const o = f.b0 * y + this.s[2 * i]!
      this.s[2 * i] = f.b1 * y - f.a1 * o + this.s[2 * i + 1]!
      this.s[2 * i + 1] = f.b2 * y - f.a2 * o
      y = o
    }
    return y
  }
}

/** Zero-phase filtering of a short segment (forward, then backward), so no delay is added. */
export function filtfilt(segment: Float32Array, stages: Biquad[]): Float32Array {
  const out = new Float32Array(segment.length)
  const fwd = new FilterChain(stages)
  for (let i = 0; i < segment.length; i++) out[i] = fwd.next(segment[i]!)
  const back = new FilterChain(stages)
  for (let i = segment.length - 1; i >= 0; i--) out[i] = back.next(out[i]!)
  return out
}
