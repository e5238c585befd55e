"""Shaftwright engine: pure computation of a shaft-and-bearing arrangement.

``engine.solve(design)`` is the one entry point; it takes a design document (a mapping or
a :class:`engine.model.Design`) and returns a :class:`engine.result.Result`.
The engine imports no web framework and writes no files.
"""
__version__ = "0.1.0"

from engine.model import Design, DesignError, EngineError, Issue, parse_design  # noqa: E402
from engine.solve import solve  # noqa: E402

__all__ = ["solve", "parse_design", "Design", "DesignError", "EngineError", "Issue", "__version__"]
