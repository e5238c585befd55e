"""The command line's one way to read input files and to report what went wrong.

Every ``shaftwright`` subcommand reads its files with :func:`read_text_file` /
:func:`read_design_file` and reports with :func:`report`, so that every mistake reads the same:

    shaftwright: FILE: message                  one line per problem, exit status 2
    shaftwright: FILE: supports[1].x_mm: ...    a design problem, at the key the file holds
    shaftwright: message                        a missing tool (exit 3) or a failure (exit 1)

Exit status: 0 done, 1 the work failed (e.g. the browser wrote no PDF), 2 bad input (a
missing, unreadable, non-UTF-8 or non-JSON file, or a design with mistakes), 3 a tool the
command needs is not installed (the message says how to get it), 130 interrupted.

Files are UTF-8; a byte-order mark (as some Windows editors save) is skipped. A file in another
encoding is refused with the position of the first byte that is not UTF-8, never misread.
"""
from __future__ import annotations

import sys
from pathlib import Path
from typing import Any, Iterable

__all__ = ["InputError", "ToolMissing", "EXIT_FAILED", "EXIT_INPUT", "EXIT_TOOL",
           "read_text_file", "read_design_file", "report", "design_error_lines"]

EXIT_FAILED, EXIT_INPUT, EXIT_TOOL = 1, 2, 3
PROG = "shaftwright"


class InputError(Exception):
    """Bad input: ``file`` (may be empty) and one or more messages, each shown on one line."""

    def __init__(self, file: str | Path, *messages: str, code: int = EXIT_INPUT):
        self.file = str(file) if file else ""
        self.messages = [m for m in messages if m] or ["cannot be used"]
        self.code = code
        super().__init__("; ".join(self.messages))


class ToolMissing(RuntimeError):
    """A program the command needs is not installed; the message says how to get it."""

    code = EXIT_TOOL


def _one_line(text: str) -> str:
    return " ".join(str(text).split())


def read_text_file(path: str | Path, *, what: str = "file") -> str:
    """The text of a UTF-8 file (a leading byte-order mark skipped); :class:`InputError` else."""
    from app.limits import LimitError, decode_text

    p = Path(path)
    try:
        raw = p.read_bytes()
    except FileNotFoundError:
        raise InputError(path, f"no such {what}") from None
    except IsADirectoryError:
        raise InputError(path, f"is a folder, not a {what}") from None
    except PermissionError:
        raise InputError(path, "not allowed to read it (permission denied)") from None
    except OSError as exc:
        raise InputError(path, f"cannot read it: {_one_line(exc.strerror or exc)}") from None

    try:
        return decode_text(raw, what="")
    except LimitError as exc:
        raise InputError(path, *design_error_lines(exc.errors)) from None


def read_design_file(path: str | Path) -> Any:
    """A design file's JSON value, under the same size and depth limits as the web app."""
    from app.limits import LimitError, parse_json

    text = read_text_file(path, what="design file")
    try:
        return parse_json(text)
    except LimitError as exc:
        raise InputError(path, *design_error_lines(exc.errors)) from None


def design_error_lines(issues: Iterable[Any]) -> list[str]:
    """One line per problem: ``key.path: message`` (just the message for the whole document)."""
    return [_one_line(f"{i.path}: {i.message}" if i.path else i.message) for i in issues]


def report(exc: BaseException, *, file: str | Path = "") -> int:
    """Print ``exc`` in the command line's style on stderr; return the exit status."""
    from engine.model import DesignError

    if isinstance(exc, InputError):
        lines, code, file = exc.messages, exc.code, exc.file  # "" : not about a file
    elif isinstance(exc, DesignError):
        lines, code = design_error_lines(exc.errors), EXIT_INPUT
    elif isinstance(exc, ToolMissing):
        lines, code, file = [str(exc)], EXIT_TOOL, ""
    else:
        lines, code = [str(exc) or type(exc).__name__], EXIT_FAILED
    prefix = f"{PROG}: {file}: " if file else f"{PROG}: "
    for line in lines:
        print(prefix + _one_line(line), file=sys.stderr)
    return code
