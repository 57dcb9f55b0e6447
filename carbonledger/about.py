"""What every output states about the tool: its version and the caution.

The version lives here and only here; ``pyproject.toml`` reads it (``tool.setuptools.dynamic``).
"""

__version__ = "0.2.0"

CAUTION = (
    "Estimate for screening and reporting support only, not a certification. The official "
    "methodology of each scheme, an accredited verifier and local regulation take precedence."
)
