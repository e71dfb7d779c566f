// Build-time runner of the vendored Pyodide under Node (called by build.py, not shipped).
//
//   node site/engine-build/engine.mjs < JOB.json
//
// JOB = {indexURL, stdLibURL?, env, clock?, entropy?, files: {enginePath: hostPath},
//        script: hostPath, outputs: {enginePath: hostPath}, snapshot?: hostPath}
// `clock` (seconds since 1970) fixes Date.now(), which the engine's file system and clock read,
// and turns performance.now() into a counter, so that file times and the allocator's clock-based
// seeds inside a snapshot do not depend on when the build ran. `entropy` (a text)
// replaces the random bytes the engine asks Node for (its allocator's keys, os.urandom) by a
// SHA-256 counter stream from that text: a snapshot is then the same on every build. The job comes on
// standard input so that no temporary path reaches the engine's memory.
// Starts the engine (with `_makeSnapshot` when a snapshot is wanted), copies `files` into its
// file system, runs the Python `script`, copies `outputs` back to the host and, if asked,
// writes a memory snapshot of the started engine. Prints one JSON line: the script's result
// (the value of its last expression, a JSON string) and the engine's facts.
import nodeCrypto from "node:crypto";
import { readFileSync, writeFileSync } from "node:fs";
import { loadPyodide } from "../node_modules/pyodide/pyodide.mjs";

try {
  const job = JSON.parse(readFileSync(0, "utf8"));
  if (job.clock !== undefined) {
    const fixed = job.clock * 1000;
    Date.now = () => fixed;
    // the allocator also seeds itself from the monotonic clock: make that a counter
    let ticks = 0;
    performance.now = () => (ticks += 0.001);
  }
  if (job.entropy !== undefined) {
    let counter = 0;
    nodeCrypto.randomFillSync = (view) => {
      const bytes = new Uint8Array(view.buffer, view.byteOffset, view.byteLength);
      for (let pos = 0; pos < bytes.length; pos += 32) {
        const block = nodeCrypto.createHash("sha256").update(`${job.entropy}:${counter++}`).digest();
        bytes.set(block.subarray(0, Math.min(32, bytes.length - pos)), pos);
      }
      return view;
    };
  }
  const pyodide = await loadPyodide({
    indexURL: job.indexURL,
    ...(job.stdLibURL ? { stdLibURL: job.stdLibURL } : {}),
    env: job.env || {},
    packages: [],
    // what a browser gives (Emscripten's default under Node is this script's path)
    _sysExecutable: "./this.program",
    ...(job.snapshot ? { _makeSnapshot: true } : {}),
  });
  for (const [enginePath, hostPath] of Object.entries(job.files || {})) {
    pyodide.FS.mkdirTree(enginePath.slice(0, enginePath.lastIndexOf("/")) || "/");
    pyodide.FS.writeFile(enginePath, readFileSync(hostPath));
  }
  const filename = `engine-build/${job.script.split("/").pop()}`; // no checkout path in the memory
  const result = pyodide.runPython(readFileSync(job.script, "utf8"), { filename });
  for (const [enginePath, hostPath] of Object.entries(job.outputs || {})) {
    writeFileSync(hostPath, pyodide.FS.readFile(enginePath));
  }
  const facts = { version: pyodide.version, sitePackages: pyodide._api.sitePackages };
  if (job.snapshot) {
    const snapshot = pyodide.makeMemorySnapshot();
    writeFileSync(job.snapshot, snapshot);
    facts.snapshotBytes = snapshot.length;
  }
  process.stdout.write(JSON.stringify({ result: result === undefined ? null : String(result), facts }) + "\n");
} catch (err) {
  // only the message: Node would print a line of the minified engine, 1 MB long
  process.stderr.write(`engine job failed: ${err && err.message ? err.message : err}\n`);
  process.exit(1);
}
