"""The test browser's launch flags: the features switched off for quiet timing (QUIET_FEATURES)
are added to Playwright's own list, never put in its place.

Chromium resolves its feature switches once and shows the result on chrome://version as
"Command-line Variations" (base64 of JSON); that resolved list is what these tests read.
"""

from __future__ import annotations

import base64
import json
import re

from .conftest import CHROMIUM_ARGS, QUIET_FEATURES, chromium_args, find_chromium


def _version_page(playwright, args: list[str]) -> tuple[str, set[str]]:
    """(command line, features Chromium resolved as disabled) of a browser started with args."""
    browser = playwright.chromium.launch(executable_path=find_chromium(), args=args)
    try:
        page = browser.new_page()
        page.goto("chrome://version")
        line = page.inner_text("#command_line")
        # the page shows the value cut short; the whole one is in its markup
        encoded = max(re.findall(r"eyJ[A-Za-z0-9+/=]+", page.content()), key=len, default="e30=")
    finally:
        browser.close()
    resolved = json.loads(base64.b64decode(encoded + "=" * (-len(encoded) % 4)))
    return line, set(filter(None, resolved.get("disable-features", "").split(",")))


def test_quiet_features_join_playwrights_own_list(playwright_session) -> None:
    args = chromium_args(playwright_session)
    plain_line, plain_disabled = _version_page(playwright_session, CHROMIUM_ARGS)
    line, disabled = _version_page(playwright_session, args)
    # without the extra switch, Playwright's list is in force and the popup is not switched off
    playwright_own = set()
    for value in re.findall(r"--disable-features=(\S+)", plain_line):
        playwright_own |= set(filter(None, value.split(",")))
    assert playwright_own, "Playwright no longer passes --disable-features; chromium_args can go"
    assert playwright_own <= plain_disabled
    assert not set(QUIET_FEATURES) & plain_disabled
    # with it: every one of Playwright's features is still off, and the quiet ones too
    assert args[: len(CHROMIUM_ARGS)] == CHROMIUM_ARGS
    assert sum(a.startswith("--disable-features=") for a in args) == 1
    assert playwright_own <= disabled, sorted(playwright_own - disabled)
    assert set(QUIET_FEATURES) <= disabled
    assert line.count("--disable-features=") == 2  # Playwright's, then the merged one
