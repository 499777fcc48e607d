/**
 * The figures the page shows and compares for a render: the analysis core's
 * link metrics (analysis/link-metrics.ts: every one that suits the source)
 * plus a few read straight from the report. A figure that cannot be measured
 * is null with the reason, never NaN.
 */
import { LINK_METRICS, METRIC_NAMES, measureRender, sourceSignal } from '../analysis/link-metrics.ts';
import type { RenderResult } from '../link/chain/chain.ts';
import type { Scenario } from '../scenario/types.ts';
import type { LinkMetric } from './messages.ts';

/** `scenario` is the one asked for (not the excerpt's stand-in): it says what kind of source this is. */
export function linkMetrics(scenario: Scenario, result: RenderResult): LinkMetric[] {
  const signal = sourceSignal(scenario);
  const names = METRIC_NAMES.filter((name) => LINK_METRICS[name].signal === 'any' || LINK_METRICS[name].signal === signal);
  const measured = measureRender(scenario, result, names);
  const metrics: LinkMetric[] = names.map((name) => {
    const info = LINK_METRICS[name];
    const value = measured.values[name];
    const note = measured.notes.find((line) => line.startsWith(`${name}:`));
    return {
      key: name,
      label: info.description,
      unit: info.unit === '1' ? '' : info.unit,
      value: value === null || value === undefined || !Number.isFinite(value) ? null : value,
      ...(note ? { note: note.slice(name.length + 1).trim() } : {}),
    };
  });
  const report = result.report;
  metrics.push(
    { key: 'farEndPeakVolts', label: 'far-end peak voltage across the speaker', unit: 'V', value: report.farEnd.peakVolts },
    { key: 'maxLedMilliamperes', label: 'highest LED current during the render', unit: 'mA', value: Number.isFinite(report.led.maximumAmperes) ? report.led.maximumAmperes * 1000 : null },
    { key: 'detectorRestingWatts', label: 'light at the detector at rest', unit: 'W', value: report.light.restingDetectorWatts },
  );
  for (const t of report.transistors) {
    metrics.push({ key: `saturation:${t.circuit}.${t.ref}`, label: `fraction of the time ${t.circuit} ${t.ref} is saturated`, unit: '', value: t.saturation.fraction });
  }
  return metrics;
}
