/**
 * So that an edit is heard within about a second, the page renders the first
 * seconds of the source by default. The excerpt must be the same sound at the same
 * level as in the full run: the whole source is calibrated first (its level
 * is a property of all of it), then its first seconds are handed to the
 * chain as a recording whose stated level reproduces that calibration
 * exactly (gain 1), whatever the source kind.
 */
import { activeSpeechLevel } from '../audio/speech-level.ts';
import { InputError } from '../errors.ts';
import { REFERENCE_PRESSURE_PASCALS } from '../link/acoustics/sound-level.ts';
import { calibratedSource, type CalibratedSource, type Recording } from '../link/chain/source.ts';
import type { Scenario } from '../scenario/types.ts';

export interface Excerpt {
  scenario: Scenario;
  recording: Recording | undefined;
  /** The full source's calibration (its level and how it was measured). */
  full: CalibratedSource | null;
  renderedSeconds: number;
  fullSeconds: number;
}

/** Seconds the source lasts without building it, when the settings say (null for recordings). */
function statedSeconds(scenario: Scenario, recording: Recording | undefined): number {
  const source = scenario.source;
  if (source.kind === 'recording') return recording ? recording.samples.length / recording.sampleRateHertz : 0;
  return source.seconds;
}

export function excerptOf(scenario: Scenario, recording: Recording | undefined, seconds: number | null): Excerpt {
  if (seconds !== null && !(Number.isFinite(seconds) && seconds > 0)) {
    throw new InputError('excerpt', 'a length in seconds above 0, or the whole source', `got ${seconds}`);
  }
  const stated = statedSeconds(scenario, recording);
  if (seconds === null || stated <= seconds) {
    return { scenario, recording, full: null, renderedSeconds: stated, fullSeconds: stated };
  }
  const fs = scenario.sampleRateHertz;
  const full = calibratedSource(scenario.source, fs, recording);
  const count = Math.min(full.pascals.length, Math.max(1, Math.round(seconds * fs)));
  const prefix = full.pascals.slice(0, count);
  const level = activeSpeechLevel(prefix, fs);
  if (!Number.isFinite(level.activeLevelDb)) {
    throw new InputError('excerpt', 'an excerpt with some sound in it (render a longer excerpt or the whole source)', `the first ${seconds} s are silent`);
  }
  // The chain scales a recording to `dbSpl` by its active level: stating the prefix's own level makes that gain 1.
  const dbSpl = level.activeLevelDb - 20 * Math.log10(REFERENCE_PRESSURE_PASCALS);
  return {
    scenario: { ...scenario, source: { kind: 'recording', file: `first ${seconds} s`, level: { kind: 'spl', dbSpl } } },
    recording: { samples: prefix, sampleRateHertz: fs, label: `first ${seconds} s of the source` },
    full,
    renderedSeconds: count / fs,
    fullSeconds: full.pascals.length / fs,
  };
}
