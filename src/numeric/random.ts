/**
 * Seeded pseudo-random numbers so that noisy runs repeat exactly.
 * xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number generators",
 * ACM TOMS 47(4), 2021), seeded through splitmix32; normals by the Box–Muller transform.
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
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
  }

  /** Uniform 32-bit unsigned integer. */
  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5) >>> 0, 7), 9) >>> 0;
    const t = (this.s1 << 9) >>> 0;
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
    let u = 0;
    while (u === 0) u = this.uniform();
    const v = this.uniform();
    const radius = Math.sqrt(-2 * Math.log(u));
    const angle = 2 * Math.PI * v;
    this.spareNormal = radius * Math.sin(angle);
    this.hasSpare = true;
    return radius * Math.cos(angle);
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
