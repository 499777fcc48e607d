/**
 * One render as the page asks for it: load and check the scenario, report the
 * bias points, render the (excerpt of the) source through the chain, and
 * gather what the page shows. Core code: runs in the render worker and in
 * Node tests alike.
 */
import { renderScenario } from '../link/chain/chain.ts';
import { summariseRender } from '../link/chain/summary.ts';
import type { Recording } from '../link/chain/source.ts';
import { loadScenario, settingsSummary } from '../scenario/index.ts';
import { biasTables } from './bias-tables.ts';
import { displaySpectrum } from './display-spectrum.ts';
import { excerptOf } from './excerpt.ts';
import { linkMetrics } from './link-metrics.ts';
import type { BiasTables, RenderRequest, RenderedLink } from './messages.ts';

/** Taps the page always shows, besides the scenario's own. */
export const PAGE_TAPS = ['microphone.volts', 'transmitter.led', 'light.detectorWatts'];

export interface JobHooks {
  onBias?: (bias: BiasTables) => void;
  onProgress?: (fraction: number) => void;
  signal?: { readonly aborted: boolean };
}

export function runRenderJob(request: RenderRequest, hooks: JobHooks = {}): RenderedLink {
  const startedMs = Date.now();
  const scenario = loadScenario(
    request.scenario,
    {
      readText: (name) => {
        const text = request.files[name];
        if (text === undefined) throw new Error(`the file was not supplied with the scenario (open it together with the scenario file)`);
        return text;
      },
    },
    request.label,
  );
  hooks.onBias?.(biasTables(scenario));

  const recording: Recording | undefined = request.recording ?? undefined;
  const cut = excerptOf(scenario, recording, request.excerptSeconds);
  const result = renderScenario(cut.scenario, { recording: cut.recording, taps: PAGE_TAPS, onProgress: hooks.onProgress, signal: hooks.signal });
  if (cut.full) {
    // The report states the scenario's level, not the excerpt's stand-in.
    result.report.microphone.targetDbSpl = cut.full.targetDbSpl;
    result.report.microphone.levelMeasure = cut.full.levelMeasure;
    result.report.microphone.activityFactor = cut.full.activityFactor;
  }
  const fs = scenario.sampleRateHertz;
  const led = result.taps.find((t) => t.name === 'transmitter.led');
  const spectra = [displaySpectrum('source', result.sourcePascals, fs), displaySpectrum('far end', result.farEndVolts, fs)];
  if (led) spectra.push(displaySpectrum('LED current', led.samples, led.sampleRateHertz));
  return {
    sampleRateHertz: fs,
    internalRateHertz: result.report.internalRateHertz,
    sourcePascals: result.sourcePascals,
    farEndVolts: result.farEndVolts,
    taps: result.taps,
    report: result.report,
    summary: summariseRender(result.report),
    settings: settingsSummary(scenario),
    metrics: linkMetrics(scenario, result),
    spectra,
    renderedSeconds: cut.renderedSeconds,
    fullSeconds: cut.fullSeconds,
    wallSeconds: (Date.now() - startedMs) / 1000,
  };
}
