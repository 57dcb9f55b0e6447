"""mkdocs hooks: write the generated pages and the navigation before the build (``gen_pages.py``
is the one generator), and render every equation to MathML at build time, so the site shows its
mathematics without a network and without a script (browsers render MathML themselves)."""

from __future__ import annotations

import html
import re
import sys
from pathlib import Path

from latex2mathml.converter import convert

sys.path.insert(0, str(Path(__file__).resolve().parent))
import gen_pages  # noqa: E402

# What pymdownx.arithmatex (generic mode) writes around each equation.
DISPLAY = re.compile(r'<div class="arithmatex">\\\[(.*?)\\\]</div>', re.S)
INLINE = re.compile(r'<span class="arithmatex">\\\((.*?)\\\)</span>', re.S)


def mathml(latex: str, display: str) -> str:
    return convert(html.unescape(latex).strip(), display=display)


def render_math(page_html: str) -> str:
    """The page with every arithmatex equation replaced by MathML (no raw LaTeX left)."""
    page_html = DISPLAY.sub(lambda m: f'<div class="arithmatex">{mathml(m.group(1), "block")}</div>', page_html)
    return INLINE.sub(lambda m: f'<span class="arithmatex">{mathml(m.group(1), "inline")}</span>', page_html)


def on_config(config, **kwargs):
    gen_pages.main()
    config["nav"] = gen_pages.nav()
    return config


def on_page_content(page_html, **kwargs):
    return render_math(page_html)
