// Reader of the sparse snapshot file written by build.py (write_sparse): the engine memory with
// its all-zero pages left out. Used by the calculation worker; no other dependency.
//
// Format: "DDSPARSE", u32 total length, u32 page size, u32 pages kept (little-endian), a bitmap
// (bit i of byte i >> 3 set: page i kept), then the kept pages in order.
//
// The file can be read as it arrives (`SparseReader.push` per chunk of the response's body):
// each chunk is copied straight to its place in the memory, so the memory is ready when the
// last chunk is, with no copy of the whole file first and no pass over it afterwards.

const HEAD = 20;

/** Expands a sparse snapshot file fed to it in chunks of any size, in order. */
export class SparseReader {
  constructor() {
    this.start = []; // chunks kept until the head and the bitmap have arrived
    this.startBytes = 0;
    this.memory = null;
    this.runs = null; // [memory offset, bytes] of each run of kept pages, in file order
    this.run = 0; // the run being filled, and how much of it is filled
    this.filled = 0;
    this.view = null;
  }

  /** Take the next chunk (a Uint8Array) of the file. */
  push(chunk) {
    if (this.memory) {
      this.copy(chunk);
      return;
    }
    this.start.push(chunk);
    this.startBytes += chunk.length;
    if (this.startBytes < HEAD) return;
    const head = this.joined();
    const magic = new TextDecoder().decode(head.subarray(0, 8));
    if (magic !== "DDSPARSE") throw new Error("not a sparse snapshot");
    const view = new DataView(head.buffer, head.byteOffset, HEAD);
    const total = view.getUint32(8, true);
    const size = view.getUint32(12, true);
    const count = view.getUint32(16, true);
    if (size === 0) throw new Error("not a sparse snapshot");
    const pages = Math.ceil(total / size);
    const bitmapBytes = Math.ceil(pages / 8);
    if (head.length < HEAD + bitmapBytes) return; // the bitmap is not complete yet
    const bitmap = head.subarray(HEAD, HEAD + bitmapBytes);
    const runs = [];
    let kept = 0;
    for (let i = 0; i < pages; i++) {
      if (!((bitmap[i >> 3] >> (i & 7)) & 1)) continue;
      kept++;
      const last = runs[runs.length - 1];
      if (last && last[0] + last[1] === i * size) last[1] += size;
      else runs.push([i * size, size]);
    }
    if (kept !== count) throw new Error("sparse snapshot has the wrong length");
    this.runs = runs;
    this.memory = new Uint8Array(pages * size);
    this.view = this.memory.subarray(0, total); // what finish() returns
    this.start = null;
    this.copy(head.subarray(HEAD + bitmapBytes));
  }

  /** The chunks received so far as one array (only while the head is incomplete). */
  joined() {
    if (this.start.length === 1) return this.start[0];
    const out = new Uint8Array(this.startBytes);
    let at = 0;
    for (const c of this.start) {
      out.set(c, at);
      at += c.length;
    }
    this.start = [out];
    return out;
  }

  copy(chunk) {
    let at = 0;
    while (at < chunk.length) {
      const run = this.runs[this.run];
      if (!run) throw new Error("sparse snapshot has the wrong length");
      const n = Math.min(run[1] - this.filled, chunk.length - at);
      this.memory.set(chunk.subarray(at, at + n), run[0] + this.filled);
      at += n;
      this.filled += n;
      if (this.filled === run[1]) {
        this.run++;
        this.filled = 0;
      }
    }
  }

  /** The expanded memory, once the whole file has been pushed. */
  finish() {
    if (!this.memory) {
      if (this.startBytes >= 8 && new TextDecoder().decode(this.joined().subarray(0, 8)) !== "DDSPARSE") {
        throw new Error("not a sparse snapshot");
      }
      throw new Error("sparse snapshot is truncated");
    }
    if (this.run !== this.runs.length) throw new Error("sparse snapshot is truncated");
    return this.view;
  }
}

/** Expand build.py's sparse snapshot file (all-zero pages left out) into the engine's memory. */
export function expandSparse(buffer) {
  const reader = new SparseReader();
  reader.push(new Uint8Array(buffer));
  return reader.finish();
}

/**
 * Start reading a response's body as a sparse snapshot file. Resolves once the file's head has
 * arrived, with `memory` (the engine's memory at its full length, still being filled) and
 * `complete` (resolves with the same memory once the last chunk is in place, or rejects).
 */
export async function streamSparse(response) {
  const reader = new SparseReader();
  if (!response.body || typeof response.body.getReader !== "function") {
    reader.push(new Uint8Array(await response.arrayBuffer()));
    const memory = reader.finish();
    return { memory, complete: Promise.resolve(memory) };
  }
  const body = response.body.getReader();
  const next = async () => {
    const { done, value } = await body.read();
    if (done) return false;
    reader.push(value);
    return true;
  };
  const failed = (err) => {
    body.cancel().catch(() => {});
    throw err;
  };
  try {
    while (!reader.memory) {
      if (!(await next())) reader.finish(); // the file ended before its head: throws
    }
  } catch (err) {
    failed(err);
  }
  const complete = (async () => {
    try {
      while (await next());
    } catch (err) {
      failed(err);
    }
    return reader.finish();
  })();
  return { memory: reader.view, complete };
}

/** Read a response's body as a sparse snapshot file, expanding each chunk as it arrives. */
export async function readSparse(response) {
  return (await streamSparse(response)).complete;
}
