import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ByteWriter } from '../../../src/solver/kernel/wasm/encoder.ts';
import { SubsetError, parseSubset } from '../../../src/solver/kernel/wasm/subset-parser.ts';
import { WASM_BLOCK_STEPS, wasmKernel } from '../../../src/solver/kernel/wasm/wasm-kernel.ts';

/*
 * The kernels' translation to WebAssembly against the engine's own JavaScript: the same code
 * run both ways must give the same doubles, bit for bit (ECMAScript's Number operations and
 * WebAssembly's f64 instructions are both IEEE 754 binary64 with round-to-nearest).
 */

type Js = (s: number[], k: number[], input: Float64Array, from: number, to: number, out: Float64Array) => number;

function both(code: string, state: number[], constants: number[], input: Float64Array, size: number) {
  const jsState = [...state];
  const jsOut = new Float64Array(input.length * size);
  const jsReturn = (new Function('s', 'k', 'input', 'from', 'to', 'out', code) as Js)(jsState, constants, input, 0, input.length, jsOut);
  const kernel = wasmKernel(code, state.length, constants, size);
  if (!kernel) throw new Error('not translated');
  kernel.state.set(state);
  const wasmOut = new Float64Array(input.length * size);
  const wasmReturn = kernel.run(kernel.state, constants, input, 0, input.length, wasmOut);
  return { jsState, jsOut, jsReturn, wasmState: [...kernel.state], wasmOut, wasmReturn };
}

const sameBits = (a: ArrayLike<number>, b: ArrayLike<number>): boolean => a.length === b.length && Array.from(a).every((v, i) => Object.is(v, b[i]));

describe('WebAssembly integers (LEB128)', () => {
  // DWARF Debugging Information Format, version 4, §7.6, figures 22 (unsigned) and 23 (signed).
  it('writes unsigned and signed LEB128 as the DWARF 4 tables do', () => {
    const unsigned: [number, number[]][] = [
      [2, [0x02]],
      [127, [0x7f]],
      [128, [0x80, 0x01]],
      [129, [0x81, 0x01]],
      [130, [0x82, 0x01]],
      [12857, [0xb9, 0x64]],
    ];
    for (const [value, bytes] of unsigned) {
      const w = new ByteWriter();
      w.unsigned(value);
      expect([...w.result()]).toEqual(bytes);
    }
    const signed: [number, number[]][] = [
      [2, [0x02]],
      [-2, [0x7e]],
      [127, [0xff, 0x00]],
      [-127, [0x81, 0x7f]],
      [128, [0x80, 0x01]],
      [-128, [0x80, 0x7f]],
      [129, [0x81, 0x01]],
      [-129, [0xff, 0x7e]],
    ];
    for (const [value, bytes] of signed) {
      const w = new ByteWriter();
      w.signed(value);
      expect([...w.result()]).toEqual(bytes);
    }
  });
});

describe('kernel code translated to WebAssembly', () => {
  const specials = [0, -0, 1, -1, 0.5, 1e-300, -1e-300, 1e300, 2.5e-12, 40, -40, 80, 700, 710, -750, Infinity, -Infinity, NaN];
  const operand = fc.oneof(fc.constantFrom(...specials), fc.double());

  /** A random expression of the kernels' kind over a, b, c (numbers) and p, q (booleans). */
  const expression: fc.Arbitrary<string> = fc.letrec<{ num: string; bool: string }>((tie) => ({
    num: fc.oneof(
      { depthSize: 'small', withCrossShrink: true },
      fc.constantFrom('a', 'b', 'c', 'k[0]', 'k[1]', '2', '0.5', '80'),
      fc.tuple(tie('num'), fc.constantFrom('+', '-', '*', '/'), tie('num')).map(([x, op, y]) => `(${x} ${op} ${y})`),
      tie('num').map((x) => `(-(${x}))`),
      fc.tuple(fc.constantFrom('abs', 'exp', 'log', 'sqrt'), tie('num')).map(([f, x]) => `Math.${f}(${x})`),
      fc.tuple(fc.constantFrom('max', 'min'), fc.array(tie('num'), { minLength: 2, maxLength: 3 })).map(([f, xs]) => `Math.${f}(${xs.join(', ')})`),
      fc.tuple(tie('bool'), tie('num'), tie('num')).map(([t, x, y]) => `(${t} ? ${x} : ${y})`),
    ),
    bool: fc.oneof(
      { depthSize: 'small', withCrossShrink: true },
      fc.constantFrom('p', 'q', 'true', 'false'),
      fc.tuple(tie('num'), fc.constantFrom('<', '>', '<=', '>=', '===', '!=='), tie('num')).map(([x, op, y]) => `(${x} ${op} ${y})`),
      fc.tuple(tie('bool'), fc.constantFrom('&&', '||', '&'), tie('bool')).map(([x, op, y]) => `(${x} ${op} ${y})`),
      tie('bool').map((x) => `!${x}`),
    ),
  })).num;

  it('computes any expression of the kernels’ operators to the same bits as JavaScript (NaN, infinities and signed zeros included)', () => {
    fc.assert(
      fc.property(expression, fc.array(operand, { minLength: 5, maxLength: 5 }), (e, [a, b, c, k0, k1]) => {
        const code = `"use strict";\nlet a = s[0], b = s[1], c = s[2];\nconst p = a < b, q = c >= 0;\ns[3] = ${e};\nreturn 0;`;
        const r = both(code, [a, b, c, 0], [k0, k1], new Float64Array(1), 1);
        return Object.is(r.jsState[3], r.wasmState[3]);
      }),
      { numRuns: 300 },
    );
  });

  it('runs loops as JavaScript does: labelled break, continue, counters held as integers, the input read and the solutions written per step', () => {
    const code = `"use strict";
let total = s[0] | 0, scale = s[1];
let i = from;
steps: for (; i < to; i++) {
  const u = input[i];
  let x = u, converged = false;
  for (let it = 1; !converged && it <= 50; it++) {
    total++;
    if (x > 3) continue;
    x = x * scale + 0.25;
    if (x - u > 40) break steps;
    if (Math.abs(x - u) > 2) converged = true;
  }
  const at = i * 2;
  out[at + 0] = x; out[at + 1] = total;
}
s[0] = total;
return i;`;
    const input = Float64Array.from({ length: 40 }, (_, i) => Math.sin(i) * 4);
    const r = both(code, [7, 1.5], [], input, 2);
    expect(r.wasmReturn).toBe(r.jsReturn);
    expect(sameBits(r.wasmOut, r.jsOut)).toBe(true);
    expect(sameBits(r.wasmState, r.jsState)).toBe(true);
    // The loop ran: counted iterations and stopped where the JavaScript did.
    expect(r.jsState[0]).toBeGreaterThan(7 + 40);
  });

  it('stops where the code stops, and takes more steps than one call holds in several calls', () => {
    const code = `"use strict";\nlet i = from;\nsteps: for (; i < to; i++) {\nconst u = input[i];\nif (u !== u) break steps;\nout[i] = u * 2;\n}\nreturn i;`;
    const length = 2 * WASM_BLOCK_STEPS + 904;
    const stop = 2 * WASM_BLOCK_STEPS + 225; // in the third call
    const input = Float64Array.from({ length }, (_, i) => i);
    expect(both(code, [0], [], input, 1).wasmReturn).toBe(length);
    input[stop] = NaN;
    const r = both(code, [0], [], input, 1);
    expect(r.jsReturn).toBe(stop);
    expect(r.wasmReturn).toBe(stop);
    expect(sameBits(r.wasmOut.subarray(0, stop), r.jsOut.subarray(0, stop))).toBe(true);
  });

  it('refuses what it does not translate, so the caller keeps the JavaScript kernel', () => {
    for (const code of ['while (true) {}', 'let a = s.length;', 'let a = `x`;', 'let a = 1; a = s[0] ** 2;', 'let a = Math.random();', 'let a = b;']) {
      expect(wasmKernel(code, 1, [], 1)).toBeNull();
    }
    expect(() => parseSubset('if (a) { b = 1;')).toThrow(SubsetError);
  });
});
