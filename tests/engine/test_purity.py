"""The engine is pure computation: it imports no web framework and writes no files
(house style, shared/STYLE.md)."""
import ast
from pathlib import Path

ENGINE = Path(__file__).resolve().parents[2] / "engine"
FORBIDDEN = {"fastapi", "starlette", "jinja2", "plotly", "uvicorn", "app", "httpx", "sqlite3"}


def test_engine_imports_no_web_code():
    for path in ENGINE.rglob("*.py"):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in ast.walk(tree):
            names = []
            if isinstance(node, ast.Import):
                names = [a.name for a in node.names]
            elif isinstance(node, ast.ImportFrom) and node.module:
                names = [node.module]
            for n in names:
                assert n.split(".")[0] not in FORBIDDEN, f"{path.name} imports {n}"


def test_engine_writes_no_files():
    for path in ENGINE.rglob("*.py"):
        text = path.read_text(encoding="utf-8")
        for needle in ("write_text(", "write_bytes(", "open(", ".to_csv("):
            if needle == "open(" and needle in text:
                # reading is allowed (the bearing table); every open must be read-only
                for line in text.splitlines():
                    if "open(" in line and not line.strip().startswith("#"):
                        assert "'w" not in line and '"w' not in line and "'a" not in line, f"{path.name}: {line}"
            elif needle != "open(":
                assert needle not in text, f"{path.name} writes a file ({needle})"
