/**
 * The few pieces of the WebAssembly binary format (WebAssembly Core Specification 2.0, ch. 5)
 * a step kernel needs: LEB128 integers, IEEE doubles, and a module of one exported function
 * that imports its memory and two functions of one double.
 */

/** Opcodes used (spec §5.4). */
export const OP = {
  block: 0x02,
  loop: 0x03,
  if: 0x04,
  else: 0x05,
  end: 0x0b,
  br: 0x0c,
  brIf: 0x0d,
  return: 0x0f,
  call: 0x10,
  localGet: 0x20,
  localSet: 0x21,
  f64Load: 0x2b,
  f64Store: 0x39,
  i32Const: 0x41,
  f64Const: 0x44,
  i32Eqz: 0x45,
  i32Eq: 0x46,
  i32Ne: 0x47,
  i32LtS: 0x48,
  i32GtS: 0x4a,
  i32LeS: 0x4c,
  i32GeS: 0x4e,
  f64Eq: 0x61,
  f64Ne: 0x62,
  f64Lt: 0x63,
  f64Gt: 0x64,
  f64Le: 0x65,
  f64Ge: 0x66,
  i32Add: 0x6a,
  i32Sub: 0x6b,
  i32Mul: 0x6c,
  i32And: 0x71,
  i32Or: 0x72,
  i32Shl: 0x74,
  f64Abs: 0x99,
  f64Neg: 0x9a,
  f64Sqrt: 0x9f,
  f64Add: 0xa0,
  f64Sub: 0xa1,
  f64Mul: 0xa2,
  f64Div: 0xa3,
  f64Min: 0xa4,
  f64Max: 0xa5,
  f64ConvertI32S: 0xb7,
  /** Prefix 0xfc, then 2: i32.trunc_sat_f64_s. */
  saturatingPrefix: 0xfc,
} as const;

export const TYPE = { i32: 0x7f, f64: 0x7c, empty: 0x40, func: 0x60 } as const;

/** A growable byte buffer with the format's integer encodings. */
export class ByteWriter {
  private bytes = new Uint8Array(1024);
  length = 0;
  private readonly scratch = new DataView(new ArrayBuffer(8));

  byte(value: number): void {
    if (this.length === this.bytes.length) {
      const grown = new Uint8Array(this.bytes.length * 2);
      grown.set(this.bytes);
      this.bytes = grown;
    }
    this.bytes[this.length++] = value;
  }

  unsigned(value: number): void {
    do {
      let b = value & 0x7f;
      value = Math.floor(value / 128);
      if (value !== 0) b |= 0x80;
      this.byte(b);
    } while (value !== 0);
  }

  signed(value: number): void {
    for (;;) {
      const b = value & 0x7f;
      value >>= 7;
      const done = (value === 0 && (b & 0x40) === 0) || (value === -1 && (b & 0x40) !== 0);
      this.byte(done ? b : b | 0x80);
      if (done) return;
    }
  }

  f64(value: number): void {
    this.scratch.setFloat64(0, value, true);
    for (let i = 0; i < 8; i++) this.byte(this.scratch.getUint8(i));
  }

  append(other: ByteWriter | Uint8Array): void {
    const b = other instanceof ByteWriter ? other.result() : other;
    for (let i = 0; i < b.length; i++) this.byte(b[i]);
  }

  name(text: string): void {
    this.unsigned(text.length);
    for (let i = 0; i < text.length; i++) this.byte(text.charCodeAt(i));
  }

  result(): Uint8Array {
    return this.bytes.slice(0, this.length);
  }
}

/**
 * A module of one function `run(i32, i32) → i32` with the given local types and body,
 * importing `m.memory` (at least `pages` pages) and `m.exp`, `m.log` (f64 → f64, function
 * indices 0 and 1).
 */
export function kernelModule(localTypes: readonly number[], body: ByteWriter, pages: number): Uint8Array {
  const out = new ByteWriter();
  out.append(Uint8Array.of(0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00));
  const section = (id: number, content: ByteWriter): void => {
    out.byte(id);
    out.unsigned(content.length);
    out.append(content);
  };
  const types = new ByteWriter();
  types.unsigned(2);
  types.append(Uint8Array.of(TYPE.func, 2, TYPE.i32, TYPE.i32, 1, TYPE.i32));
  types.append(Uint8Array.of(TYPE.func, 1, TYPE.f64, 1, TYPE.f64));
  section(1, types);
  const imports = new ByteWriter();
  imports.unsigned(3);
  imports.name('m');
  imports.name('memory');
  imports.append(Uint8Array.of(0x02, 0x00));
  imports.unsigned(pages);
  for (const fn of ['exp', 'log']) {
    imports.name('m');
    imports.name(fn);
    imports.byte(0x00);
    imports.unsigned(1);
  }
  section(2, imports);
  const functions = new ByteWriter();
  functions.unsigned(1);
  functions.unsigned(0);
  section(3, functions);
  const exports = new ByteWriter();
  exports.unsigned(1);
  exports.name('run');
  exports.byte(0x00);
  exports.unsigned(2);
  section(7, exports);
  // Locals in runs of one type.
  const runs: [number, number][] = [];
  for (const t of localTypes) {
    const last = runs[runs.length - 1];
    if (last && last[1] === t) last[0]++;
    else runs.push([1, t]);
  }
  const fn = new ByteWriter();
  fn.unsigned(runs.length);
  for (const [count, t] of runs) {
    fn.unsigned(count);
    fn.byte(t);
  }
  fn.append(body);
  fn.byte(OP.end);
  const code = new ByteWriter();
  code.unsigned(1);
  code.unsigned(fn.length);
  code.append(fn);
  section(10, code);
  return out.result();
}
