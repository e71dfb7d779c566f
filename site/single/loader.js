// Inline loader of the single-file edition (its hash is in the page's Content-Security-Policy):
// makes the embedded runtime module a blob: URL and starts it.
(() => {
  const manifest = JSON.parse(document.getElementById("dd-manifest").textContent);
  const text = document.getElementById(manifest.files[manifest.runtime].id).textContent;
  const bin = atob(text);
  const bytes = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
  const url = URL.createObjectURL(new Blob([bytes], { type: "text/javascript" }));
  import(url)
    .then((runtime) => runtime.startPage(manifest))
    .catch((err) => {
      console.error(err);
      document.documentElement.dataset.engine = "failed";
    });
})();
