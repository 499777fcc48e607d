/**
 * What the views need from a render, built once per render (memoised on the
 * render object, so re-drawing the page does not rebuild plots or buffers).
 */
import type { Scenario } from '../../src/scenario/index.ts';
import type { RenderedLink } from '../../src/worker/messages.ts';
import type { ShadeSpec, TraceSpec } from '../gt-trace-stack.ts';
import type { ExportSignal } from './file-actions.ts';
import type { PlayableSignal } from './listening.ts';
import { FALLBACK_COLOURS, TRACE_COLOURS } from './plot-theme.ts';
import type { Snapshot } from './workbench-store.ts';

const LABELS: Record<string, string> = {
  'microphone.volts': 'microphone',
  'transmitter.led': 'LED current',
  'light.detectorWatts': 'light at detector',
};
const SHORT: Record<string, string> = { 'microphone.volts': 'mic', 'transmitter.led': 'LED', 'light.detectorWatts': 'light' };

const traceCache = new WeakMap<RenderedLink, TraceSpec[]>();
const shadeCache = new WeakMap<RenderedLink, ShadeSpec[]>();
const listenCache = new WeakMap<RenderedLink, { snapshot: Snapshot | null; signals: PlayableSignal[] }>();
const rmsCache = new WeakMap<object, number>();

/** Order on screen: the chain's order, the scenario's own taps after the LED. */
export function tracesOf(run: RenderedLink): TraceSpec[] {
  let traces = traceCache.get(run);
  if (traces) return traces;
  const fixed = ['microphone.volts', 'transmitter.led', 'light.detectorWatts'];
  const byName = (name: string) => run.taps.find((t) => t.name === name);
  const own = run.taps.filter((t) => !fixed.includes(t.name));
  traces = [
    { id: 'source', label: 'source (sound at the microphone)', short: 'source', unit: 'Pa', samples: run.sourcePascals, rateHertz: run.sampleRateHertz, colour: TRACE_COLOURS.source },
  ];
  for (const tap of [byName('microphone.volts'), byName('transmitter.led'), ...own, byName('light.detectorWatts')]) {
    if (!tap) continue;
    traces.push({
      id: tap.name,
      label: LABELS[tap.name] ?? tap.name,
      short: SHORT[tap.name] ?? tap.name.replace(/^(transmitter|receiver)\./, (m) => (m === 'transmitter.' ? 'tx.' : 'rx.')),
      unit: tap.unit,
      samples: tap.samples,
      rateHertz: tap.sampleRateHertz,
      colour: TRACE_COLOURS[tap.name] ?? FALLBACK_COLOURS[traces.length % FALLBACK_COLOURS.length],
    });
  }
  traces.push({ id: 'far-end', label: 'far end (across the speaker)', short: 'far end', unit: 'V', samples: run.farEndVolts, rateHertz: run.sampleRateHertz, colour: TRACE_COLOURS['far end'] });
  traceCache.set(run, traces);
  return traces;
}

export function shadingOf(run: RenderedLink): ShadeSpec[] {
  let shading = shadeCache.get(run);
  if (shading) return shading;
  const saturation = run.report.transistors.flatMap((t) => t.saturation.intervals);
  shading = [
    { label: 'LED cut off', colour: 'rgba(255, 107, 107, 0.13)', marker: '#ff6b6b', intervals: run.report.led.cutoff.intervals },
    { label: 'a transistor saturated', colour: 'rgba(255, 181, 71, 0.09)', marker: '#e0a030', intervals: saturation },
  ];
  shadeCache.set(run, shading);
  return shading;
}

export function listenSignals(run: RenderedLink, snapshot: Snapshot | null): PlayableSignal[] {
  const cached = listenCache.get(run);
  if (cached && cached.snapshot === snapshot) return cached.signals;
  const signals: PlayableSignal[] = [
    { id: 'far-end', label: 'far end', samples: run.farEndVolts, rateHertz: run.sampleRateHertz, unit: 'V' },
    { id: 'source', label: 'clean source', samples: run.sourcePascals, rateHertz: run.sampleRateHertz, unit: 'Pa' },
    ...run.taps.map((t) => ({ id: `tap:${t.name}`, label: `tap ${LABELS[t.name] ?? t.name}`, samples: t.samples, rateHertz: t.sampleRateHertz, unit: t.unit })),
  ];
  if (snapshot) signals.push({ id: 'snapshot', label: `snapshot “${snapshot.name}” far end`, samples: snapshot.farEnd, rateHertz: snapshot.sampleRateHertz, unit: 'V' });
  listenCache.set(run, { snapshot, signals });
  return signals;
}

const exportCache = new WeakMap<RenderedLink, { id: string; label: string }[]>();

/** What can be exported as WAV: the far end, the source and every tap. */
export function exportChoices(run: RenderedLink): { id: string; label: string }[] {
  let choices = exportCache.get(run);
  if (!choices) {
    choices = [
      { id: 'far-end', label: 'far end' },
      { id: 'source', label: 'clean source' },
      ...run.taps.map((t) => ({ id: `tap:${t.name}`, label: `tap ${LABELS[t.name] ?? t.name}` })),
    ];
    exportCache.set(run, choices);
  }
  return choices;
}

/** The WAV for a signal id: the far end as the CLI writes it, the source normalised to its peak, taps in raw SI units. */
export function exportSignal(run: RenderedLink, id: string, scenario: Scenario): ExportSignal | null {
  if (id === 'far-end') {
    return { stem: 'far-end', samples: run.farEndVolts, rateHertz: run.sampleRateHertz, scale: 10 ** (scenario.output.listeningGainDb / 20), format: scenario.output.format };
  }
  if (id === 'source') {
    let peak = 0;
    for (const v of run.sourcePascals) peak = Math.max(peak, Math.abs(v));
    return { stem: 'source', samples: run.sourcePascals, rateHertz: run.sampleRateHertz, scale: 1 / Math.max(peak, 1e-30), format: 'float32' };
  }
  const tap = run.taps.find((t) => `tap:${t.name}` === id);
  if (!tap) return null;
  return { stem: `tap-${tap.name.replace(/[^A-Za-z0-9_.-]+/g, '_')}`, samples: tap.samples, rateHertz: tap.sampleRateHertz, scale: 1, format: 'float32' };
}

/** Rms about the mean, memoised per array. */
export function rmsAboutMean(samples: ArrayLike<number> & object): number {
  const cached = rmsCache.get(samples);
  if (cached !== undefined) return cached;
  let mean = 0;
  for (let i = 0; i < samples.length; i++) mean += samples[i];
  mean /= Math.max(1, samples.length);
  let squares = 0;
  for (let i = 0; i < samples.length; i++) squares += (samples[i] - mean) ** 2;
  const rms = Math.sqrt(squares / Math.max(1, samples.length));
  rmsCache.set(samples, rms);
  return rms;
}
