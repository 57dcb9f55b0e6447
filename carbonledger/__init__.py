"""carbonledger: carbon intensity of hydrogen and ammonia production routes.

The library API is importable without the command line::

    from carbonledger import score
    result = score("demo_projects/green_electrolysis_ammonia.toml")
    result.total, result.by_stage

Results are estimates for screening and reporting support, not a certification.
"""

from __future__ import annotations

__version__ = "0.1.0"

CAUTION = (
    "Estimate for screening and reporting support only, not a certification. The official "
    "methodology of each scheme, an accredited verifier and local regulation take precedence."
)


def __getattr__(name):  # lazy: keep `import carbonledger` cheap for the command line
    if name in {"score", "load_project", "load_factor_set"}:
        from . import api

        return getattr(api, name)
    if name == "compare":
        from .comparison import compare

        return compare
    raise AttributeError(name)
