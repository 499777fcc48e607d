import * as fs from 'node:fs';
import * as path from 'node:path';
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
