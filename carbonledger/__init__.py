"""carbonledger: carbon intensity of hydrogen and ammonia production routes.

The library API is importable without the command line::

    from carbonledger import score
    result = score("demo_projects/green_electrolysis_ammonia.toml")
    result.total, result.by_stage

Results are estimates for screening and reporting support, not a certification.
"""

from __future__ import annotations

from .about import CAUTION, __version__

__all__ = ["CAUTION", "__version__", "score", "compare", "load_project", "load_factor_set", "audit_workbook"]


def __getattr__(name):  # lazy: keep `import carbonledger` cheap for the command line
    if name in {"score", "compare", "load_project", "load_factor_set", "audit_workbook"}:
        from . import api

        return getattr(api, name)
    raise AttributeError(name)
