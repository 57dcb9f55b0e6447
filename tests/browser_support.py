"""Open HTML files in ONE headless Chromium (the DevTools Protocol over a pipe): for each page a
screenshot, a PDF, the DOM after rendering and the network requests the page made."""

from __future__ import annotations

import base64
import json
import os
import select
import shutil
import subprocess
import time
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
    dom: str  # the document after rendering (outerHTML)
    screenshot: Path
    pdf: Path
    page_requests: list[str]  # URLs the page itself requested (other than the page)
    charts: list[dict]  # every inline SVG chart as laid out: its title and rendered size in CSS pixels
    measured: dict = None  # the values of the expressions asked for (``render(..., measure=)``)


CHART_BOXES = """[...document.querySelectorAll('svg.chart')].map(svg => {
  const box = svg.getBoundingClientRect();
  return {title: svg.querySelector('title').textContent, width: box.width, height: box.height};
})"""


class Browser:
    """ONE headless Chromium for every page of a test session, driven over the Chrome DevTools
    Protocol on the pipe Chromium opens with ``--remote-debugging-pipe`` (commands on fd 3,
    replies on fd 4, each message JSON ended by a NUL byte). Each page gets its own tab: navigate,
    wait for the load event, read the DOM, take a screenshot at WINDOW, print to PDF with the
    page's own CSS paper size, and list the network requests it made (Network.requestWillBeSent).

    References
    ----------
    Chrome DevTools Protocol, domains Target, Page, Network, Runtime and Emulation
    (chromedevtools.github.io/devtools-protocol); Chromium's switch --remote-debugging-pipe.
    """

    def __init__(self, folder: Path):
        chromium = chromium_or_skip()
        folder.mkdir(parents=True, exist_ok=True)
        command_read, self._command_write = os.pipe()
        self._reply_read, reply_write = os.pipe()

        def wire_pipes() -> None:  # in the child, before exec: Chromium reads fd 3 and writes fd 4
            os.dup2(command_read, 3)
            os.dup2(reply_write, 4)

        command = chromium_command(chromium) + [
            f"--user-data-dir={folder / 'profile'}",
            "--remote-debugging-pipe",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            f"--window-size={WINDOW[0]},{WINDOW[1]}",
            "about:blank",
        ]
        self.process = subprocess.Popen(command, stdin=subprocess.DEVNULL, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, pass_fds=(3, 4), preexec_fn=wire_pipes)
        os.close(command_read)
        os.close(reply_write)
        self._buffer = b""
        self._next_id = 0
        self._events: list[dict] = []

    # --- the protocol ---------------------------------------------------------------------
    def _read_message(self, timeout_s: float) -> dict:
        deadline = time.monotonic() + timeout_s
        while b"\0" not in self._buffer:
            left = deadline - time.monotonic()
            if left <= 0 or not select.select([self._reply_read], [], [], left)[0]:
                raise TimeoutError("Chromium did not answer over the DevTools pipe")
            chunk = os.read(self._reply_read, 1 << 20)
            if not chunk:
                raise RuntimeError("Chromium closed the DevTools pipe")
            self._buffer += chunk
        message, _, self._buffer = self._buffer.partition(b"\0")
        return json.loads(message)

    def send(self, method: str, params: dict | None = None, session: str | None = None, timeout_s: float = 120.0) -> dict:
        self._next_id += 1
        message = {"id": self._next_id, "method": method, "params": params or {}}
        if session:
            message["sessionId"] = session
        os.write(self._command_write, json.dumps(message).encode() + b"\0")
        while True:
            reply = self._read_message(timeout_s)
            if reply.get("id") == self._next_id:
                if "error" in reply:
                    raise RuntimeError(f"{method}: {reply['error']}")
                return reply.get("result", {})
            self._events.append(reply)

    def wait_for(self, method: str, session: str, timeout_s: float = 120.0) -> dict:
        while True:
            for number, event in enumerate(self._events):
                if event.get("method") == method and event.get("sessionId") == session:
                    return self._events.pop(number)
            self._events.append(self._read_message(timeout_s))

    # --- one page -------------------------------------------------------------------------
    def render(self, html_file: Path, folder: Path, *, offline: bool = False, measure: dict[str, str] | None = None) -> Rendered:
        """Open a file in a new tab: DOM, screenshot at WINDOW, PDF and the requests it made.
        ``offline``: the tab has no network (Network.emulateNetworkConditions); ``measure``: name ->
        JavaScript expression evaluated after the load event, returned in ``Rendered.measured``."""
        folder.mkdir(parents=True, exist_ok=True)
        url = html_file.resolve().as_uri()
        target = self.send("Target.createTarget", {"url": "about:blank"})["targetId"]
        session = self.send("Target.attachToTarget", {"targetId": target, "flatten": True})["sessionId"]
        try:
            self.send("Page.enable", session=session)
            self.send("Network.enable", session=session)
            if offline:
                self.send("Network.emulateNetworkConditions", {"offline": True, "latency": 0, "downloadThroughput": -1, "uploadThroughput": -1}, session)
            self.send("Emulation.setDeviceMetricsOverride", {"width": WINDOW[0], "height": WINDOW[1], "deviceScaleFactor": 1, "mobile": False}, session)
            self.send("Page.navigate", {"url": url}, session)
            self.wait_for("Page.loadEventFired", session)
            dom = self.send("Runtime.evaluate", {"expression": "document.documentElement.outerHTML", "returnByValue": True}, session)["result"]["value"]
            charts = self.send("Runtime.evaluate", {"expression": CHART_BOXES, "returnByValue": True}, session)["result"]["value"]
            measured = {name: self.send("Runtime.evaluate", {"expression": expression, "returnByValue": True}, session)["result"].get("value") for name, expression in (measure or {}).items()}
            shot, pdf = folder / "shot.png", folder / "page.pdf"
            shot.write_bytes(base64.b64decode(self.send("Page.captureScreenshot", {"format": "png"}, session)["data"]))
            pdf.write_bytes(base64.b64decode(self.send("Page.printToPDF", {"preferCSSPageSize": True}, session)["data"]))
            requests = [
                event["params"]["request"]["url"]
                for event in self._events
                if event.get("sessionId") == session and event.get("method") == "Network.requestWillBeSent" and event["params"]["request"]["url"] != url
            ]
        finally:
            self._events = [event for event in self._events if event.get("sessionId") != session]
            self.send("Target.closeTarget", {"targetId": target})
        return Rendered(dom, shot, pdf, requests, charts, measured)

    def close(self) -> None:
        try:
            self.send("Browser.close", timeout_s=10)
        except (RuntimeError, TimeoutError, OSError):
            pass
        try:
            self.process.wait(timeout=10)
        except subprocess.TimeoutExpired:
            self.process.kill()
            self.process.wait()
        os.close(self._command_write)
        os.close(self._reply_read)


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


def pdf_text(pdf: Path, page: int) -> str:
    """The text of one page of a PDF (poppler's pdftotext)."""
    done = subprocess.run(["pdftotext", "-f", str(page), "-l", str(page), "-layout", str(pdf), "-"], capture_output=True, text=True, check=True)
    return " ".join(done.stdout.split())
