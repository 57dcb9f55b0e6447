"""Open an HTML file in headless Chromium once: screenshot, PDF, the DOM after rendering and the
network requests the page made (Chromium's own net log), all from one browser start."""

from __future__ import annotations

import json
import os
import shutil
import subprocess
from dataclasses import dataclass
from html.parser import HTMLParser
from pathlib import Path

import pytest

from carbonledger.io.report import chromium_command, find_chromium

WINDOW = (1100, 1400)  # CSS pixels of the screenshot


def chromium_or_skip() -> str:
    """Chromium's path; under CI=true its absence fails the test (.ci/run installs it)."""
    found = find_chromium()
    if found is None or shutil.which("pdfinfo") is None:
        if os.environ.get("CI", "").lower() == "true":
            pytest.fail("Chromium and pdfinfo are required under CI=true; .ci/run installs the Debian packages chromium and poppler-utils")
        pytest.skip("Chromium or pdfinfo (poppler-utils) not installed here")
    return found


@dataclass
class Rendered:
    dom: str  # the document after rendering (--dump-dom)
    screenshot: Path
    pdf: Path
    page_requests: list[str]  # URLs the page itself requested over the network


def page_requests(net_log: Path) -> list[str]:
    """URLs requested on behalf of a file:// page (Chromium's own background traffic is left out:
    its requests carry no file:// network isolation key)."""
    data = json.loads(net_log.read_text(encoding="utf-8", errors="replace").rstrip().rstrip(",") or "{}")
    types = {number: name for name, number in data.get("constants", {}).get("logEventTypes", {}).items()}
    urls = []
    for event in data.get("events", []):
        params = event.get("params") or {}
        if types.get(event.get("type")) == "URL_REQUEST_START_JOB" and str(params.get("network_isolation_key", "")).startswith("file://"):
            urls.append(params.get("url", ""))
    return urls


def render(html_file: Path, folder: Path) -> Rendered:
    """One Chromium start: screenshot at WINDOW, print to PDF, dump the DOM, log the network."""
    chromium = chromium_or_skip()
    folder.mkdir(parents=True, exist_ok=True)
    shot, pdf, net = folder / "shot.png", folder / "page.pdf", folder / "net.json"
    command = chromium_command(chromium) + [
        f"--user-data-dir={folder / 'profile'}",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        f"--window-size={WINDOW[0]},{WINDOW[1]}",
        f"--screenshot={shot}",
        f"--print-to-pdf={pdf}",
        "--no-pdf-header-footer",
        f"--log-net-log={net}",
        "--dump-dom",
        html_file.resolve().as_uri(),
    ]
    done = subprocess.run(command, capture_output=True, timeout=180)
    assert done.returncode == 0, done.stderr.decode("utf-8", "replace")[-800:]
    return Rendered(done.stdout.decode("utf-8"), shot, pdf, page_requests(net))


class _Text(HTMLParser):
    """The visible text of a DOM, and every URL-bearing attribute."""

    def __init__(self):
        super().__init__(convert_charrefs=True)
        self.parts: list[str] = []
        self.urls: list[tuple[str, str, str]] = []
        self.skip = 0

    def handle_starttag(self, tag, attrs):
        if tag in ("style", "script"):
            self.skip += 1
        for name, value in attrs:
            if name in ("src", "href", "xlink:href", "srcset", "poster", "data", "action", "background") and value:
                self.urls.append((tag, name, value))

    def handle_endtag(self, tag):
        if tag in ("style", "script"):
            self.skip -= 1

    def handle_data(self, data):
        if not self.skip:
            self.parts.append(data)


def visible_text(dom: str) -> str:
    parser = _Text()
    parser.feed(dom)
    return " ".join(" ".join(parser.parts).split())


def url_attributes(dom: str) -> list[tuple[str, str, str]]:
    parser = _Text()
    parser.feed(dom)
    return parser.urls


def pdf_info(pdf: Path) -> dict[str, str]:
    """pdfinfo (poppler-utils) as a dict: 'Pages', 'Page size', ..."""
    done = subprocess.run(["pdfinfo", str(pdf)], capture_output=True, text=True, check=True)
    return {key.strip(): value.strip() for key, _, value in (line.partition(":") for line in done.stdout.splitlines())}
