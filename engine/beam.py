"""Finite-element model of the stepped, possibly hollow shaft.

Units: mm, N, N·mm, MPa (N/mm²). Bending is solved in both transverse planes with
**Timoshenko** two-node beam elements (cubic "interdependent interpolation" element,
Przemieniecki, *Theory of Matrix Structural Analysis*, 1968, §5.6), which reduce exactly to
Euler–Bernoulli Hermite elements when the shear parameter Φ = 12·E·I/(κ·G·A·L²) is zero
(``analysis.shear_deformation = false``). Shear deformation matters for short, thick shafts
(span/diameter below about 10); for slender shafts it changes deflections by well under 1 %.
The shear coefficient κ is Cowper's for a hollow circle (Cowper, J. Appl. Mech. 33, 1966):
κ = 6(1+ν)(1+m²)² / ((7+6ν)(1+m²)² + (20+12ν)m²), m = bore/d.

Both planes share one stiffness matrix (the section is round): the x–y plane is solved for
(uy, θz = duy/dx) and the x–z plane for (uz, duz/dx), as columns of one right-hand side,
every load case at once. Supports are simple (no moment restraint), rigid or elastic
(``radial_stiffness_N_per_mm``); any number from two up. Rigid supports are removed from the
system, so a statically indeterminate shaft is solved exactly, not by penalty. For point
loads at nodes and the consistent load of the shaft's weight the nodal results are exact.

Axial force and torque are statically determinate along the shaft (supports are free in
torsion; the axial reaction comes from the bearing arrangement), so they are summed from
the left: N(x) = −Σ_left Fx (tension positive), T(x) = Σ_left torque.

Many designs at once (a study's variants): :func:`stack_meshes` stacks meshes of one size
along a leading axis, which :func:`bending_stiffness` and :func:`assemble` carry through;
:func:`solve_bending_many` solves the bending of all of them by block-tridiagonal elimination.
One design stays on :func:`solve_bending` (one dense LAPACK solve: as fast as the block loop
for a single design here, 1.7 against 1.8 ms, and the reference the batched path is tested on).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, fields
from typing import Sequence

import numpy as np

from engine.model import Design, EngineError

__all__ = ["Mesh", "build_mesh", "stack_meshes", "section_properties", "shear_coefficient", "assemble",
           "bending_stiffness", "BeamSolution", "solve_bending", "solve_bending_many", "axial_and_torque"]


@dataclass(frozen=True)
class Mesh:
    """Nodes along x and element properties.

    x_mm (N,) node positions; per element (N−1,): le_mm, d_mm, bore_mm, A_mm2, I_mm4, J_mm4;
    support_nodes / element_nodes: node index of each support / element (design order).
    A stack of meshes (:func:`stack_meshes`) has the same fields with a leading axis.
    """

    x_mm: np.ndarray
    le_mm: np.ndarray
    d_mm: np.ndarray
    bore_mm: np.ndarray
    A_mm2: np.ndarray
    I_mm4: np.ndarray
    J_mm4: np.ndarray
    support_nodes: np.ndarray
    element_nodes: np.ndarray

    @property
    def n_nodes(self) -> int:
        return self.x_mm.shape[-1]


def section_properties(d_mm: np.ndarray, bore_mm: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Area π(d²−di²)/4 [mm²], second moment π(d⁴−di⁴)/64 [mm⁴], polar J = 2I [mm⁴]."""
    A = math.pi / 4.0 * (d_mm**2 - bore_mm**2)
    I = math.pi / 64.0 * (d_mm**4 - bore_mm**4)
    return A, I, 2.0 * I


def shear_coefficient(nu: float, m: np.ndarray) -> np.ndarray:
    """Cowper's shear coefficient of a hollow circular section, m = bore/d (solid: m = 0).

    >>> round(float(shear_coefficient(0.3, 0.0)), 4)   # solid circle, 6(1+ν)/(7+6ν)
    0.8864
    """
    m2 = np.asarray(m, dtype=float) ** 2
    return 6 * (1 + nu) * (1 + m2) ** 2 / ((7 + 6 * nu) * (1 + m2) ** 2 + (20 + 12 * nu) * m2)


def build_mesh(design: Design, *, extra_x_mm: tuple[float, ...] = ()) -> Mesh:
    """Nodes at every segment change, support, element and groove, then each interval
    refined so that the shaft has about ``analysis.elements`` elements."""
    shaft = design.shaft
    edges = np.array(shaft.edges_mm())
    L = edges[-1]
    keys = np.concatenate([edges, [s.x_mm for s in design.supports], [e.x_mm for e in design.elements],
                           [g.x_mm for g in shaft.grooves], np.asarray(extra_x_mm, float)])
    keys = np.sort(np.round(keys[(keys >= 0) & (keys <= L)], 9))
    keys = keys[np.concatenate([[True], keys[1:] != keys[:-1]])]  # distinct, ascending
    h = L / design.analysis.elements
    spans = np.diff(keys)
    parts = np.maximum(1, np.ceil(spans / h - 1e-9)).astype(int)
    # interval k in parts[k] equal steps, x = a + i·(b − a)/n, i = 0 … n−1 (numpy.linspace's
    # arithmetic with endpoint=False, for all intervals at once), then the end of the shaft
    i = np.arange(parts.sum(), dtype=float) - np.repeat(np.cumsum(parts) - parts, parts)
    x = np.concatenate([i * np.repeat(spans / parts, parts) + np.repeat(keys[:-1], parts), [L]])
    mid = 0.5 * (x[:-1] + x[1:])
    seg = np.clip(np.searchsorted(edges, mid, side="right") - 1, 0, len(shaft.segments) - 1)
    d = np.array([s.d_mm for s in shaft.segments])[seg]
    bore = np.array([s.bore_mm for s in shaft.segments])[seg]
    A, I, J = section_properties(d, bore)
    node_of = lambda xs: np.searchsorted(x, np.round(np.asarray(xs, float), 9) - 1e-7)  # noqa: E731
    return Mesh(x_mm=x, le_mm=np.diff(x), d_mm=d, bore_mm=bore, A_mm2=A, I_mm4=I, J_mm4=J,
                support_nodes=node_of([s.x_mm for s in design.supports]),
                element_nodes=node_of([e.x_mm for e in design.elements]))


def _element_stiffness(mesh: Mesh, E: float, G: float, nu: float, shear: bool) -> np.ndarray:
    """(…, n_el, 4, 4) Timoshenko element stiffness for DOFs (v1, θ1, v2, θ2):

    k = E·I/((1+Φ)·L³) · [[12, 6L, −12, 6L], [6L, (4+Φ)L², −6L, (2−Φ)L²],
                          [−12, −6L, 12, −6L], [6L, (2−Φ)L², −6L, (4+Φ)L²]]

    Element-wise, so a stack of meshes (leading axis) gives a stack of element matrices.
    """
    L, EI = mesh.le_mm, E * mesh.I_mm4
    if shear:
        kappa = shear_coefficient(nu, mesh.bore_mm / mesh.d_mm)
        phi = 12.0 * EI / (kappa * G * mesh.A_mm2 * L**2)
    else:
        phi = np.zeros_like(L)
    c = EI / ((1.0 + phi) * L**3)
    k = np.empty(L.shape + (4, 4))
    k[..., 0, :] = np.stack([12 + 0 * L, 6 * L, -12 + 0 * L, 6 * L], -1)
    k[..., 1, :] = np.stack([6 * L, (4 + phi) * L**2, -6 * L, (2 - phi) * L**2], -1)
    k[..., 2, :] = -k[..., 0, :]
    k[..., 3, :] = np.stack([6 * L, (2 - phi) * L**2, -6 * L, (4 + phi) * L**2], -1)
    return k * c[..., None, None]


def _dofs(n_el: int) -> np.ndarray:
    """(n_el, 4) global DOF numbers (2 per node: deflection, slope) of each element."""
    i = np.arange(n_el)[:, None]
    return np.hstack([2 * i, 2 * i + 1, 2 * i + 2, 2 * i + 3])


def assemble(ke: np.ndarray, n_nodes: int) -> np.ndarray:
    """Global matrix (…, 2N, 2N) of a chain of two-node beam elements from their matrices
    (…, n_el, 4, 4): K[dofᵢ, dofⱼ] += kₑ[i, j] over the elements (direct stiffness method),
    DOF order [v0, θ0, v1, θ1, …]. Leading axes are a stack of meshes with N nodes each."""
    lead, n_el, n = ke.shape[:-3], ke.shape[-3], 2 * n_nodes
    dof = _dofs(n_el)
    flat = (dof[:, :, None] * n + dof[:, None, :]).ravel()
    B = math.prod(lead)
    flat = (np.arange(B)[:, None] * (n * n) + flat[None, :]).ravel()
    return np.bincount(flat, weights=ke.ravel(), minlength=B * n * n).reshape(lead + (n, n))


def stack_meshes(meshes: Sequence[Mesh]) -> Mesh:
    """Meshes with equal node, support and element counts as one :class:`Mesh` whose arrays
    carry a leading axis (B, …); :func:`bending_stiffness` and the element-wise functions
    take it and return stacks."""
    return Mesh(**{f.name: np.stack([getattr(m, f.name) for m in meshes]) for f in fields(Mesh)})


def bending_stiffness(mesh: Mesh, *, E_MPa: float, G_MPa: float, shear: bool) -> tuple[np.ndarray, np.ndarray]:
    """Global bending stiffness (2N, 2N) and the element matrices (n_el, 4, 4).

    DOF order: [v0, θ0, v1, θ1, …]. Both transverse planes use this matrix. For a stack of
    meshes (:func:`stack_meshes`) both carry its leading axis.
    """
    nu = E_MPa / (2.0 * G_MPa) - 1.0
    ke = _element_stiffness(mesh, E_MPa, G_MPa, nu, shear)
    return assemble(ke, mesh.n_nodes), ke


@dataclass(frozen=True)
class BeamSolution:
    """Bending results for every load case (axis 0) and plane (axis 1: 0 = x–y, 1 = x–z).

    u_mm, slope_rad: (n_cases, 2, N) at the nodes. V_N, M_Nmm: (n_cases, 2, n_el, 2) at each
    element's start and end (shear V = Σ_left F; M sagging-positive, E·I·u'' = M).
    R_N: (n_cases, 2, n_supports) support reactions on the shaft (Fy, Fz).
    """

    u_mm: np.ndarray
    slope_rad: np.ndarray
    V_N: np.ndarray
    M_Nmm: np.ndarray
    R_N: np.ndarray


def _load_vectors(mesh: Mesh, F_nodal: np.ndarray, q_N_per_mm3: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Consistent element loads of the weight, fe (…, nc, 2, n_el, 4) = [qL/2, qL²/12, qL/2, −qL²/12]
    with q = weight density × element area [N/mm], and the nodal load vectors F_nodal + fe
    assembled, (…, nc, 2, N, 2). Leading axes: a stack of meshes (F_nodal, q with the same)."""
    L = mesh.le_mm[..., None, None, :]
    q = q_N_per_mm3[..., None] * mesh.A_mm2[..., None, None, :]  # (…, nc, 2, n_el) N/mm
    fe = np.stack([q * L / 2, q * L**2 / 12, q * L / 2, -q * L**2 / 12], axis=-1)
    f = F_nodal.copy()
    f[..., :-1, :] += fe[..., :2]
    f[..., 1:, :] += fe[..., 2:]
    return fe, f


def solve_bending(design: Design, mesh: Mesh, F_nodal: np.ndarray, q_N_per_mm3: np.ndarray) -> BeamSolution:
    """Solve K·u = f for every load case and both planes at once.

    F_nodal: (n_cases, 2, N, 2) nodal forces and couples [N, N·mm] in each plane's own DOFs
    (x–y plane: Fy and Cz; x–z plane: Fz and −Cy). q_N_per_mm3: (n_cases, 2) weight density
    [N/mm³] along y and z; times each element's area it is a uniform line load, applied as the consistent load of every element: [qL/2, qL²/12, qL/2, −qL²/12].
    """
    mat = design.shaft.material
    K, ke = bending_stiffness(mesh, E_MPa=mat.E_GPa * 1e3, G_MPa=mat.G_GPa * 1e3,
                              shear=design.analysis.shear_deformation)
    n_cases, N = F_nodal.shape[0], mesh.n_nodes
    dof = _dofs(mesh.le_mm.size)
    fe, f = _load_vectors(mesh, F_nodal, q_N_per_mm3)
    f = f.reshape(n_cases, 2, 2 * N)

    Kt = K.copy()
    rigid: list[int] = []
    for s, node in zip(design.supports, mesh.support_nodes):
        if s.radial_stiffness_N_per_mm is None:
            rigid.append(2 * node)
        else:
            Kt[2 * node, 2 * node] += s.radial_stiffness_N_per_mm
    rhs = f.reshape(-1, 2 * N).T.copy()  # (2N, nc*2)
    # rigid supports: the constrained rows and columns become identity rows (exact, no penalty)
    Kt[rigid, :] = 0.0
    Kt[:, rigid] = 0.0
    Kt[rigid, rigid] = 1.0
    rhs_free = rhs.copy()
    rhs_free[rigid] = 0.0
    try:
        u = np.linalg.solve(Kt, rhs_free)
    except np.linalg.LinAlgError:
        raise EngineError.at("supports", "the supports do not hold the shaft: it can move as a rigid body") from None
    reac_all = K @ u - rhs  # force from supports on the shaft at every DOF
    u = u.T.reshape(n_cases, 2, 2 * N)
    reac_all = reac_all.T.reshape(n_cases, 2, 2 * N)
    R = np.empty((n_cases, 2, len(design.supports)))
    for j, (s, node) in enumerate(zip(design.supports, mesh.support_nodes)):
        if s.radial_stiffness_N_per_mm is None:
            R[:, :, j] = reac_all[:, :, 2 * node]
        else:
            R[:, :, j] = -s.radial_stiffness_N_per_mm * u[:, :, 2 * node]
    # element end forces on each element: k·u_e − consistent load
    ue = u[:, :, dof]  # (nc, 2, n_el, 4)
    end = np.einsum("eij,cpej->cpei", ke, ue) - fe
    V = np.stack([end[..., 0], -end[..., 2]], axis=-1)
    M = np.stack([-end[..., 1], end[..., 3]], axis=-1)
    return BeamSolution(u_mm=u[:, :, 0::2], slope_rad=u[:, :, 1::2], V_N=V, M_Nmm=M, R_N=R)


# --- many designs at once ----------------------------------------------------------------------
#
# A study's variant differs from the next only in a few numbers, and the bending problem of each is
# block-tridiagonal (two DOFs per node, elements joining neighbours). Solving every variant of
# a study at once by block elimination (numpy operations over the variants and the load cases,
# one Python step per node) costs a few milliseconds for hundreds of variants, where one dense
# LAPACK solve per variant costs 0.5 ms on an idle core and several on a busy one. The element
# matrices and load vectors are those of solve_bending (same functions); the support
# conditions (rigid: the DOF removed, elastic: a spring on the diagonal) and the reactions
# follow engine.beam.solve_bending step by step, so the results agree with it to rounding.

def _inv2(A: np.ndarray) -> np.ndarray:
    """Inverse of a stack of 2×2 matrices (…, 2, 2) by the adjugate."""
    a, b, c, d = A[..., 0, 0], A[..., 0, 1], A[..., 1, 0], A[..., 1, 1]
    det = a * d - b * c
    out = np.empty_like(A)
    out[..., 0, 0], out[..., 0, 1], out[..., 1, 0], out[..., 1, 1] = d, -b, -c, a
    return out / det[..., None, None]


def _block_tridiagonal_solve(Dg: np.ndarray, Up: np.ndarray, Lo: np.ndarray, f: np.ndarray) -> np.ndarray:
    """Solve a batch of symmetric positive definite block-tridiagonal systems (block LU, no pivoting).

    Dg (B, N, 2, 2) diagonal blocks, Up (B, N−1, 2, 2) blocks right of the diagonal (row i,
    column i+1), Lo (B, N−1, 2, 2) blocks left of it (row i+1, column i), f (B, N, 2, R).
    Golub & Van Loan, *Matrix Computations*, 4th ed., §4.5.1 (block tridiagonal LU).
    """
    B, N = Dg.shape[:2]
    Cp = np.empty((B, N - 1, 2, 2))
    dp = np.empty_like(f)
    Minv = _inv2(Dg[:, 0])
    Cp[:, 0] = Minv @ Up[:, 0]
    dp[:, 0] = Minv @ f[:, 0]
    for i in range(1, N):
        Li = Lo[:, i - 1]
        Minv = _inv2(Dg[:, i] - Li @ Cp[:, i - 1])
        if i < N - 1:
            Cp[:, i] = Minv @ Up[:, i]
        dp[:, i] = Minv @ (f[:, i] - Li @ dp[:, i - 1])
    x = np.empty_like(f)
    x[:, N - 1] = dp[:, N - 1]
    for i in range(N - 2, -1, -1):
        x[:, i] = dp[:, i] - Cp[:, i] @ x[:, i + 1]
    return x


def solve_bending_many(designs: Sequence[Design], meshes: Sequence[Mesh], F_nodal: Sequence[np.ndarray],
                       q_N_per_mm3: Sequence[np.ndarray]) -> list[BeamSolution]:
    """:func:`solve_bending` for many designs at once (a study's variants); one BeamSolution each.

    Arguments per design as for :func:`solve_bending`. Designs with the same node, support
    and load-case counts, material and shear setting are solved together by block-tridiagonal
    elimination (:func:`_block_tridiagonal_solve`); the results agree with
    :func:`solve_bending` to rounding (a different elimination order, 1e-12 relative here).
    Raises EngineError, as solve_bending does, when the supports of a design do not hold it.
    """
    out: list[BeamSolution | None] = [None] * len(designs)
    groups: dict[tuple, list[int]] = {}
    for k, (d, m) in enumerate(zip(designs, meshes)):
        mat = d.shaft.material
        key = (m.n_nodes, m.support_nodes.size, m.element_nodes.size, F_nodal[k].shape[0],
               mat.E_GPa, mat.G_GPa, d.analysis.shear_deformation)
        groups.setdefault(key, []).append(k)
    for (N, _, _, nc, E_GPa, G_GPa, shear), ks in groups.items():
        B, n_el = len(ks), N - 1
        E, G = E_GPa * 1e3, G_GPa * 1e3
        stack = stack_meshes([meshes[k] for k in ks])
        ke = _element_stiffness(stack, E, G, E / (2.0 * G) - 1.0, shear)  # (B, n_el, 4, 4)
        fe, f = _load_vectors(stack, np.stack([F_nodal[k] for k in ks]), np.stack([q_N_per_mm3[k] for k in ks]))
        # blocks of the assembled stiffness (the same for both planes)
        Dg = np.zeros((B, N, 2, 2))
        Dg[:, :-1] += ke[:, :, :2, :2]
        Dg[:, 1:] += ke[:, :, 2:, 2:]
        Up = ke[:, :, :2, 2:].copy()
        Lo = ke[:, :, 2:, :2].copy()
        D0, U0, L0 = Dg.copy(), Up.copy(), Lo.copy()
        rhs = np.moveaxis(f, 3, 1).reshape(B, N, nc * 2, 2).transpose(0, 1, 3, 2).copy()  # (B, N, 2, R)
        rhs_orig = rhs.copy()
        rb, rn, eb, en, ek = [], [], [], [], []  # rigid (variant, node); elastic (variant, node, k)
        for b, k in enumerate(ks):
            for sup, node in zip(designs[k].supports, meshes[k].support_nodes):
                if sup.radial_stiffness_N_per_mm is None:
                    rb.append(b), rn.append(int(node))
                else:
                    eb.append(b), en.append(int(node)), ek.append(sup.radial_stiffness_N_per_mm)
        rb, rn = np.array(rb, int), np.array(rn, int)
        if rb.size:
            Dg[rb, rn, 0, :] = 0.0
            Dg[rb, rn, :, 0] = 0.0
            Dg[rb, rn, 0, 0] = 1.0
            m = rn < N - 1
            Up[rb[m], rn[m], 0, :] = 0.0
            Lo[rb[m], rn[m], :, 0] = 0.0
            m = rn > 0
            Up[rb[m], rn[m] - 1, :, 0] = 0.0
            Lo[rb[m], rn[m] - 1, 0, :] = 0.0
            rhs[rb, rn, 0, :] = 0.0
        if eb:
            np.add.at(Dg, (np.array(eb), np.array(en), 0, 0), np.array(ek))
        with np.errstate(divide="ignore", invalid="ignore"):
            u = _block_tridiagonal_solve(Dg, Up, Lo, rhs)  # (B, N, 2, R)
        # reactions with the unmodified stiffness: (K u − f) at each support's deflection DOF
        Ku = D0 @ u
        Ku[:, :-1] += U0 @ u[:, 1:]
        Ku[:, 1:] += L0 @ u[:, :-1]
        reac = Ku - rhs_orig
        u_c = u.transpose(0, 3, 1, 2).reshape(B, nc, 2, N, 2)  # (B, nc, plane, node, dof)
        r_c = reac.transpose(0, 3, 1, 2).reshape(B, nc, 2, N, 2)
        flat = u_c.reshape(B, nc, 2, 2 * N)
        ue = flat[:, :, :, _dofs(n_el)]  # (B, nc, 2, n_el, 4)
        end = (ke[:, None, None] @ ue[..., None])[..., 0] - fe  # k·u_e − consistent load, per element
        V = np.stack([end[..., 0], -end[..., 2]], axis=-1)
        M = np.stack([-end[..., 1], end[..., 3]], axis=-1)
        finite = np.isfinite(flat).all(axis=(1, 2, 3))
        for b, k in enumerate(ks):
            if not finite[b]:
                raise EngineError.at("supports", "the supports do not hold the shaft: it can move as a rigid body")
            d, m = designs[k], meshes[k]
            nodes = np.asarray(m.support_nodes, int)
            R = r_c[b][:, :, nodes, 0].copy()  # (nc, 2, n_supports)
            for j, sup in enumerate(d.supports):
                if sup.radial_stiffness_N_per_mm is not None:
                    R[:, :, j] = -sup.radial_stiffness_N_per_mm * u_c[b][:, :, nodes[j], 0]
            out[k] = BeamSolution(u_mm=flat[b][:, :, 0::2], slope_rad=flat[b][:, :, 1::2], V_N=V[b], M_Nmm=M[b], R_N=R)
    return out  # type: ignore[return-value]


def axial_and_torque(mesh: Mesh, x_load_mm: np.ndarray, Fx_N: np.ndarray, T_Nmm: np.ndarray,
                     fx_per_mm3: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Axial force N and torque T in each element (n_cases, n_el), summed from the left.

    Point axial forces Fx_N and torques T_Nmm (n_cases, n_loads) act at x_load_mm (n_loads,);
    an axial weight density fx_per_mm3 (n_cases,) [N/mm³] acts along the shaft. A load exactly
    at a node counts as left of the element that starts there. N = −Σ_left Fx, T = Σ_left T.
    """
    starts = mesh.x_mm[:-1]
    left = (x_load_mm[None, :] <= starts[:, None] + 1e-9).astype(float)  # (n_el, n_loads)
    N = -(Fx_N @ left.T)
    T = T_Nmm @ left.T
    # distributed axial weight: value at each element's mid-point
    cum = np.concatenate([[0.0], np.cumsum(mesh.A_mm2 * mesh.le_mm)])  # volume from the left end
    vol_mid = 0.5 * (cum[:-1] + cum[1:])
    N -= fx_per_mm3[:, None] * vol_mid[None, :]
    return N, T
