/** Values as typed into fields and as shown in them (pure: no DOM). */
import { formatEngineering, readEngineering } from '../../src/units/engineering.ts';
import type { Json } from './scenario-doc.ts';

/** Text typed into a field → number, or the reason it is not one. */
export function readTyped(text: string, unit: string, engineering: boolean): { ok: true; value: number } | { ok: false; reason: string } {
  let t = text.trim().replace(/\s+/g, '');
  if (unit && t.endsWith(unit.replace(/\s+/g, ''))) t = t.slice(0, t.length - unit.replace(/\s+/g, '').length);
  if (t === '') return { ok: false, reason: 'enter a value' };
  if (engineering) {
    const read = readEngineering(t);
    return read.ok ? read : { ok: false, reason: `"${text}" is not a number; write e.g. 4.7k, 100n, 10u, 0.25 (prefixes f p n u m k M G)` };
  }
  const value = Number(t);
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t) || !Number.isFinite(value)) {
    return { ok: false, reason: `"${text}" is not a plain number${unit ? ` of ${unit}` : ''} (no prefixes here)` };
  }
  return { ok: true, value };
}

const PLAIN_UNITS = new Set(['', 'm', 'm²', 's']);

/**
 * How a value is shown in its field: engineering notation without the unit
 * (six significant digits, so nothing typed is lost); plain decimals for
 * unitless numbers, metres and seconds; an exponent below the smallest prefix (2e-19 rather than 0.0002f).
 */
export function shownValue(value: Json | undefined, engineering: boolean, unit = '-'): string {
  if (value === undefined || value === null) return '';
  const read = typeof value === 'number' || typeof value === 'string' ? readEngineering(value) : null;
  if (!engineering || !read?.ok) return String(value);
  const v = read.value;
  if (v !== 0 && Math.abs(v) < 1e-15) return v.toExponential();
  // Plain decimals where a prefix would read as a unit: "300m" metres is 0.3 m, not 300 m.
  if (PLAIN_UNITS.has(unit) && (v === 0 || (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e4))) return String(Number(v.toPrecision(6)));
  return formatEngineering(v, '', 6).replace(' ', '');
}


/**
 * A measured figure for display: engineering notation, with anything below
 * the smallest prefix (a femtoampere of leakage, −2e-19 A of a cut-off LED)
 * shown as 0 rather than "-0.0002 fA".
 */
export function formatFigure(value: number, unit: string, significantDigits = 3): string {
  return formatEngineering(Math.abs(value) < 1e-15 ? 0 : value, unit, significantDigits);
}
