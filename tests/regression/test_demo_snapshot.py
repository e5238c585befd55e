"""REGRESSION SNAPSHOT, NOT VALIDATION: every demo result agrees with the numbers recorded in
``demo_results_snapshot.json`` (taken by ``make_snapshot.py``; its reason and commit are in the
file) to 1e-9 relative.

This holds a refactor of the solver to the results it had before; it does not show that they
are right (the closed-form, PyNiteFEA and Shigley tests do). Within one list of numbers (a
diagram series, say) a value is also accepted within 1e-9 of the list's largest magnitude: a
deflection that is 1e-17 mm at a support is round-off of zero, not a figure. Strings (messages,
designations, statuses) must match exactly. After a deliberate change of results, regenerate
with ``python3 tests/regression/make_snapshot.py --reason "..."``.
"""
from __future__ import annotations

import json
import math

import pytest

from tests.regression.make_snapshot import DEMOS, SNAPSHOT, current_results

RTOL = 1e-9


def _diff(want, got, path: str, scale: float, out: list[str]) -> None:
    if isinstance(want, dict) and isinstance(got, dict):
        if set(want) != set(got):
            out.append(f"{path}: keys differ: missing {sorted(set(want) - set(got))}, "
                       f"new {sorted(set(got) - set(want))}")
        for k in sorted(set(want) & set(got)):
            _diff(want[k], got[k], f"{path}.{k}", 0.0, out)
    elif isinstance(want, list) and isinstance(got, list):
        if len(want) != len(got):
            out.append(f"{path}: length {len(got)}, snapshot {len(want)}")
            return
        nums = [abs(v) for v in want if isinstance(v, (int, float)) and not isinstance(v, bool)]
        s = max(nums, default=0.0)
        for i, (a, b) in enumerate(zip(want, got)):
            _diff(a, b, f"{path}[{i}]", s, out)
    elif isinstance(want, (int, float)) and not isinstance(want, bool) \
            and isinstance(got, (int, float)) and not isinstance(got, bool):
        if not math.isclose(want, got, rel_tol=RTOL, abs_tol=RTOL * scale):
            out.append(f"{path}: {got!r}, snapshot {want!r}")
    elif want != got:
        out.append(f"{path}: {got!r}, snapshot {want!r}")


@pytest.fixture(scope="module")
def snapshot() -> dict:
    doc = json.loads(SNAPSHOT.read_text(encoding="utf-8"))
    assert "not validation" in doc["what"]
    return doc["results"]


@pytest.fixture(scope="module")
def now() -> dict:
    return current_results()


@pytest.mark.parametrize("name", DEMOS)
def test_demo_result_matches_the_regression_snapshot(name, snapshot, now):
    diffs: list[str] = []
    _diff(snapshot[name], now[name], name, 0.0, diffs)
    assert not diffs, f"{len(diffs)} differences from the regression snapshot, first 20:\n" + "\n".join(diffs[:20])
