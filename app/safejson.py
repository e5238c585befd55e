"""JSON inside HTML: the one escaping helper.

A page hands data to its scripts in ``<script type="application/json">`` blocks (never in
inline code, which the Content-Security-Policy forbids) or in data attributes. ``json.dumps``
does not escape ``</``, so a support id such as ``</script><img src=x onerror=…>`` would end
the block early and put markup in the page. :func:`escape_json_text` makes any JSON text safe
to place inside an HTML element or attribute by writing ``<``, ``>``, ``&``, ``'`` and the
line and paragraph separators U+2028/U+2029 as ``\\uXXXX`` escapes, which every JSON reader
decodes back to the same characters (RFC 8259, section 7). Outside strings JSON holds none of
these characters, so the replacement never changes what the text means.

Templates use it through two filters (see :func:`install`):

- ``value | tojson``: dump a Python value and escape it (replaces Jinja's own ``tojson``,
  so there is one path, not two);
- ``text | json_text``: escape JSON text that was dumped elsewhere (the plot data).
"""
from __future__ import annotations

import json
from typing import Any

from markupsafe import Markup

__all__ = ["escape_json_text", "json_for_html", "install"]

_ESCAPES = {"<": "\\u003c", ">": "\\u003e", "&": "\\u0026", "'": "\\u0027",
            "\u2028": "\\u2028", "\u2029": "\\u2029"}
_TABLE = str.maketrans(_ESCAPES)


def escape_json_text(text: str) -> Markup:
    """JSON text made safe inside an HTML element or a quoted attribute (same meaning).

    >>> str(escape_json_text('{"id": "</script><b>&\\u2028"}'))
    '{"id": "\\\\u003c/script\\\\u003e\\\\u003cb\\\\u003e\\\\u0026\\\\u2028"}'
    """
    return Markup(str(text).translate(_TABLE))


def json_for_html(value: Any, **kwargs: Any) -> Markup:
    """``value`` as JSON, escaped by :func:`escape_json_text` (NaN and infinity refused)."""
    kwargs.setdefault("ensure_ascii", False)
    kwargs.setdefault("allow_nan", False)
    return escape_json_text(json.dumps(value, **kwargs))


def install(env) -> None:
    """Register the filters on a Jinja environment (``tojson`` is replaced by ours)."""
    env.filters["tojson"] = json_for_html
    env.filters["json_text"] = lambda text: escape_json_text("null" if text is None else text)
