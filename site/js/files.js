// Downloads and file reading for exports and saved inputs (no server involved).

/** Offer `text` (or a Blob) as a download named `filename`. */
export function download(filename, content, type = "text/plain;charset=utf-8") {
  const blob = content instanceof Blob ? content : new Blob([content], { type });
  const url = URL.createObjectURL(blob);
  const link = document.createElement("a");
  link.href = url;
  link.download = filename;
  document.body.append(link);
  link.click();
  link.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** Read a user-chosen file as text, refusing files larger than `maxBytes`. */
export async function readText(file, maxBytes = 5 * 1024 * 1024) {
  if (file.size > maxBytes) {
    throw new Error(`The file is ${(file.size / 1e6).toFixed(1)} MB; the limit is ${(maxBytes / 1e6).toFixed(0)} MB.`);
  }
  return file.text();
}

let decoder = null;

/** Route the reading of picked files through `fn(bytes, limit, name, size)`: the engine's
 * core decoder (UTF-8, byte-order marks, UTF-16, Latin-1), shared with the command line. */
export function useDecoder(fn) {
  decoder = fn;
}

/**
 * Read a picked file with the core's decoder. Resolves with {ok, text, size_text, notes,
 * bytes} or {ok: false, message}; a file over `maxBytes` is refused without being read.
 */
export async function decodeFile(file, maxBytes = 5 * 1024 * 1024) {
  const name = file.name.slice(0, 80);
  if (!decoder) return { ok: false, message: "The calculation engine is not available." };
  if (file.size > maxBytes) return decoder(null, maxBytes, name, file.size);
  const bytes = new Uint8Array(await file.arrayBuffer());
  return { ...(await decoder(bytes, maxBytes, name, file.size)), bytes };
}

let describer = null;

/** Route the description of decoded files through `fn(purpose, text, headerLine)`: the
 * engine's measured-file reader (separator, header, preview, column pickers). */
export function useDescriber(fn) {
  describer = fn;
}

/** Describe a decoded file's text; resolves with the reader's reply ({ok: false, message}
 * while no engine is there). */
export async function describeText(purpose, text, headerLine = 0) {
  if (!describer) return { ok: false, field: null, message: "The calculation engine is not available." };
  return describer(purpose, text, headerLine);
}

/** Today's date as YYYY-MM-DD, for file names. */
export function stamp() {
  return new Date().toISOString().slice(0, 10);
}
