"""The ``shaftwright`` command: solve, serve, note, study."""
from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "sample_data" / "countershaft.json"


def _load(path: str) -> dict:
    try:
        return json.loads(Path(path).read_text(encoding="utf-8"))
    except (OSError, json.JSONDecodeError) as exc:
        sys.exit(f"shaftwright: cannot read {path}: {exc}")


def cmd_solve(args: argparse.Namespace) -> int:
    import engine
    from app.report import text_report

    from engine.bearings import load_catalogue

    try:
        table = load_catalogue(args.bearings) if args.bearings else None
        result = engine.solve(_load(args.design), catalogue=table)
    except engine.DesignError as exc:
        for e in exc.errors:
            print(f"error: {e.path or '(design)'}: {e.message}", file=sys.stderr)
        return 2
    print(result.model_dump_json(indent=1) if args.json else text_report(result))
    return 0


def cmd_serve(args: argparse.Namespace) -> int:
    from app.server import run

    run(host=args.host, port=args.port, open_=args.open)
    return 0


def cmd_note(args: argparse.Namespace) -> int:
    from app.note import cmd_note as note

    return note(args)


def main(argv: list[str] | None = None) -> int:
    from app.server import limit_blas_threads

    limit_blas_threads()  # before numpy loads: small systems, one BLAS thread is fastest
    parser = argparse.ArgumentParser(prog="shaftwright", description=__doc__)
    sub = parser.add_subparsers(dest="command", required=True)
    p = sub.add_parser("solve", help="solve a design file and print tables (or --json)")
    p.add_argument("design")
    p.add_argument("--json", action="store_true", help="print the result document")
    p.add_argument("--bearings", metavar="TABLE.csv",
                   help="your own bearing table (same columns as sample_data/bearings.csv)")
    p.set_defaults(func=cmd_solve)
    p = sub.add_parser("serve", help="run the web app (opens on the demo design)")
    p.add_argument("--host", default="127.0.0.1")
    p.add_argument("--port", type=int, default=8000)
    p.add_argument("--open", action="store_true", help="listen on a non-loopback --host even "
                   "though the store has no accounts (everyone who reaches it may do everything)")
    p.set_defaults(func=cmd_serve)
    p = sub.add_parser("note", help="print a design's note to PDF through headless Chromium")
    p.add_argument("design")
    p.add_argument("-o", "--output", default="note.pdf")
    p.set_defaults(func=cmd_note)
    p = sub.add_parser("study", help="vary one or two design variables, or compare arrangements")
    from app.study_cli import add_arguments as _study_args, cmd_study

    _study_args(p)
    p.set_defaults(func=cmd_study)
    from app.users_cli import add_parser as _users

    _users(sub)  # shaftwright users …: the team's accounts and API tokens
    args = parser.parse_args(argv)
    return args.func(args)


if __name__ == "__main__":
    raise SystemExit(main())
