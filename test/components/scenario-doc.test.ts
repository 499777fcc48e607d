import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { applyEdit } from '../../components/support/apply-edit.ts';
import { docFromText, readAt, settingDifferences, writeField } from '../../components/support/scenario-doc.ts';
import { readTyped, shownValue } from '../../components/support/value-text.ts';

const dir = new URL('../../samples/demo-bay/', import.meta.url);
const read = (name: string) => readFileSync(new URL(name, dir), 'utf8');
const demo = () => docFromText(read('scenario.json'), 'demo-bay/scenario.json', { 'transmitter.json': read('transmitter.json'), 'receiver.json': read('receiver.json') });

describe('the page’s scenario document', () => {
  it('holds both circuits inline once loaded with the files beside it', () => {
    const { doc, scenario } = demo();
    expect(typeof readAt(doc.json, 'transmitter.circuit')).toBe('object');
    expect(readAt(doc.json, 'transmitter.circuit.parts[RB].value')).toBe('100k');
    expect(scenario.transmitter.circuit.parts.length).toBeGreaterThan(5);
  });

  it('names the missing circuit file when it was not opened with the scenario', () => {
    expect(() => docFromText(read('scenario.json'), 'scenario.json', { 'transmitter.json': read('transmitter.json') })).toThrow(/receiver\.circuit.*"receiver\.json"/);
  });

  it('applies a good part value and refuses a bad one with the loader’s reason, leaving the document as it was', () => {
    const { doc } = demo();
    const good = applyEdit(doc, 'transmitter.circuit.parts[RB].value', 68000);
    expect(good.ok).toBe(true);
    if (good.ok) expect(readAt(good.doc.json, 'transmitter.circuit.parts[RB].value')).toBe(68000);
    const bad = applyEdit(doc, 'microphone.sensitivity', 50);
    expect(bad).toEqual({ ok: false, reason: 'microphone.sensitivity: got 50; expected a sensitivity from -100 to 20 dBV/Pa' });
    expect(readAt(doc.json, 'transmitter.circuit.parts[RB].value')).toBe('100k');
    // The loader counts parts by position; the page names them by ref.
    expect(applyEdit(doc, 'transmitter.circuit.parts[RB].value', -47000)).toEqual({
      ok: false,
      reason: 'transmitter.circuit.parts[RB].value: got -47000; expected a value in ohms > 0',
    });
  });

  it('writes a default that was left out, and switching the source kind brings that kind’s fields', () => {
    const { doc } = demo();
    expect(readAt(writeField(doc.json, 'lightPath.darkCurrent', '5n'), 'lightPath.darkCurrent')).toBe('5n');
    const tone = applyEdit(doc, 'source.kind', 'tone');
    expect(tone.ok).toBe(true);
    if (tone.ok) {
      expect(tone.scenario.source.kind).toBe('tone');
      expect(readAt(tone.doc.json, 'source.level.effort')).toBe('normal');
    }
  });

  it('lists the settings that differ, engineering strings compared by value', () => {
    const { doc } = demo();
    const same = writeField(doc.json, 'microphone.outputResistance', 2200);
    expect(settingDifferences(doc.json, same)).toEqual([]);
    const edit = applyEdit(doc, 'transmitter.circuit.parts[RE2A].value', 820);
    if (!edit.ok) throw new Error(edit.reason);
    expect(settingDifferences(doc.json, edit.doc.json)).toEqual([{ path: 'transmitter.circuit.parts[RE2A].value', before: '1000', after: '820' }]);
  });
});

describe('a value typed into a field', () => {
  it('reads engineering notation, with or without the unit, and says what is wrong otherwise', () => {
    expect(readTyped('4.7k', 'Ω', true)).toEqual({ ok: true, value: 4700 });
    expect(readTyped(' 4.7 kΩ', 'Ω', true)).toEqual({ ok: true, value: 4700 });
    expect(readTyped('10µ', 'F', true)).toEqual({ ok: true, value: 10e-6 });
    expect(readTyped('4k7', 'Ω', true)).toMatchObject({ ok: false, reason: expect.stringMatching(/not a number/) });
    expect(readTyped('-44', 'dBV/Pa', false)).toEqual({ ok: true, value: -44 });
    expect(readTyped('3k', 'dB', false)).toMatchObject({ ok: false, reason: expect.stringMatching(/plain number of dB/) });
    expect(readTyped('', 'V', true)).toMatchObject({ ok: false });
  });

  it('is shown back in engineering notation, plainly for metres and seconds, with an exponent below femto', () => {
    expect(shownValue(4700, true, 'Ω')).toBe('4.7k');
    expect(shownValue('100n', true, 'F')).toBe('100n');
    expect(shownValue(0.3, true, 'm')).toBe('0.3');
    expect(shownValue(2e-19, true, 'A')).toBe('2e-19');
    expect(shownValue(0.12, true, '')).toBe('0.12');
    expect(shownValue(null, true, 'Ω')).toBe('');
  });
});
