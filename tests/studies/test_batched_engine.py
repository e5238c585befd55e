"""The batched engine paths a study uses agree with the one-design functions they stand in for.

Consistency checks, not validation against a published value: each batched function
(stacked meshes and matrices, stacked eigenproblems, a screen of many variants' loads, the
shoulder factors of many shafts, the shaft checks with precomputed modes) is compared with the
plain function it replaces, on the demo designs and on variants of them. The plain functions
are validated against sources elsewhere (tests/checks, tests/bearings, tests/engine). Tolerances:
exact where the arithmetic is the same operations in the same order, 1e-9 relative (the
study's contract, tests/studies/test_reproduces_solve.py) where the order differs (block
elimination, an eigen-iteration that runs until the slowest member of a stack converges).
"""
from __future__ import annotations

from dataclasses import fields

import numpy as np
import pytest

from engine import beam, dynamics, strength
from engine.bearings import bundled_catalogue
from engine.bearings.candidates import screen_rows
from engine.checks import shaft_checks, shoulder_kt
from engine.loads import case_loads
from engine.model import parse_design
from engine.solve import _weight_density
from engine.study import apply_values, parse_study
from tests.checks.helpers import analysis_of
from tests.conftest import load_sample

SAMPLES = ("countershaft.json", "bevel_pinion.json", "line_shaft.json")


def _variants(name: str, vary: list[str]):
    d = parse_design(load_sample(name))
    study = parse_study(d, vary)
    data = d.model_dump(mode="json")
    return [parse_design(apply_values(data, study, v)) for v in study.combinations()]


@pytest.fixture(scope="module")
def demo_variants():
    # B slides along its seat; the node count changes between variants (two stacks)
    return _variants("countershaft.json", ["supports.B.x_mm=242:268:9"])


@pytest.mark.parametrize("name", SAMPLES)
def test_build_mesh_nodes_are_those_of_linspace_per_interval(name):
    # build_mesh fills each interval between key positions as numpy.linspace(a, b, n,
    # endpoint=False) does, all intervals at once: the nodes must be the same numbers exactly
    for elements in (10, 30, 120, 333):
        d = parse_design({**load_sample(name), "analysis": {**load_sample(name).get("analysis", {}),
                                                            "elements": elements}})
        m = beam.build_mesh(d)
        edges = np.array(d.shaft.edges_mm())
        keys = np.unique(np.round(np.concatenate([edges, [s.x_mm for s in d.supports],
                                                  [e.x_mm for e in d.elements], [g.x_mm for g in d.shaft.grooves]]), 9))
        h = edges[-1] / elements
        parts = np.maximum(1, np.ceil(np.diff(keys) / h - 1e-9)).astype(int)
        ref = np.concatenate([np.linspace(a, b, n, endpoint=False) for a, b, n in zip(keys[:-1], keys[1:], parts)]
                             + [[edges[-1]]])
        assert np.array_equal(m.x_mm, ref)


def test_stacked_stiffness_and_mass_are_each_designs_own(demo_variants):
    meshes = [beam.build_mesh(d) for d in demo_variants[:3]]
    meshes = [m for m in meshes if m.n_nodes == meshes[0].n_nodes]
    stack = beam.stack_meshes(meshes)
    for shear in (False, True):
        K, ke = beam.bending_stiffness(stack, E_MPa=210e3, G_MPa=81e3, shear=shear)
        for b, m in enumerate(meshes):
            K1, ke1 = beam.bending_stiffness(m, E_MPa=210e3, G_MPa=81e3, shear=shear)
            assert np.array_equal(K[b], K1) and np.array_equal(ke[b], ke1)
    M = dynamics.consistent_mass(stack, rho_t_mm3=7.85e-9)
    for b, m in enumerate(meshes):
        assert np.array_equal(M[b], dynamics.consistent_mass(m, rho_t_mm3=7.85e-9))
    assert {f.name for f in fields(stack)} == {f.name for f in fields(meshes[0])}


def test_bending_of_many_designs_is_each_designs_solve(demo_variants):
    designs = demo_variants + [parse_design(load_sample("line_shaft.json"))]
    meshes, F, q = [], [], []
    for d in designs:
        m = beam.build_mesh(d)
        loads = [case_loads(d, c) for c in d.load_cases]
        Fn = np.zeros((len(loads), 2, m.n_nodes, 2))
        for j, cl in enumerate(loads):
            np.add.at(Fn[j, 0, :, 0], m.element_nodes, cl.F_N[:, 1])
            np.add.at(Fn[j, 0, :, 1], m.element_nodes, cl.C_Nmm[:, 2])
            np.add.at(Fn[j, 1, :, 0], m.element_nodes, cl.F_N[:, 2])
            np.add.at(Fn[j, 1, :, 1], m.element_nodes, -cl.C_Nmm[:, 1])
        meshes.append(m), F.append(Fn), q.append(_weight_density(d, loads)[:, 1:])
    many = beam.solve_bending_many(designs, meshes, F, q)
    for d, m, Fn, qq, got in zip(designs, meshes, F, q, many):
        ref = beam.solve_bending(d, m, Fn, qq)
        for name in ("u_mm", "slope_rad", "V_N", "M_Nmm", "R_N"):
            a, b = getattr(ref, name), getattr(got, name)
            assert a.shape == b.shape
            assert np.max(np.abs(a - b)) <= 1e-9 * np.max(np.abs(a)), name


def test_stacked_generalized_eigen_is_each_problems_own():
    rng = np.random.default_rng(7)
    A = rng.random((5, 8, 8))
    K = A @ np.swapaxes(A, 1, 2) + 8 * np.eye(8)
    B = rng.random((5, 8, 8))
    M = B @ np.swapaxes(B, 1, 2) + np.eye(8)
    lam, phi = dynamics.generalized_eigen(K, M)
    for k in range(5):
        l1, p1 = dynamics.generalized_eigen(K[k], M[k])
        assert np.allclose(lam[k], l1, rtol=1e-12)
        assert np.allclose(np.abs(phi[k]), np.abs(p1), rtol=1e-8, atol=1e-12)
    lam3, _ = dynamics.subspace_iteration(K, M, 1)   # p = 5 < 8 trial vectors: the iteration runs
    assert np.allclose(lam3[:, 0], lam[:, 0], rtol=1e-9)


def test_lateral_frequencies_of_many_designs(demo_variants):
    free_end = load_sample("countershaft.json")
    free_end["supports"] = [{**free_end["supports"][0], "radial_stiffness_N_per_mm": 2e5}, free_end["supports"][1]]
    designs = demo_variants + [parse_design(load_sample(n)) for n in SAMPLES[1:]] + [parse_design(free_end)]
    many = dynamics.lateral_frequencies_many(designs, n_modes=3)
    assert len({m.K.shape for m in many}) >= 3   # several stacks
    for d, got in zip(designs, many):
        ref = dynamics.lateral_frequencies(d)
        assert np.allclose(got.rpm, ref.rpm, rtol=1e-9)
        assert got.rayleigh_rpm == pytest.approx(dynamics.rayleigh_frequency(ref), rel=1e-9)
        assert got.rayleigh_rpm >= got.rpm[0] * (1 - 1e-9)   # Rayleigh bounds ω₁ from above
    one = dynamics.lateral_frequencies_many(designs[:2], n_modes=1)
    assert [m.rpm.size for m in one] == [1, 1]
    assert one[0].rpm[0] == pytest.approx(many[0].rpm[0], rel=1e-9)


def test_a_design_its_supports_cannot_hold_gives_none_and_the_others_their_modes():
    held = parse_design(load_sample("countershaft.json"))
    # a support spring of negative stiffness makes K indefinite (Cholesky fails, as for a shaft
    # its supports do not hold). The model refuses it, so it is made by copying past the
    # validation, as only a fault could.
    bad = held.supports[0].model_copy(update={"radial_stiffness_N_per_mm": -1e9})
    loose = held.model_copy(update={"supports": [bad, held.supports[1]]})
    with pytest.raises(np.linalg.LinAlgError):
        dynamics.lateral_frequencies(loose)
    out = dynamics.lateral_frequencies_many([held, loose, held])
    assert out[1] is None
    ref = dynamics.lateral_frequencies(held).rpm
    assert np.allclose(out[0].rpm, ref, rtol=1e-9) and np.allclose(out[2].rpm, ref, rtol=1e-9)


def test_screen_of_many_variants_is_each_variants_screen():
    cat = bundled_catalogue()
    rng = np.random.default_rng(3)
    n, t = np.array([1500.0, 700.0, 300.0]), np.array([0.5, 0.3, 0.2])
    for kind, lub in (("deep_groove_ball", None), ("cylindrical_roller", (32.0, 0.5)), ("spherical_roller", None)):
        idx = cat.rows_of(kind)[::5]
        Fr = rng.uniform(500, 9000, size=(6, 3))
        Fa = rng.uniform(0, 1500, size=(6, 1, 3)) * (kind != "cylindrical_roller")
        kw = dict(bearing_type=kind, speed_rpm=n, time_fraction=t, life_h=20000, a_R=0.62, s0_min=1.5,
                  application_factor=1.2)
        if lub:
            kw.update(nu_mm2_s=lub[0], ec=lub[1])
        many = screen_rows(cat, idx, Fr_N=Fr, Fa_N=Fa, **kw)
        for v in range(6):
            one = screen_rows(cat, idx, Fr_N=Fr[v], Fa_N=Fa[v, 0], **kw)
            for f in ("Fa_N", "P_N", "P0_N", "Pm_N", "L10_h", "Lnm_h", "a_iso_eff", "kappa_min", "s0",
                      "worst_static_case", "life_ok", "static_ok", "speed_ok", "ok", "required_C_N"):
                np.testing.assert_array_equal(getattr(many, f)[v], getattr(one, f), err_msg=f"{kind} {f}")


def test_shoulder_factors_of_many_shafts_are_each_shafts_own():
    shafts = [parse_design(load_sample(n)).shaft for n in SAMPLES]
    for sh, kts in zip(shafts, shoulder_kt(shafts)):
        steps = [(a, b) for a, b in zip(sh.segments[:-1], sh.segments[1:]) if abs(a.d_mm - b.d_mm) >= 1e-6]
        assert kts.shape == (len(steps), 3)
        for (a, b), kt in zip(steps, kts):
            D, d = max(a.d_mm, b.d_mm), min(a.d_mm, b.d_mm)
            r = b.fillet_r_mm if b.fillet_r_mm is not None else strength.SHARP_FILLET_R_OVER_D * d
            for k, ld in enumerate(("bending", "torsion", "axial")):
                assert kt[k] == float(strength.kt_shoulder(D_mm=D, d_mm=d, r_mm=r, load=ld))


@pytest.mark.parametrize("name", SAMPLES)
def test_shaft_checks_with_precomputed_inputs_are_the_plain_checks(name):
    a = analysis_of(load_sample(name))
    plain = shaft_checks(a)
    modes = dynamics.lateral_frequencies_many([a.design], n_modes=3)[0]
    fast = shaft_checks(a, modes=modes, min_diameter=False, kt_shoulders=shoulder_kt([a.design.shaft])[0])
    assert [(c.code, c.status, c.where, c.load_case) for c in fast.checks] == \
           [(c.code, c.status, c.where, c.load_case) for c in plain.checks]
    for c, p in zip(fast.checks, plain.checks):
        assert (c.value is None and p.value is None) or c.value == pytest.approx(p.value, rel=1e-9)
    assert fast.min_safety_factor == plain.min_safety_factor
    assert fast.critical_speed_rpm == pytest.approx(plain.critical_speed_rpm, rel=1e-9)
    assert fast.rayleigh_rpm == pytest.approx(plain.rayleigh_rpm, rel=1e-9)
    assert all(s.d_min_mm is None for s in fast.sections) and all(s.d_min_mm > 0 for s in plain.sections)
    assert not any("d_min" in c.message for c in fast.checks if c.code == "shaft.fatigue")
    assert all("d_min" in c.message for c in plain.checks if c.code == "shaft.fatigue")
