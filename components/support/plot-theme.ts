/** Colours and axis settings shared by the plots (our own palette). */
import type uPlot from 'uplot';
import { formatFigure } from './value-text.ts';

export const PLOT = {
  text: '#aeb6bf',
  grid: 'rgba(174, 182, 191, 0.12)',
  tick: 'rgba(174, 182, 191, 0.35)',
  font: '11px system-ui, sans-serif',
} as const;

export const TRACE_COLOURS: Record<string, string> = {
  source: '#c9a0ff',
  'microphone.volts': '#58c4dc',
  'transmitter.led': '#ffb547',
  'light.detectorWatts': '#ffe27a',
  'far end': '#7bd88f',
  snapshot: '#ff8fa3',
};

export const FALLBACK_COLOURS = ['#8fb3ff', '#f29e6d', '#9be3d0', '#d7a6e8', '#e6d27a'];

/** A y axis whose ticks read in engineering notation with the unit. */
export function valueAxis(unit: string, show = true): uPlot.Axis {
  return {
    show,
    stroke: PLOT.text,
    font: PLOT.font,
    size: 74,
    grid: { stroke: PLOT.grid, width: 1 },
    ticks: { stroke: PLOT.tick, width: 1, size: 4 },
    values: (_u, splits) => splits.map((v) => (v === null ? '' : formatFigure(v, unit, 3))),
  };
}

export function timeAxis(show: boolean): uPlot.Axis {
  return {
    show,
    stroke: PLOT.text,
    font: PLOT.font,
    size: show ? 30 : 0,
    grid: { stroke: PLOT.grid, width: 1 },
    ticks: { stroke: PLOT.tick, width: 1, size: show ? 4 : 0 },
    values: (_u, splits) => splits.map((v) => (show ? `${Number(v.toPrecision(6))} s` : '')),
  };
}
