/**
 * Test-only amplitude-modulated noise (invented for tests; STOI tests use src/audio/signals/speech-like.ts): white noise coloured by
 * a one-pole low-pass (speech's falling long-term spectrum), amplitude
 * modulated by a 4 Hz syllable rhythm, with 250 ms pauses every 1.25 s so
 * that STOI's silent-frame removal has something to remove.
 */
import { SeededRandom } from '../../src/numeric/random.ts';

export function speechLike(rateHertz: number, seconds: number, seed = 1): Float64Array {
  const random = new SeededRandom(seed);
  const length = Math.round(rateHertz * seconds);
  const x = new Float64Array(length);
  const pole = Math.exp((-2 * Math.PI * 500) / rateHertz);
  let state = 0;
  for (let n = 0; n < length; n++) {
    state = pole * state + (1 - pole) * random.normal();
    const t = n / rateHertz;
    const syllable = 0.5 - 0.5 * Math.cos(2 * Math.PI * 4 * t);
    const pause = t % 1.25 > 1.0 ? 0 : 1;
    x[n] = state * syllable * pause * (1 + 0.5 * Math.sin(2 * Math.PI * 0.7 * t));
  }
  return x;
}

/** x plus seeded white noise at `snrDb` relative to x's mean power. */
export function withNoise(x: Float64Array, snrDb: number, seed: number): Float64Array {
  const random = new SeededRandom(seed);
  let power = 0;
  for (const v of x) power += v * v;
  power /= x.length;
  const sigma = Math.sqrt(power / 10 ** (snrDb / 10));
  return x.map((v) => v + sigma * random.normal());
}
