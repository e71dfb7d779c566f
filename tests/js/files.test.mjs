// Reading a picked file: files.js hands the bytes to the decoder the page installs (the
// engine's, driftdose.textfile) and never reads a file over the limit.
import { test } from "node:test";
import assert from "node:assert/strict";
import { decodeFile, useDecoder } from "../../site/js/files.js";

function fakeFile(bytes, name = "spectrum.csv") {
  let reads = 0;
  return {
    name,
    size: bytes.length,
    get reads() { return reads; },
    async arrayBuffer() { reads += 1; return bytes.buffer.slice(0); },
  };
}

test("without a decoder nothing is read and the refusal says why", async () => {
  useDecoder(null);
  const file = fakeFile(new Uint8Array([65, 66]));
  const got = await decodeFile(file);
  assert.equal(got.ok, false);
  assert.match(got.message, /engine/);
  assert.equal(file.reads, 0);
});

test("the bytes go to the decoder with limit, name and size, and come back with the reply", async () => {
  const calls = [];
  useDecoder(async (bytes, limit, name, size) => {
    calls.push({ bytes: Array.from(bytes), limit, name, size });
    return { ok: true, text: "AB", size_text: "2 bytes", notes: [] };
  });
  const file = fakeFile(new Uint8Array([65, 66]));
  const got = await decodeFile(file, 100);
  assert.deepEqual(calls, [{ bytes: [65, 66], limit: 100, name: "spectrum.csv", size: 2 }]);
  assert.equal(got.text, "AB");
  assert.deepEqual(Array.from(got.bytes), [65, 66]);
});

test("a file over the limit is refused by the decoder's words without being read", async () => {
  const calls = [];
  useDecoder(async (bytes, limit, name, size) => {
    calls.push([bytes, limit, name, size]);
    return { ok: false, message: `${name} is big; the limit is ${limit}.` };
  });
  const file = fakeFile(new Uint8Array(11), "x".repeat(100));
  const got = await decodeFile(file, 10);
  assert.equal(file.reads, 0);
  assert.deepEqual(calls, [[null, 10, "x".repeat(80), 11]]);
  assert.equal(got.ok, false);
});
