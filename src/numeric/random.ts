/**
 * Seeded pseudo-random numbers so that noisy runs repeat exactly.
 * xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number generators",
 * ACM TOMS 47(4), 2021), seeded through splitmix32; normals by the polar form of the
 * Box–Muller transform (Marsaglia & Bray, "A convenient method for generating normal
 * variables", SIAM Review 6(3), 1964).
 */
export class SeededRandom {
  private s0 = 0;
  private s1 = 0;
  private s2 = 0;
  private s3 = 0;
  private spareNormal = 0;
  private hasSpare = false;

  constructor(seed: number) {
    let x = seed >>> 0;
    const next = (): number => {
      // splitmix32
      x = (x + 0x9e3779b9) >>> 0;
      let z = x;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
      return (z ^ (z >>> 16)) >>> 0;
    };
    // The state words are kept as int32 (same bits): small integers stay unboxed in the engine.
    this.s0 = next() | 0;
    this.s1 = next() | 0;
    this.s2 = next() | 0;
    this.s3 = next() | 0;
  }

  /** Uniform 32-bit unsigned integer. */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5), 7), 9) >>> 0;
    const t = this.s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result;
  }

  /** Uniform in [0, 1). */
  uniform(): number {
    return this.nextUint32() / 4294967296;
  }

  /** Standard normal (mean 0, variance 1). */
  normal(): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return this.spareNormal;
    }
    // Polar form: a point uniform in the unit disc stands in for the angle's sine and cosine.
    let u = 0;
    let v = 0;
    let r2 = 0;
    do {
      u = 2 * this.uniform() - 1;
      v = 2 * this.uniform() - 1;
      r2 = u * u + v * v;
    } while (r2 >= 1 || r2 === 0);
    const scale = Math.sqrt((-2 * Math.log(r2)) / r2);
    this.spareNormal = v * scale;
    this.hasSpare = true;
    return u * scale;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
