"""mkdocs hook: write the generated pages and put every one of them in the navigation, so that
`mkdocs build --strict` alone builds the whole site (``gen_pages.py`` is the one generator)."""

from __future__ import annotations

import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
import gen_pages  # noqa: E402


def on_config(config, **kwargs):
    gen_pages.main()
    config["nav"] = gen_pages.nav()
    return config
