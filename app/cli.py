"""The ``shaftwright`` command: solve, serve, note, study, optimise, schema.

Every subcommand reads files and reports mistakes through :mod:`app.cli_io`: one line
``shaftwright: FILE: message`` per problem; exit status 2 for bad input, 3 for a missing
tool, 1 when the work itself fails; never a traceback (``SHAFTWRIGHT_DEBUG=1`` shows one).
"""
from __future__ import annotations

import argparse
import json
import os
import sys
from pathlib import Path

from app.cli_io import InputError, design_error_lines, read_design_file, read_text_file, report

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "sample_data" / "countershaft.json"


def cmd_solve(args: argparse.Namespace) -> int:
    import engine
    from app.report import text_report
    from engine.bearings.catalogue import parse_catalogue

    document = read_design_file(args.design)
    table = None
    if args.bearings:
        text = read_text_file(args.bearings, what="bearing table")
        try:
            table = parse_catalogue(text, name=Path(args.bearings).name)
        except engine.DesignError as exc:
            raise InputError(args.bearings, *design_error_lines(exc.errors)) from None
    try:
        result = engine.solve(document, catalogue=table)
    except engine.DesignError as exc:
        raise InputError(args.design, *design_error_lines(exc.errors)) from None
    print(result.model_dump_json(indent=1) if args.json else text_report(result))
    return 0


def cmd_serve(args: argparse.Namespace) -> int:
    from app.server import DEFAULT_PORT, run

    port = args.port
    if port is None:
        raw = os.environ.get("SHAFTWRIGHT_PORT") or str(DEFAULT_PORT)
        if not raw.isdigit():
            raise InputError("", f"SHAFTWRIGHT_PORT must be a port number (1 to 65535), not {raw!r}")
        port = int(raw)
    if not 0 < port < 65536:
        raise InputError("", f"--port must be 1 to 65535, not {port}")
    from app.server import bind_refusal

    why = bind_refusal(args.host, open_=args.open)  # no accounts: this machine only, unless --open
    if why:
        raise InputError("", why)
    _check_free(args.host, port)
    run(host=args.host, port=port, workers=args.workers, open_=args.open)
    return 0


def _check_free(host: str, port: int) -> None:
    """Refuse, in one line, an address this machine cannot listen on (before the server starts)."""
    import errno
    import socket

    try:
        infos = socket.getaddrinfo(host, port, type=socket.SOCK_STREAM)
    except socket.gaierror:
        raise InputError("", f"--host {host}: not an address of this machine") from None
    family, _, _, _, addr = infos[0]
    with socket.socket(family, socket.SOCK_STREAM) as s:
        s.setsockopt(socket.SOL_SOCKET, socket.SO_REUSEADDR, 1)
        try:
            s.bind(addr)
        except OSError as exc:
            if exc.errno == errno.EADDRNOTAVAIL:
                raise InputError("", f"--host {host}: not an address of this machine") from None
            why = "is in use" if exc.errno == errno.EADDRINUSE else f"cannot be used ({exc.strerror})"
            raise InputError("", f"port {port} on {host} {why}: pick another with --port N "
                                 "or SHAFTWRIGHT_PORT") from None


def cmd_note(args: argparse.Namespace) -> int:
    from app.note import cmd_note as note

    return note(args)


def cmd_schema(args: argparse.Namespace) -> int:
    from app.schema import design_schema, result_schema

    print(json.dumps(result_schema() if args.result else design_schema(), indent=1, ensure_ascii=False))
    return 0


def build_parser() -> argparse.ArgumentParser:
    """The argument parser of every subcommand (``--help`` explains each option)."""
    parser = argparse.ArgumentParser(
        prog="shaftwright",
        description="Shaft-and-bearing arrangements from the command line: solve a design file, "
                    "serve the web app, print the design note, run a study, print the format.",
        epilog="Exit status: 0 done, 1 the work failed, 2 bad input (file, design or option), "
               "3 a needed tool is missing. Results inform design; they do not certify it.")
    sub = parser.add_subparsers(dest="command", required=True, metavar="COMMAND")
    p = sub.add_parser("solve", help="solve a design file and print tables (or --json)",
                       description="Solve a design file (shaft-design/1) and print its reactions, "
                                   "bearings and checks as tables.")
    p.add_argument("design", metavar="DESIGN.json", help="design file (JSON, format shaft-design/1)")
    p.add_argument("--json", action="store_true", help="print the result document (shaft-result/1) instead")
    p.add_argument("--bearings", metavar="TABLE.csv",
                   help="your own bearing table (same columns as sample_data/bearings.csv)")
    p.set_defaults(func=cmd_solve)
    p = sub.add_parser("serve", help="run the web app (opens on the demo design)",
                       description="Run the web app; open the address it prints in a browser.")
    p.add_argument("--host", default="127.0.0.1", metavar="ADDRESS",
                   help="address to listen on (default 127.0.0.1, this machine only; "
                        "0.0.0.0 serves every network the machine is on)")
    p.add_argument("--port", type=int, default=None, metavar="N",
                   help="TCP port to listen on (default SHAFTWRIGHT_PORT, else 8000)")
    p.add_argument("--workers", type=int, default=1, metavar="N",
                   help="server processes sharing the port (SQLite or PostgreSQL; see docs/deployment.md)")
    p.add_argument("--open", action="store_true", help="listen on a non-loopback --host even "
                   "though the store has no accounts (everyone who reaches it may do everything)")
    p.set_defaults(func=cmd_serve)
    p = sub.add_parser("note", help="print a design's note to PDF through headless Chromium",
                       description="Print a design file's design note to PDF (A4) through headless "
                                   "Chromium (SHAFTWRIGHT_CHROMIUM names the program; default "
                                   "/usr/bin/chromium).")
    p.add_argument("design", metavar="DESIGN.json", help="design file (JSON, format shaft-design/1)")
    p.add_argument("-o", "--output", default="note.pdf", metavar="NOTE.pdf",
                   help="where to write the PDF (default note.pdf)")
    p.set_defaults(func=cmd_note)
    p = sub.add_parser("study", help="vary one or two design variables, or compare arrangements",
                       description="Vary one or two design variables over a range, or compare "
                                   "every sensible bearing arrangement.")
    from app.study_cli import add_arguments as _study_args, cmd_study

    _study_args(p)
    p.set_defaults(func=cmd_study)
    p = sub.add_parser("optimise", help="search sizes, positions and bearings for the lightest designs that pass",
                       description="Search the design variables you mark (step diameters and lengths, "
                                   "support and part positions, bearing types and series) within their "
                                   "bounds for the front of designs that meet every requirement and are "
                                   "best in the objectives you choose.")
    from app.optimise_cli import add_arguments as _optimise_args, cmd_optimise

    _optimise_args(p)
    p.set_defaults(func=cmd_optimise)
    p = sub.add_parser("schema", help="print the JSON Schema of the design file (or --result)",
                       description="Print the JSON Schema (draft 2020-12) of the design document "
                                   "(shaft-design/1), generated from the models the engine reads; "
                                   "--result prints the result document's (shaft-result/1).")
    p.add_argument("--result", action="store_true", help="the result document's schema instead")
    p.set_defaults(func=cmd_schema)
    from app.users_cli import add_parser as _users

    _users(sub)  # shaftwright users …: the team's accounts and API tokens
    return parser


def main(argv: list[str] | None = None) -> int:
    from app.server import limit_blas_threads

    limit_blas_threads()  # before numpy loads: small systems, one BLAS thread is fastest
    args = build_parser().parse_args(argv)
    try:
        return args.func(args)
    except KeyboardInterrupt:
        print("shaftwright: interrupted", file=sys.stderr)
        return 130
    except Exception as exc:  # noqa: BLE001 - no traceback ever reaches the user
        from engine.model import DesignError

        if os.environ.get("SHAFTWRIGHT_DEBUG"):
            raise
        if not isinstance(exc, (InputError, DesignError, RuntimeError, OSError)):
            exc = RuntimeError(f"unexpected error ({type(exc).__name__}: {exc}); please report it "
                               "(SHAFTWRIGHT_DEBUG=1 shows where it happened)")
        return report(exc, file=getattr(args, "design", ""))

if __name__ == "__main__":
    raise SystemExit(main())
