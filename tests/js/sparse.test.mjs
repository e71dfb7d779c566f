// The sparse snapshot reader against the format written down in build.py (write_sparse):
// "DDSPARSE", u32 total length, u32 page size, u32 pages kept, a bitmap (bit i of byte i >> 3
// set: page i kept), then the kept pages. The files here are assembled by hand from that text.
import { test } from "node:test";
import assert from "node:assert/strict";
import { SparseReader, expandSparse, streamSparse } from "../../site/js/sparse.js";

function sparseFile(total, size, pages) {
  const count = Math.ceil(total / size);
  const bitmap = new Uint8Array(Math.ceil(count / 8));
  const kept = Object.keys(pages).map(Number).sort((a, b) => a - b);
  for (const i of kept) bitmap[i >> 3] |= 1 << (i & 7);
  const out = new Uint8Array(20 + bitmap.length + kept.length * size);
  out.set(new TextEncoder().encode("DDSPARSE"));
  const view = new DataView(out.buffer);
  view.setUint32(8, total, true);
  view.setUint32(12, size, true);
  view.setUint32(16, kept.length, true);
  out.set(bitmap, 20);
  kept.forEach((i, k) => out.set(pages[i], 20 + bitmap.length + k * size));
  return out.buffer;
}

test("kept pages land at their place, the rest is zero, the length is the total", () => {
  const size = 8;
  const a = Uint8Array.from([1, 2, 3, 4, 5, 6, 7, 8]);
  const b = Uint8Array.from([9, 0, 0, 0, 0, 0, 0, 7]);
  const memory = expandSparse(sparseFile(8 * 10 + 3, size, { 0: a, 9: b, 10: new Uint8Array(8).fill(5) }));
  assert.equal(memory.length, 83);
  assert.deepEqual([...memory.subarray(0, 8)], [...a]);
  assert.ok(memory.subarray(8, 72).every((v) => v === 0));
  assert.deepEqual([...memory.subarray(72, 80)], [...b]);
  assert.deepEqual([...memory.subarray(80)], [5, 5, 5]); // the last page cut to the total
});

test("an all-zero memory keeps no page", () => {
  const memory = expandSparse(sparseFile(4096 * 3, 4096, {}));
  assert.equal(memory.length, 4096 * 3);
  assert.ok(memory.every((v) => v === 0));
});

test("refuses another format, a truncated file and a wrong page count", () => {
  const good = sparseFile(32, 8, { 1: new Uint8Array(8).fill(1) });
  const other = new Uint8Array(good.slice(0));
  other[0] = "X".charCodeAt(0);
  assert.throws(() => expandSparse(other.buffer), /not a sparse snapshot/);
  assert.throws(() => expandSparse(good.slice(0, good.byteLength - 1)), /truncated|wrong length/);
  const longer = new Uint8Array(good.byteLength + 8);
  longer.set(new Uint8Array(good));
  assert.throws(() => expandSparse(longer.buffer), /wrong length/);
  const miscounted = new Uint8Array(good.slice(0));
  new DataView(miscounted.buffer).setUint32(16, 2, true);
  assert.throws(() => expandSparse(miscounted.buffer), /wrong length/);
});

/** A Response whose body arrives in the given chunks (as a server or a cache would send it). */
function chunkedResponse(buffer, cuts) {
  const bytes = new Uint8Array(buffer);
  const chunks = [];
  let at = 0;
  for (const cut of [...cuts, bytes.length]) {
    chunks.push(bytes.slice(at, cut));
    at = cut;
  }
  return new Response(new ReadableStream({
    pull(controller) {
      if (chunks.length) controller.enqueue(chunks.shift());
      else controller.close();
    },
  }));
}

test("chunks of any size, pushed in order, give the memory the whole file gives", () => {
  const size = 8;
  const pages = { 0: Uint8Array.from([1, 2, 3, 4, 5, 6, 7, 8]), 1: new Uint8Array(8).fill(3), 4: new Uint8Array(8).fill(4), 9: Uint8Array.from([9, 0, 0, 0, 0, 0, 0, 7]), 10: new Uint8Array(8).fill(5) };
  const file = new Uint8Array(sparseFile(8 * 10 + 3, size, pages));
  const whole = expandSparse(file.buffer.slice(0));
  for (let step = 1; step <= file.length; step++) {
    const reader = new SparseReader();
    for (let at = 0; at < file.length; at += step) reader.push(file.slice(at, at + step));
    assert.deepEqual([...reader.finish()], [...whole], `chunks of ${step} bytes`);
  }
});

test("a streamed file gives its memory's length once the head is in, and the memory at the end", async () => {
  const file = sparseFile(8 * 6, 8, { 2: new Uint8Array(8).fill(2), 3: new Uint8Array(8).fill(3), 5: new Uint8Array(8).fill(6) });
  const { memory, complete } = await streamSparse(chunkedResponse(file, [5, 21, 30, 40]));
  assert.equal(memory.length, 48);
  const done = await complete;
  assert.equal(done, memory); // the same memory, now filled
  assert.deepEqual([...done], [...expandSparse(file)]);
});

test("a streamed file that stops early or runs long is refused; another format before its head", async () => {
  const file = sparseFile(8 * 6, 8, { 2: new Uint8Array(8).fill(2), 5: new Uint8Array(8).fill(6) });
  const short = await streamSparse(chunkedResponse(file.slice(0, file.byteLength - 3), [10, 25]));
  await assert.rejects(short.complete, /truncated/);
  const longer = new Uint8Array(file.byteLength + 1);
  longer.set(new Uint8Array(file));
  const long = await streamSparse(chunkedResponse(longer.buffer, [12, 21]));
  await assert.rejects(long.complete, /wrong length/);
  const other = new Uint8Array(file.slice(0));
  other[1] = 0;
  await assert.rejects(streamSparse(chunkedResponse(other.buffer, [3])), /not a sparse snapshot/);
  await assert.rejects(streamSparse(chunkedResponse(file.slice(0, 12), [4])), /truncated/);
});
