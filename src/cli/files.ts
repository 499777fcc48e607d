import * as fs from 'node:fs';
import * as path from 'node:path';
import type { ByteReader } from '../audio/byte-reader.ts';
import { WavFrameReader } from '../audio/wav-frame-reader.ts';
import { InputError } from '../errors.ts';

/** Reads a whole file; a missing or unreadable file is the user's error, named. */
export function readFileBytes(file: string, role: string): Uint8Array {
  try {
    const stat = fs.statSync(file);
    if (stat.isDirectory()) throw new InputError(file, `a ${role} file`, 'this is a directory');
    return fs.readFileSync(file);
  } catch (error) {
    if (error instanceof InputError) throw error;
    const code = (error as NodeJS.ErrnoException).code;
    throw new InputError(file, `a readable ${role} file`, code === 'ENOENT' ? 'no such file' : `cannot read it (${code ?? 'unknown error'})`);
  }
}

/** Why a file cannot be opened or read, as the user's error. */
function unreadable(file: string, role: string, error: unknown): InputError {
  if (error instanceof InputError) return error;
  const code = (error as NodeJS.ErrnoException).code;
  return new InputError(file, `a readable ${role} file`, code === 'ENOENT' ? 'no such file' : `cannot read it (${code ?? 'unknown error'})`);
}

/**
 * A file read by offset through a descriptor (the core's ByteReader), so a large
 * input is never held whole. `read` returns a view of one reused buffer.
 */
export class FileByteReader implements ByteReader {
  readonly byteLength: number;
  private readonly descriptor: number;
  private buffer = new Uint8Array(65536);

  constructor(
    readonly file: string,
    private readonly role: string,
  ) {
    try {
      const stat = fs.statSync(file);
      if (stat.isDirectory()) throw new InputError(file, `a ${role} file`, 'this is a directory');
      this.descriptor = fs.openSync(file, 'r');
      this.byteLength = fs.fstatSync(this.descriptor).size;
    } catch (error) {
      throw unreadable(file, role, error);
    }
  }

  /** Up to `length` bytes from `offset`; fewer only if the file has become shorter. */
  read(offset: number, length: number): Uint8Array {
    if (length > this.buffer.length) this.buffer = new Uint8Array(Math.max(length, 2 * this.buffer.length));
    let got = 0;
    try {
      while (got < length) {
        const n = fs.readSync(this.descriptor, this.buffer, got, length - got, offset + got);
        if (n === 0) break;
        got += n;
      }
    } catch (error) {
      throw unreadable(this.file, this.role, error);
    }
    return this.buffer.subarray(0, got);
  }

  close(): void {
    fs.closeSync(this.descriptor);
  }
}

/** Opens a WAV file for streaming: the header is checked now, the frames are read on demand. */
export function openWavFile(file: string): { frames: WavFrameReader; close: () => void } {
  const reader = new FileByteReader(file, 'WAV');
  try {
    return { frames: new WavFrameReader(reader, file), close: () => reader.close() };
  } catch (error) {
    reader.close();
    throw error;
  }
}

export function readFileText(file: string, role: string): string {
  return new TextDecoder('utf-8').decode(readFileBytes(file, role));
}

/** True if both paths name the same file (or would, once created). */
function samePath(a: string, b: string): boolean {
  const resolve = (p: string): string => {
    try {
      return fs.realpathSync(p);
    } catch {
      return path.resolve(p);
    }
  };
  return resolve(a) === resolve(b);
}

/** Throws if writing `target` would overwrite one of `inputs`. */
export function refuseInputOverwrite(target: string, inputs: readonly string[]): void {
  for (const input of inputs) {
    if (samePath(input, target)) throw new InputError(target, 'an output path different from the input files', 'it would overwrite an input');
  }
}

/**
 * Writes output without ever clobbering an input and without leaving a half
 * file: the data goes to a temporary file beside the target, then a rename.
 */
export class AtomicFile {
  private readonly temporary: string;
  private readonly descriptor: number;

  constructor(
    readonly target: string,
    inputs: readonly string[],
  ) {
    refuseInputOverwrite(target, inputs);
    const directory = path.dirname(path.resolve(target));
    if (!fs.existsSync(directory)) fs.mkdirSync(directory, { recursive: true });
    this.temporary = path.join(directory, `.${path.basename(target)}.${process.pid}.${Date.now()}.tmp`);
    this.descriptor = fs.openSync(this.temporary, 'w');
  }

  write(data: string | Uint8Array): void {
    if (typeof data === 'string') fs.writeSync(this.descriptor, data);
    else fs.writeSync(this.descriptor, data);
  }

  commit(): void {
    fs.closeSync(this.descriptor);
    fs.renameSync(this.temporary, this.target);
  }

  abandon(): void {
    try {
      fs.closeSync(this.descriptor);
    } catch {
      /* already closed */
    }
    fs.rmSync(this.temporary, { force: true });
  }
}

/** Writes a whole file atomically (see AtomicFile). */
export function writeFileAtomic(target: string, data: string | Uint8Array, inputs: readonly string[] = []): void {
  const file = new AtomicFile(target, inputs);
  try {
    file.write(data);
    file.commit();
  } catch (error) {
    file.abandon();
    throw error;
  }
}
