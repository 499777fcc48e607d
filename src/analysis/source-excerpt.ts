/**
 * Short renders for sweeps and tolerance runs. Stationary test signals
 * (tone, two-tone, sweep, pink noise) are simply made shorter: their level is
 * their rms, the same for any length. Speech (a recording or the speech-like
 * signal) is cut to its first seconds at the level it has in the full source
 * (worker/excerpt.ts), so a short run hears the same sound as the full one.
 */
import { InputError } from '../errors.ts';
import type { Recording } from '../link/chain/source.ts';
import type { Scenario } from '../scenario/types.ts';
import { excerptOf } from '../worker/excerpt.ts';

export function shortenSource(
  scenario: Scenario,
  recording: Recording | undefined,
  seconds: number | null,
): { scenario: Scenario; recording: Recording | undefined } {
  if (seconds === null) return { scenario, recording };
  const source = scenario.source;
  if (source.kind === 'recording' || source.kind === 'speech-like') {
    const excerpt = excerptOf(scenario, recording, seconds);
    return { scenario: excerpt.scenario, recording: excerpt.recording };
  }
  if (!(Number.isFinite(seconds) && seconds > 0)) throw new InputError('excerpt', 'a length in seconds above 0, or the whole source', `got ${seconds}`);
  return { scenario: source.seconds > seconds ? { ...scenario, source: { ...source, seconds } } : scenario, recording };
}
