// Reader of the sparse snapshot file written by build.py (write_sparse): the engine memory with
// its all-zero pages left out. Used by the calculation worker; no other dependency.

/** Expand build.py's sparse snapshot file (all-zero pages left out) into the engine's memory. */
export function expandSparse(buffer) {
  const head = new DataView(buffer, 0, 20);
  const magic = new TextDecoder().decode(new Uint8Array(buffer, 0, 8));
  if (magic !== "DDSPARSE") throw new Error("not a sparse snapshot");
  const total = head.getUint32(8, true);
  const size = head.getUint32(12, true);
  const count = head.getUint32(16, true);
  const pages = Math.ceil(total / size);
  const bitmap = new Uint8Array(buffer, 20, Math.ceil(pages / 8));
  const memory = new Uint8Array(pages * size);
  let pos = 20 + bitmap.length;
  let kept = 0;
  for (let i = 0; i < pages; i++) {
    if ((bitmap[i >> 3] >> (i & 7)) & 1) {
      if (pos + size > buffer.byteLength) throw new Error("sparse snapshot is truncated");
      memory.set(new Uint8Array(buffer, pos, size), i * size);
      pos += size;
      kept++;
    }
  }
  if (kept !== count || pos !== buffer.byteLength) throw new Error("sparse snapshot has the wrong length");
  return memory.subarray(0, total);
}
