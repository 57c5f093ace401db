"""Headless Chromium for the memo tests: print to PDF, screenshot, dump the DOM, log the network.

Locally the browser tests skip when no chromium is installed; under CI=true they must run.
"""

from __future__ import annotations

import json
import os
import shutil
import subprocess
from pathlib import Path

import pytest

FLAGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--disable-extensions",
]


def chromium() -> str:
    path = shutil.which("chromium") or shutil.which("chromium-browser")
    if path is None:
        if os.environ.get("CI") == "true":
            pytest.fail("chromium is required under CI (installed by .ci/run)")
        pytest.skip("chromium is not installed")
    return path


def run(args: list[str], profile: Path, timeout: float = 120.0) -> subprocess.CompletedProcess:
    cmd = [chromium(), *FLAGS, f"--user-data-dir={profile}", *args]
    return subprocess.run(cmd, capture_output=True, text=True, timeout=timeout, check=False)


def print_pdf(page: Path, out: Path, profile: Path) -> Path:
    run(["--no-pdf-header-footer", f"--print-to-pdf={out}", page.resolve().as_uri()], profile)
    assert out.exists() and out.stat().st_size > 0, "chromium wrote no PDF"
    return out


def screenshot(page: Path, out: Path, profile: Path, size: str = "1000,1400") -> Path:
    run([f"--screenshot={out}", f"--window-size={size}", page.resolve().as_uri()], profile)
    assert out.exists(), "chromium wrote no screenshot"
    return out


def dump_dom(page: Path, profile: Path, netlog: Path | None = None) -> str:
    extra = [f"--log-net-log={netlog}", "--net-log-capture-mode=Default"] if netlog else []
    result = run([*extra, "--virtual-time-budget=3000", "--dump-dom", page.resolve().as_uri()], profile)
    return result.stdout


def page_requests(netlog: Path) -> set[str]:
    """URLs the page itself asked for (the browser's own background requests carry no page initiator)."""
    log = json.loads(netlog.read_text() or "{}") if netlog.exists() else {}
    out = set()
    for event in log.get("events", []):
        params = event.get("params") or {}
        initiator = params.get("initiator")
        if params.get("url") and isinstance(initiator, str) and (initiator == "null" or initiator.startswith("file")):
            out.add(params["url"])
    return out
