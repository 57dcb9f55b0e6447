"""The manual, built as .ci/run builds it (`mkdocs build --strict`), opened in headless Chromium
with no network: the equations are rendered (MathML, no raw LaTeX left) and wide tables scroll
inside their box, not the page (issue 19). One Chromium start (``browser_support.Browser``)."""

from __future__ import annotations

import importlib.util
import os
import subprocess
import sys
from pathlib import Path

import pytest
from browser_support import Browser, visible_text

ROOT = Path(__file__).resolve().parent.parent
pytestmark = pytest.mark.xdist_group("browser")

# A methodology page with display equations and a wide factor table, and a hand-written page with wide tables.
PAGES = ("generated/methodology/legs/shipping.html", "verdicts.html")
MEASURE = {
    # the page is wider than the window only if something overflows the layout
    "page_overflow_px": "document.documentElement.scrollWidth - document.documentElement.clientWidth",
    "math_elements": "document.querySelectorAll('math').length",
    "tables": "document.querySelectorAll('.md-typeset table').length",
}


@pytest.fixture(scope="module")
def site(tmp_path_factory):
    if importlib.util.find_spec("mkdocs") is None or importlib.util.find_spec("material") is None:
        if os.environ.get("CI", "").lower() == "true":
            pytest.fail('mkdocs and mkdocs-material are required under CI=true (pip install -e ".[docs]")')
        pytest.skip("the docs extra is not installed here")
    out = tmp_path_factory.mktemp("site")
    built = subprocess.run([sys.executable, "-m", "mkdocs", "build", "--strict", "--quiet", "-d", str(out)], cwd=ROOT, capture_output=True, text=True, timeout=600)
    assert built.returncode == 0, built.stderr[-3000:]
    return out


@pytest.fixture(scope="module")
def pages(site, tmp_path_factory):
    browser = Browser(tmp_path_factory.mktemp("docs-browser"))
    try:
        yield {name: browser.render(site / name, tmp_path_factory.mktemp("page"), offline=True, measure=MEASURE) for name in PAGES}
    finally:
        browser.close()


@pytest.mark.parametrize("name", PAGES)
def test_a_page_reads_offline_without_raw_latex_or_page_scroll(pages, name):
    page = pages[name]
    text = visible_text(page.dom)
    assert "\\[" not in text and "\\(" not in text and "$$" not in text  # no equation left as LaTeX source
    assert page.measured["page_overflow_px"] <= 0, page.measured  # wide tables scroll in their own box
    assert page.measured["tables"] >= 1
    assert not [url for url in page.page_requests if url.startswith(("http:", "https:"))]  # nothing fetched from the network


def test_equations_are_mathml(pages):
    page = pages["generated/methodology/legs/shipping.html"]
    assert page.measured["math_elements"] >= 3
    assert "<math" in page.dom
