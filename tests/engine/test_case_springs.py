"""Per-case support springs in the banded solve (issue 13: a bearing's stiffness depends on the
case's load): a design whose springs differ by case gives, case by case, what a design of that
one case with the stiffness typed gives; the other designs of the batch are untouched."""
from __future__ import annotations

import copy

import numpy as np
import pytest

from engine.solve import analyse_many
from engine.model import parse_design
from tests.conftest import load_sample


def test_springs_per_case_equal_one_case_at_a_time_with_the_stiffness_typed():
    data = load_sample("countershaft.json")
    data.setdefault("analysis", {})["bearing_stiffness"] = False
    base = parse_design(data)
    nc, ns = len(base.load_cases), len(base.supports)
    k = np.array([[2e5, np.nan], [5e4, 8e5], [1e5, 3e5]])[:nc, :ns]
    other = parse_design(load_sample("line_shaft.json"))
    a, o = analyse_many([base, other], modes=False, springs=[k, None])
    ref_other = analyse_many([other], modes=False)[0]
    np.testing.assert_allclose(o.beam.u_mm, ref_other.beam.u_mm, rtol=1e-12, atol=1e-15)
    for j in range(nc):
        one = copy.deepcopy(data)
        one["load_cases"] = [dict(data["load_cases"][j], time_fraction=1.0)]
        for i in range(ns):
            if np.isfinite(k[j, i]):
                one["supports"][i]["radial_stiffness_N_per_mm"] = float(k[j, i])
        ref = analyse_many([parse_design(one)], modes=False)[0]
        np.testing.assert_allclose(a.beam.u_mm[j], ref.beam.u_mm[0], rtol=1e-10, atol=1e-14)
        np.testing.assert_allclose(a.beam.R_N[j], ref.beam.R_N[0], rtol=1e-10, atol=1e-9)
        np.testing.assert_allclose(a.beam.M_Nmm[j], ref.beam.M_Nmm[0], rtol=1e-10, atol=1e-6)
        assert a.Fr_N[j] == pytest.approx(ref.Fr_N[0], rel=1e-10)
