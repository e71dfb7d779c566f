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

/** Today's date as YYYY-MM-DD, for file names. */
export function stamp() {
  return new Date().toISOString().slice(0, 10);
}
