// SHA-256 and the inputs fingerprint, checked against Node's own crypto (an independent
// implementation) and the FIPS 180-4 example vectors.
import { test } from "node:test";
import assert from "node:assert/strict";
import { createHash } from "node:crypto";
import { canonicalJson, fingerprint, sha256Hex } from "../../site/js/digest.js";

const nodeSha = (data) => createHash("sha256").update(data).digest("hex");

test("FIPS 180-4 example vectors", () => {
  // NIST CSRC "Examples with intermediate values", SHA-256 "abc" and the two-block message
  assert.equal(sha256Hex("abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  assert.equal(sha256Hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq"),
    "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
  assert.equal(sha256Hex(""), "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
});

test("agrees with node:crypto at every length around the block edges", () => {
  for (let n = 0; n < 200; n++) {
    const bytes = new Uint8Array(n).map((_, i) => (i * 31 + n) & 0xff);
    assert.equal(sha256Hex(bytes), nodeSha(bytes), `length ${n}`);
  }
});

test("strings are hashed as UTF-8, like the bytes of a UTF-8 file", () => {
  const text = "diameter_µm;dN/dlogDp\n0,01;1,2e3\r\nÄ€😀";
  assert.equal(sha256Hex(text), nodeSha(Buffer.from(text, "utf-8")));
  assert.equal(sha256Hex(new TextEncoder().encode(text).buffer), nodeSha(Buffer.from(text, "utf-8")));
});

test("canonical JSON sorts keys at every depth and drops nothing else", () => {
  assert.equal(canonicalJson({ b: 1, a: [{ d: "x", c: null }], "é": "µ" }), '{"a":[{"c":null,"d":"x"}],"b":1,"é":"µ"}');
  // code-point order, as Python sorts (UTF-16 order would put U+FFFF after the emoji)
  assert.equal(canonicalJson({ "\u{1F600}": 1, "\uFFFF": 2 }), '{"\uFFFF":2,"\u{1F600}":1}');
  assert.equal(canonicalJson({ s: "a\"b\\c\n\u0001" }), '{"s":"a\\"b\\\\c\\n\\u0001"}');
});

test("fingerprint is 12 hex digits and changes with any input", () => {
  const a = fingerprint({ panels: { motion: { time: { value: "5", unit: "min" } } }, survey: {} });
  const b = fingerprint({ panels: { motion: { time: { value: "5", unit: "s" } } }, survey: {} });
  assert.match(a, /^[0-9a-f]{12}$/);
  assert.notEqual(a, b);
  assert.equal(a, fingerprint({ survey: {}, panels: { motion: { time: { unit: "min", value: "5" } } } }));
});
