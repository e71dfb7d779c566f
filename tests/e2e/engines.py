"""Drivers for browser engines other than Chromium, from Debian's own packages.

Playwright drives only its own builds of Firefox and WebKit, which cannot be installed here, so:

- **Firefox** (Debian's ``firefox-esr``): started headless with ``--marionette`` and driven by
  the small client below over Firefox's Marionette protocol (length-prefixed JSON over a local
  TCP socket: ``[0, id, command, params]`` answered by ``[1, id, error, result]``). With
  ``MOZ_REMOTE_ALLOW_SYSTEM_ACCESS`` set, the client also reads the browser's console service,
  so policy violations and script errors of the page are seen.
- **WebKit** (WebKitGTK from ``gir1.2-webkit2-4.1``): ``webkit_page.py`` runs under Debian's
  own ``python3`` (which has the ``gi`` bindings) inside ``xvfb-run``, loads the page and
  reports its state as one JSON line.

Every run is bounded in time, and every browser process started here is ended by its own
process group.
"""

from __future__ import annotations

import json
import os
import shutil
import signal
import socket
import subprocess
import tempfile
import time
from pathlib import Path
from typing import Any

HERE = Path(__file__).resolve().parent
SYSTEM_PYTHON = "/usr/bin/python3"

# Prefs that keep Firefox's own background traffic off and any outside request of the page
# unanswered (a proxy on the discard port); file:, blob: and data: URLs do not use it.
FIREFOX_PREFS = {
    "browser.shell.checkDefaultBrowser": False,
    "browser.startup.homepage_override.mstone": "ignore",
    "app.update.enabled": False,
    "app.normandy.enabled": False,
    "extensions.update.enabled": False,
    "extensions.getAddons.cache.enabled": False,
    "datareporting.policy.dataSubmissionEnabled": False,
    "datareporting.healthreport.uploadEnabled": False,
    "toolkit.telemetry.enabled": False,
    "browser.safebrowsing.malware.enabled": False,
    "browser.safebrowsing.phishing.enabled": False,
    "network.captive-portal-service.enabled": False,
    "network.connectivity-service.enabled": False,
    "network.proxy.type": 1,
    "network.proxy.http": "127.0.0.1",
    "network.proxy.http_port": 9,
    "network.proxy.ssl": "127.0.0.1",
    "network.proxy.ssl_port": 9,
    "network.proxy.allow_hijacking_localhost": True,
}

# Console messages of the page that count as errors (nsIScriptError.flags 0 = error).
CONSOLE_JS = """
return Services.console.getMessageArray().flatMap((m) => {
  try { m.QueryInterface(Ci.nsIScriptError); } catch (e) { return []; }
  const content = m.innerWindowID > 0 || /^(file|blob|data):/.test(m.sourceName || "")
    || String(m.category).startsWith("CSP");
  return m.flags === 0 && content ? [`${m.category}: ${m.errorMessage} (${m.sourceName})`] : [];
});
"""


def firefox_binary() -> str | None:
    return shutil.which("firefox-esr") or shutil.which("firefox")


def webkit_available() -> str | None:
    """None when WebKitGTK can run here, else the reason it cannot."""
    if not shutil.which("xvfb-run"):
        return "xvfb-run is not installed (Debian package xvfb)"
    if not os.path.exists(SYSTEM_PYTHON):
        return f"{SYSTEM_PYTHON} (with the gi bindings) is not installed"
    probe = subprocess.run(
        [
            SYSTEM_PYTHON,
            "-c",
            "import gi; gi.require_version('WebKit2', '4.1'); from gi.repository import WebKit2",
        ],
        capture_output=True,
        timeout=60,
    )
    if probe.returncode:
        return (
            "WebKitGTK for Python is not installed (Debian packages python3-gi, gir1.2-webkit2-4.1)"
        )
    return None


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class Firefox:
    """A headless Firefox with a Marionette session; use as a context manager."""

    def __init__(self, binary: str, timeout: float = 60.0) -> None:
        self.port = _free_port()
        self.profile = tempfile.mkdtemp(prefix="dd-firefox-")
        prefs = {**FIREFOX_PREFS, "marionette.port": self.port}
        with open(os.path.join(self.profile, "user.js"), "w", encoding="utf-8") as fh:
            for key, value in prefs.items():
                fh.write(f"user_pref({json.dumps(key)}, {json.dumps(value)});\n")
        env = dict(os.environ, MOZ_REMOTE_ALLOW_SYSTEM_ACCESS="1", MOZ_HEADLESS="1")
        self.process = subprocess.Popen(
            [binary, "--headless", "--marionette", "--no-remote", "--profile", self.profile],
            stdout=subprocess.DEVNULL,
            stderr=subprocess.DEVNULL,
            env=env,
            start_new_session=True,  # its own process group, ended as a whole in close()
        )
        self.next_id = 0
        self.buffer = b""
        self.sock = self._connect(timeout)
        self._receive()  # the server's greeting
        self.command("WebDriver:NewSession", {"capabilities": {"pageLoadStrategy": "none"}})

    def _connect(self, timeout: float) -> socket.socket:
        end = time.monotonic() + timeout
        while True:
            try:
                return socket.create_connection(("127.0.0.1", self.port), timeout=timeout)
            except OSError:
                if time.monotonic() > end or self.process.poll() is not None:
                    self.close()
                    raise RuntimeError("Firefox did not open its Marionette port") from None
                time.sleep(0.2)

    def _receive(self) -> Any:
        while b":" not in self.buffer:
            self.buffer += self._chunk()
        size, rest = self.buffer.split(b":", 1)
        while len(rest) < int(size):
            rest += self._chunk()
        message, self.buffer = rest[: int(size)], rest[int(size) :]
        return json.loads(message)

    def _chunk(self) -> bytes:
        data = self.sock.recv(1 << 16)
        if not data:
            raise RuntimeError("Firefox closed the Marionette connection")
        return data

    def command(self, name: str, params: dict[str, Any]) -> Any:
        self.next_id += 1
        data = json.dumps([0, self.next_id, name, params]).encode()
        self.sock.sendall(str(len(data)).encode() + b":" + data)
        while True:
            reply = self._receive()
            if reply[0] == 1 and reply[1] == self.next_id:
                break
        if reply[2]:
            raise RuntimeError(f"{name}: {reply[2].get('message', reply[2])}")
        return reply[3]

    def script(self, source: str, chrome: bool = False) -> Any:
        """Run ``source`` (a function body with ``return``) in the page, or in the browser."""
        self.command("Marionette:SetContext", {"value": "chrome" if chrome else "content"})
        return self.command("WebDriver:ExecuteScript", {"script": source, "args": []})["value"]

    def console_errors(self) -> list[str]:
        return self.script(CONSOLE_JS, chrome=True)

    def close(self) -> None:
        try:
            os.killpg(self.process.pid, signal.SIGTERM)
            self.process.wait(timeout=20)
        except (ProcessLookupError, subprocess.TimeoutExpired):
            try:
                os.killpg(self.process.pid, signal.SIGKILL)
            except ProcessLookupError:
                pass
        shutil.rmtree(self.profile, ignore_errors=True)

    def __enter__(self) -> Firefox:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()


def run_webkit(url: str, timeout: float) -> dict[str, Any]:
    """Open ``url`` in WebKitGTK under xvfb-run; return the page's report (see webkit_page.py)."""
    done = subprocess.run(
        ["xvfb-run", "-a", SYSTEM_PYTHON, str(HERE / "webkit_page.py"), url, str(timeout)],
        capture_output=True,
        text=True,
        timeout=timeout + 60,
        start_new_session=True,
    )
    lines = [ln for ln in done.stdout.splitlines() if ln.startswith("RESULT ")]
    if not lines:
        raise RuntimeError(f"WebKitGTK gave no result: {done.stdout[-2000:]} {done.stderr[-2000:]}")
    report = json.loads(lines[-1][len("RESULT ") :])
    report["console_errors"] = [
        ln for ln in done.stdout.splitlines() if "CONSOLE" in ln and "ERROR" in ln
    ]
    return report
