"""Shaftwright engine: pure computation of a shaft-and-bearing arrangement.

``engine.solve_many(designs)`` is the one path: design documents (mappings or
:class:`engine.model.Design`) in, one :class:`engine.result.Result` (or the DesignError /
EngineError it raised) out for each; ``engine.solve(design)`` is ``solve_many([design])[0]``.
The engine imports no web framework and writes no files.
"""
__version__ = "0.1.0"

from engine.model import Design, DesignError, EngineError, Issue, parse_design  # noqa: E402
from engine.solve import solve, solve_many  # noqa: E402

__all__ = ["solve", "solve_many", "parse_design", "Design", "DesignError", "EngineError", "Issue", "__version__"]
