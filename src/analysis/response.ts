/**
 * Frequency response and harmonic distortion of the whole link, microphone
 * pressure to speaker volts, from one exponential sine sweep (A. Farina,
 * AES 108th Convention 2000, preprint 5093; swept-sine.ts does the
 * deconvolution). The chain is rendered with a sweep source at the stated
 * level; the far end is deconvolved with the inverse of the unit-peak sweep
 * the source was made from, and the source's own scale (pascals per unit) is
 * divided out, so the linear response reads in dB re 1 V/Pa.
 *
 * Results are read off on a grid of `pointsPerOctave` log-spaced frequencies
 * through 1 kHz (linear interpolation in dB between FFT bins). Harmonic n is given against
 * the excitation frequency f, for n·f inside the swept band, in dB re the
 * linear response at f (dBc).
 *
 * The linear response is cut out with the longest window the method allows
 * (the gap to the 2nd harmonic's response), the harmonics with the gap
 * between the two highest orders. A window of T seconds cannot resolve the
 * lowest frequencies, and the sweep's start (its fade-in) smears there too:
 * compared with steady tones on our test link, magnitudes were within 0.1 dB
 * and HD2 within 1 dB from max(2·f_start, 16/T) up (our own check, no
 * source). Below that the magnitude is marked unreliable and no harmonics
 * are given.
 */
import { expSweep, type SweepOptions } from '../audio/signals/sweep.ts';
import { InputError } from '../errors.ts';
import type { RenderResult } from '../link/chain/chain.ts';
import { targetLevelDbSpl } from '../link/chain/source.ts';
import type { Scenario } from '../scenario/types.ts';
import { sweptSineResponse, type FrequencyResponse } from './swept-sine.ts';

export interface ResponseOptions {
  startHertz: number;
  endHertz: number;
  seconds: number;
  /** Highest harmonic order reported (2 or more); default 3. */
  harmonicCount: number;
  /** Sweep level (rms of a sine of the same peak); default the scenario's own level. */
  levelDbSpl: number | null;
  pointsPerOctave: number;
}

export const RESPONSE_DEFAULTS: ResponseOptions = { startHertz: 20, endHertz: 20000, seconds: 2, harmonicCount: 3, levelDbSpl: null, pointsPerOctave: 12 };

/** The source's raised-cosine fades (link/chain/source.ts), which the deconvolution must reproduce. */
const SOURCE_FADE_SECONDS = 0.01;

export interface ResponsePoint {
  hertz: number;
  /** Far-end volts per pascal at the microphone, dB re 1 V/Pa. */
  magnitudeDb: number;
  /** Relative to the response at 1 kHz (or the nearest point in the band). */
  relativeDb: number;
  /** False below the lowest frequency the linear window resolves (see above). */
  reliable: boolean;
  /** Harmonics 2..harmonicCount in dBc; null where n·f is outside the swept band or f below the harmonics' reliable range. */
  harmonicsDbc: Array<number | null>;
}

export interface ChainResponse {
  levelDbSpl: number;
  referenceHertz: number;
  referenceDb: number;
  points: ResponsePoint[];
  /** Where the response falls 3 dB below the reference; null if it does not inside the band. */
  lowerCornerHertz: number | null;
  upperCornerHertz: number | null;
  /** Window lengths of the linear and the harmonic responses. */
  linearWindowSeconds: number;
  harmonicWindowSeconds: number;
  /** Lowest frequencies where the magnitude and the harmonics are reliable. */
  lowestReliableHertz: number;
  lowestReliableHarmonicHertz: number;
}

export function checkResponseOptions(o: ResponseOptions, sampleRateHertz: number): void {
  if (!(o.startHertz > 0 && o.endHertz > o.startHertz && o.endHertz < sampleRateHertz / 2)) {
    throw new InputError('--from/--to', `0 < from < to < ${sampleRateHertz / 2} Hz (half the sample rate)`, `got ${o.startHertz} to ${o.endHertz} Hz`);
  }
  if (!(o.seconds > 0 && o.seconds <= 60)) throw new InputError('--seconds', 'a sweep length from above 0 to 60 s', `got ${o.seconds}`);
  if (!(Number.isInteger(o.harmonicCount) && o.harmonicCount >= 2 && o.harmonicCount <= 9)) {
    throw new InputError('--harmonics', 'a highest harmonic order from 2 to 9', `got ${o.harmonicCount}`);
  }
  if (!(Number.isInteger(o.pointsPerOctave) && o.pointsPerOctave >= 1 && o.pointsPerOctave <= 96)) {
    throw new InputError('pointsPerOctave', 'a whole number from 1 to 96', `got ${o.pointsPerOctave}`);
  }
}

/** The scenario with a sweep as its source. */
export function responseScenario(scenario: Scenario, options: ResponseOptions): Scenario {
  checkResponseOptions(options, scenario.sampleRateHertz);
  const dbSpl = options.levelDbSpl ?? targetLevelDbSpl(scenario.source.level);
  return {
    ...scenario,
    source: { kind: 'sweep', startHertz: options.startHertz, endHertz: options.endHertz, seconds: options.seconds, level: { kind: 'spl', dbSpl } },
  };
}

/** Deconvolves a render of responseScenario(…) into the chain's response. */
export function chainResponse(scenario: Scenario, result: RenderResult, options: ResponseOptions): ChainResponse {
  const source = scenario.source;
  if (source.kind !== 'sweep') throw new InputError('source', 'a sweep source (see responseScenario)', `got ${source.kind}`);
  const sweep: SweepOptions = {
    sampleRateHertz: scenario.sampleRateHertz,
    startHertz: source.startHertz,
    endHertz: source.endHertz,
    seconds: source.seconds,
    peakAmplitude: 1,
    fadeSeconds: SOURCE_FADE_SECONDS,
  };
  // Pascals per unit of the sweep: the least-squares scale of the rendered source onto the unit sweep.
  const unit = expSweep(sweep);
  let cross = 0;
  let power = 0;
  for (let i = 0; i < unit.length; i++) {
    cross += unit[i] * result.sourcePascals[i];
    power += unit[i] * unit[i];
  }
  const pascalsPerUnit = cross / power;
  if (!(pascalsPerUnit > 0)) throw new InputError('source', 'a sweep with some level', 'it is silent');
  const linear = sweptSineResponse(result.farEndVolts, sweep, { harmonicCount: 1 });
  const measured = sweptSineResponse(result.farEndVolts, sweep, { harmonicCount: options.harmonicCount });
  const scaleDb = 20 * Math.log10(pascalsPerUnit);
  const lowestReliableHertz = Math.max(2 * source.startHertz, 16 / linear.windowSeconds);
  const lowestReliableHarmonicHertz = Math.max(2 * source.startHertz, 16 / measured.windowSeconds);

  const referenceHertz = Math.min(source.endHertz, Math.max(source.startHertz, 1000));
  const linearDb = (hertz: number) => interpolateDb(linear.linear, hertz) - scaleDb;
  const referenceDb = linearDb(referenceHertz);
  // Grid anchored at 1 kHz, so 1 kHz (and its octaves) are always rows.
  const first = Math.ceil(options.pointsPerOctave * Math.log2(source.startHertz / 1000) - 1e-9);
  const last = Math.floor(options.pointsPerOctave * Math.log2(source.endHertz / 1000) + 1e-9);
  const points: ResponsePoint[] = [];
  for (let k = first; k <= last; k++) {
    const hertz = 1000 * 2 ** (k / options.pointsPerOctave);
    const magnitudeDb = linearDb(hertz);
    const harmonicsDbc = measured.harmonics.map((h) => (hertz * h.order <= source.endHertz && hertz >= lowestReliableHarmonicHertz ? interpolateDb(h, hertz, 'dbc') : null));
    points.push({ hertz, magnitudeDb, relativeDb: magnitudeDb - referenceDb, reliable: hertz >= lowestReliableHertz, harmonicsDbc });
  }
  const corner = (direction: -1 | 1): number | null => {
    // Walk from the reference outwards to the first point 3 dB down, then interpolate in log frequency.
    let previous: ResponsePoint | null = null;
    const ordered = direction > 0 ? points : [...points].reverse();
    for (const p of ordered) {
      if ((direction > 0 && p.hertz < referenceHertz) || (direction < 0 && p.hertz > referenceHertz)) continue;
      if (!p.reliable) return null;
      if (previous && p.relativeDb <= -3 && previous.relativeDb > -3) {
        const t = (-3 - previous.relativeDb) / (p.relativeDb - previous.relativeDb);
        return previous.hertz * (p.hertz / previous.hertz) ** t;
      }
      previous = p;
    }
    return null;
  };
  return {
    levelDbSpl: targetLevelDbSpl(source.level),
    referenceHertz,
    referenceDb,
    points,
    lowerCornerHertz: corner(-1),
    upperCornerHertz: corner(1),
    linearWindowSeconds: linear.windowSeconds,
    harmonicWindowSeconds: measured.windowSeconds,
    lowestReliableHertz,
    lowestReliableHarmonicHertz,
  };
}

/** dB (or dBc) of a response at `hertz`, linear between its points, held at the ends. */
function interpolateDb(response: FrequencyResponse, hertz: number, field: 'db' | 'dbc' = 'db'): number {
  const x = response.hertz;
  const y = response[field];
  if (x.length === 0) throw new InputError('sweep', 'a band wide enough to measure', 'no frequency points');
  if (hertz <= x[0]) return y[0];
  if (hertz >= x[x.length - 1]) return y[x.length - 1];
  let low = 0;
  let high = x.length - 1;
  while (high - low > 1) {
    const mid = (low + high) >> 1;
    if (x[mid] <= hertz) low = mid;
    else high = mid;
  }
  return y[low] + ((hertz - x[low]) / (x[high] - x[low])) * (y[high] - y[low]);
}
