/**
 * A tiny seeded pseudo-random number generator for the demo-firm generator, so the same seed
 * always gives the same firm history (no `Math.random`, no clock).
 *
 * `mulberry32` is Tommy Ettinger's 32-bit generator (public domain): one 32-bit state word,
 * period 2^32, good enough statistical quality for test data (not for cryptography).
 */

/** A function returning uniform numbers in [0, 1). */
export type Uniform = () => number

/** mulberry32: a uniform [0, 1) generator from a 32-bit integer seed. */
export function mulberry32(seed: number): Uniform {
  let state = seed >>> 0
  return () => {
    state = (state + 0x6d2b79f5) >>> 0
    let t = state
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** Seeded helpers on top of `mulberry32`. Every draw advances the one stream, in call order. */
export class Random {
  private readonly next: Uniform

  constructor(seed: number) {
    this.next = mulberry32(seed)
  }

  /** Uniform in [0, 1). */
  uniform(): number {
    return this.next()
  }

  /** Uniform in [min, max). */
  between(min: number, max: number): number {
    return min + (max - min) * this.next()
  }

  /** Whole number from min to max, both included. */
  int(min: number, max: number): number {
    return min + Math.floor(this.next() * (max - min + 1))
  }

  /** True with probability p. */
  chance(p: number): boolean {
    return this.next() < p
  }

  /** Normal (Gaussian) draw by the Box–Muller transform. */
  normal(mean = 0, sd = 1): number {
    const u1 = 1 - this.next() // (0, 1], so log(u1) is finite
    const u2 = this.next()
    return mean + sd * Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2)
  }

  /** Normal draw clamped to [min, max] (clamped, not re-drawn, so the stream length is fixed). */
  clampedNormal(mean: number, sd: number, min: number, max: number): number {
    return Math.min(max, Math.max(min, this.normal(mean, sd)))
  }

  /** Triangular draw on [min, max] with the given mode (inverse CDF). */
  triangular(min: number, mode: number, max: number): number {
    const u = this.next()
    const split = (mode - min) / (max - min)
    return u < split ? min + Math.sqrt(u * (max - min) * (mode - min)) : max - Math.sqrt((1 - u) * (max - min) * (max - mode))
  }

  /** One element of a non-empty list, uniformly. */
  pick<T>(items: readonly T[]): T {
    if (items.length === 0) throw new RangeError('pick: the list is empty.')
    return items[Math.floor(this.next() * items.length)]!
  }

  /** One element of a non-empty list of [item, weight] pairs, with probability ∝ weight. */
  weighted<T>(items: readonly (readonly [T, number])[]): T {
    const total = items.reduce((sum, [, w]) => sum + w, 0)
    let u = this.next() * total
    for (const [item, w] of items) {
      u -= w
      if (u < 0) return item
    }
    return items[items.length - 1]![0]
  }
}

/** Round to a number of decimals (half away from zero on the decimal representation). */
export function roundTo(value: number, decimals: number): number {
  const f = 10 ** decimals
  return Math.sign(value) * Math.round(Math.abs(value) * f + Number.EPSILON * f) / f
}

/** Round to the nearest multiple of `step` (e.g. 0.5 ft story heights). */
export function roundToStep(value: number, step: number): number {
  return roundTo(Math.round(value / step) * step, 6)
}
