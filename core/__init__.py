"""The base layer every stage may import: the error hierarchy and issue codes.

``cablewright.core`` depends on no stage (extract, sizing, annotate, the CLI);
each of them may import it (tests/test_architecture.py).
"""

from __future__ import annotations

from .errors import *  # noqa: F403
from .errors import __all__ as __all__
