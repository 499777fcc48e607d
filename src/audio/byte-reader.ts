/**
 * Random access to the bytes of a file without holding the file: the core reads
 * WAVE headers and sample blocks through this, the Node shell backs it with a
 * file descriptor (src/cli/files.ts), a test or the page with an array.
 */
export interface ByteReader {
  /** Total bytes in the file. */
  readonly byteLength: number;
  /**
   * The `length` bytes from `offset` (the caller keeps within byteLength). The
   * view may be reused by the next call: copy what must outlive it.
   */
  read(offset: number, length: number): Uint8Array;
}

/** A ByteReader over bytes already in memory (no copy). */
export function bytesReader(bytes: Uint8Array): ByteReader {
  return { byteLength: bytes.length, read: (offset, length) => bytes.subarray(offset, offset + length) };
}
