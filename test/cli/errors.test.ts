import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runCli } from '../helpers/cli.ts';

/*
 * Every bad input ends the same way: a non-zero exit code, exactly one line on
 * standard error that names the JSON path, file or flag, and no stack trace.
 */

const dir = mkdtempSync(join(tmpdir(), 'glowtalk-errors-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function file(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify({ format: 'glowtalk.circuit/1', parts: content }));
  return path;
}

const SOURCE = { ref: 'V1', kind: 'voltage-source', pins: ['a', 'gnd'], dc: 1 };
const RC = 'samples/circuits/rc-low-pass.json';

const CASES: Array<{ what: string; argv: () => string[]; names: RegExp }> = [
  { what: 'an unknown part kind', argv: () => ['bias', file('kind.json', [{ ref: 'X1', kind: 'transistor', pins: ['a', 'gnd'] }])], names: /parts\[0\]\.kind.*transistor/ },
  {
    what: 'a wrong pin count',
    argv: () => ['bias', file('pins.json', [SOURCE, { ref: 'R1', kind: 'resistor', pins: ['a', 'gnd', 'b'], value: 1 }])],
    names: /parts\[1\]\.pins.*3 items/,
  },
  {
    what: 'a missing model',
    argv: () => ['bias', file('model.json', [SOURCE, { ref: 'D1', kind: 'diode', pins: ['a', 'gnd'], model: 'no-such-diode' }])],
    names: /parts\[1\]\.model.*no-such-diode/,
  },
  {
    what: 'a floating node',
    argv: () =>
      [
        'bias',
        file('floating.json', [
          SOURCE,
          { ref: 'C1', kind: 'capacitor', pins: ['a', 'b'], value: '1u' },
          { ref: 'C2', kind: 'capacitor', pins: ['b', 'gnd'], value: '1u' },
        ]),
      ],
    names: /parts\[1\]\.pins\[1\].*"b"/,
  },
  {
    what: 'a loop of voltage sources',
    argv: () => ['bias', file('loop.json', [SOURCE, { ref: 'V2', kind: 'voltage-source', pins: ['a', 'gnd'], dc: 2 }])],
    names: /parts\[1\].*V1.*V2.*loop/,
  },
  {
    what: 'a malformed value',
    argv: () => ['bias', file('value.json', [SOURCE, { ref: 'R1', kind: 'resistor', pins: ['a', 'gnd'], value: '4.7kk' }])],
    names: /parts\[1\]\.value.*4\.7kk/,
  },
  { what: 'a file that is not JSON', argv: () => ['bias', file('broken.json', '{ "format": nope')], names: /broken\.json line 1, column \d+/ },
  { what: 'a missing file', argv: () => ['bias', join(dir, 'absent.json')], names: /absent\.json: no such file/ },
  { what: 'a bad --stop', argv: () => ['transient', RC, '--stop', 'soon', '--step', '10u'], names: /--stop.*soon/ },
  { what: 'a missing --stop', argv: () => ['transient', RC, '--step', '10u'], names: /--stop/ },
  { what: 'a zero --step', argv: () => ['transient', RC, '--stop', '1m', '--step', '0'], names: /--step/ },
  { what: 'an unknown probe', argv: () => ['transient', RC, '--stop', '1m', '--step', '10u', '--probe', 'nowhere'], names: /--probe.*nowhere/ },
  { what: 'an extra argument', argv: () => ['bias', RC, 'extra'], names: /argument|extra/i },
  {
    what: 'a transistor pin that does not exist',
    argv: () => ['transient', 'samples/circuits/led-and-phototransistor.json', '--stop', '1m', '--step', '10u', '--probe', 'Q1.gate'],
    names: /--probe.*gate/,
  },
  { what: 'an unknown --method', argv: () => ['transient', RC, '--stop', '1m', '--step', '10u', '--method', 'euler'], names: /--method.*euler/ },
  { what: 'an unknown command', argv: () => ['simulate', RC], names: /simulate/ },
];

describe('glowtalk on bad input', () => {
  for (const { what, argv, names } of CASES) {
    it(`${what}: exits non-zero with one line on stderr naming it, and no stack trace`, async () => {
      const { code, out, err } = await runCli(argv());
      expect(code).not.toBe(0);
      expect(out).toBe('');
      expect(err.endsWith('\n')).toBe(true);
      expect(err.trimEnd().split('\n')).toHaveLength(1);
      expect(err).toMatch(names);
      expect(err).not.toMatch(/\n\s+at |internal error/);
    });
  }

  it('--csv naming the input file is refused and the input is left byte for byte unchanged', async () => {
    const input = file('input.json', [SOURCE, { ref: 'R1', kind: 'resistor', pins: ['a', 'gnd'], value: '1k' }]);
    const before = readFileSync(input);
    const { code, err } = await runCli(['transient', input, '--stop', '1m', '--step', '10u', '--csv', input]);
    expect(code).toBe(2);
    expect(err.trimEnd().split('\n')).toHaveLength(1);
    expect(err).toMatch(/input\.json.*overwrite an input/);
    expect(readFileSync(input).equals(before)).toBe(true);
    // The same file reached by another spelling of its path is refused too.
    const other = await runCli(['transient', input, '--stop', '1m', '--step', '10u', '--csv', join(dir, '.', 'sub', '..', 'input.json')]);
    expect(other.code).toBe(2);
    expect(readFileSync(input).equals(before)).toBe(true);
  });
});
