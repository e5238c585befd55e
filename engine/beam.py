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
system (their row and column replaced by the identity, which keeps the band), so a statically
indeterminate shaft is solved exactly, not by penalty. For point loads at nodes and the
consistent load of the shaft's weight the nodal results are exact.

Storage and solve: with the DOFs in node order [v0, θ0, v1, θ1, …] the stiffness of a chain of
two-node elements is a symmetric band of half-width 3, kept in LAPACK's lower band storage
(4, 2N): ``ab[k, j] = K[j + k, j]`` (:func:`band_assemble`). It is factored and solved by
LAPACK's ``dpbsv`` (banded Cholesky, Golub & Van Loan, *Matrix Computations*, 4th ed.,
§4.3.5), serial and O(N) in time and memory; reactions are banded products (K·u − f,
:func:`band_matvec`). No dense 2N×2N matrix is formed.

Axial force and torque are statically determinate along the shaft (supports are free in
torsion; the axial reaction comes from the bearing arrangement), so they are summed from
the left: N(x) = −Σ_left Fx (tension positive), T(x) = Σ_left torque.

Many designs at once (a study's variants, ``engine.solve_many``): :func:`solve_bending_many`
lays the band of every design end to end into one band (a block-diagonal matrix of bands is
itself a band of the same width), so all of them are factored and solved by one LAPACK call;
one design is the case of a list of one.

Precision: the condition of the bending stiffness grows as N⁴, so very fine meshes cost
digits in any displacement solver (the dense LU solve this replaced behaved the same, and so
does PyNiteFEA): on a 700 mm three-support shaft the reactions move from the coarsest mesh's by
about 5e-10 (relative) at 200 elements, 5e-7 at 1000 and 3e-4 at 5000
(``tests/benchmarks/bench_beam.py`` prints it).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, fields
from typing import Sequence

import numpy as np
from scipy.linalg import lapack

from engine.model import Design, EngineError

__all__ = ["Mesh", "build_mesh", "build_meshes", "stack_meshes", "section_properties", "shear_coefficient",
           "band_assemble", "band_factor", "band_solve", "band_matvec", "band_to_dense", "chain_bands", "bending_stiffness", "BeamSolution",
           "solve_bending", "solve_bending_many", "axial_and_torque", "NOT_HELD"]


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
    return build_meshes(design, (design.analysis.elements,), extra_x_mm=extra_x_mm)[0]


def build_meshes(design: Design, counts: Sequence[int], *, extra_x_mm: tuple[float, ...] = ()) -> list[Mesh]:
    """:func:`build_mesh` for several target element counts from one pass over the design
    (the solve's mesh and the coarser one of the eigenproblem share their key points)."""
    shaft = design.shaft
    edges = np.array(shaft.edges_mm())
    L = edges[-1]
    keys = np.concatenate([edges, [s.x_mm for s in design.supports], [e.x_mm for e in design.elements],
                           [g.x_mm for g in shaft.grooves], np.asarray(extra_x_mm, float)])
    keys = np.sort(np.round(keys[(keys >= 0) & (keys <= L)], 9))
    keys = keys[np.concatenate([[True], keys[1:] != keys[:-1]])]  # distinct, ascending
    spans = np.diff(keys)
    seg_d = np.array([s.d_mm for s in shaft.segments])
    seg_bore = np.array([s.bore_mm for s in shaft.segments])
    sup_x = np.round(np.asarray([s.x_mm for s in design.supports], float), 9) - 1e-7
    el_x = np.round(np.asarray([e.x_mm for e in design.elements], float), 9) - 1e-7
    out = []
    for count in counts:
        h = L / count
        parts = np.maximum(1, np.ceil(spans / h - 1e-9)).astype(int)
        # interval k in parts[k] equal steps, x = a + i·(b − a)/n, i = 0 … n−1 (numpy.linspace's
        # arithmetic with endpoint=False, for all intervals at once), then the end of the shaft
        i = np.arange(parts.sum(), dtype=float) - np.repeat(np.cumsum(parts) - parts, parts)
        x = np.concatenate([i * np.repeat(spans / parts, parts) + np.repeat(keys[:-1], parts), [L]])
        mid = 0.5 * (x[:-1] + x[1:])
        seg = np.clip(np.searchsorted(edges, mid, side="right") - 1, 0, len(shaft.segments) - 1)
        d, bore = seg_d[seg], seg_bore[seg]
        A, I, J = section_properties(d, bore)
        out.append(Mesh(x_mm=x, le_mm=np.diff(x), d_mm=d, bore_mm=bore, A_mm2=A, I_mm4=I, J_mm4=J,
                        support_nodes=np.searchsorted(x, sup_x), element_nodes=np.searchsorted(x, el_x)))
    return out


def _element_stiffness(mesh: Mesh, E: float, G: float, nu: float, shear: bool) -> np.ndarray:
    """(…, n_el, 4, 4) Timoshenko element stiffness for DOFs (v1, θ1, v2, θ2):

    k = E·I/((1+Φ)·L³) · [[12, 6L, −12, 6L], [6L, (4+Φ)L², −6L, (2−Φ)L²],
                          [−12, −6L, 12, −6L], [6L, (2−Φ)L², −6L, (4+Φ)L²]]

    Element-wise, so a stack of meshes (leading axis) gives a stack of element matrices.
    """
    L, EI = mesh.le_mm, E * mesh.I_mm4
    shear = np.asarray(shear, dtype=bool)  # one setting, or one per element
    if shear.any():
        kappa = shear_coefficient(nu, mesh.bore_mm / mesh.d_mm)
        phi = np.where(shear, 12.0 * EI / (kappa * G * mesh.A_mm2 * L**2), 0.0)
    else:
        phi = np.zeros_like(L)
    c = EI / ((1.0 + phi) * L**3)
    k = np.empty(L.shape + (4, 4))
    k[..., 0, :] = np.stack([12 + 0 * L, 6 * L, -12 + 0 * L, 6 * L], -1)
    k[..., 1, :] = np.stack([6 * L, (4 + phi) * L**2, -6 * L, (2 - phi) * L**2], -1)
    k[..., 2, :] = -k[..., 0, :]
    k[..., 3, :] = np.stack([6 * L, (2 - phi) * L**2, -6 * L, (4 + phi) * L**2], -1)
    return k * c[..., None, None]


def band_assemble(ke: np.ndarray, starts: np.ndarray, n_dof: int) -> np.ndarray:
    """Lower band storage (4, n_dof) of the symmetric matrix of two-node beam elements.

    ``ke`` (n_el, 4, 4) element matrices over (v1, θ1, v2, θ2); ``starts`` (n_el,) the first
    node of each element in the global numbering (DOFs 2·node, 2·node + 1). Direct stiffness
    method, K[i, j] += kₑ[p, q], kept as ``ab[i − j, j]`` for i ≥ j (LAPACK's lower storage,
    half-width 3). Each (p, q) touches one entry per element, so the sums are plain slices.
    """
    ab = np.zeros((4, n_dof))
    col = 2 * np.asarray(starts, dtype=np.intp)
    for p in range(4):
        for q in range(p + 1):
            ab[p - q, col + q] += ke[:, p, q]
    return ab


def band_matvec(ab: np.ndarray, x: np.ndarray) -> np.ndarray:
    """K·x for K symmetric in lower band storage ``ab`` (kd + 1, n), x (n,) or (n, R)."""
    y = ab[0].reshape((-1,) + (1,) * (x.ndim - 1)) * x
    n = ab.shape[1]
    for k in range(1, ab.shape[0]):
        a = ab[k, :n - k].reshape((-1,) + (1,) * (x.ndim - 1))
        y[k:] += a * x[:n - k]
        y[:n - k] += a * x[k:]
    return y


def band_to_dense(ab: np.ndarray) -> np.ndarray:
    """The full matrix of a lower band (for inspection and tests; the engine never forms it)."""
    n = ab.shape[1]
    A = np.diag(ab[0])
    for k in range(1, ab.shape[0]):
        A += np.diag(ab[k, :n - k], -k) + np.diag(ab[k, :n - k], k)
    return A


def _pin(ab: np.ndarray, dofs: np.ndarray) -> None:
    """Remove DOFs from a lower band in place: their rows and columns zero, diagonal 1 (exact
    elimination of a rigid support, no penalty; the band keeps its width)."""
    dofs = np.asarray(dofs, dtype=np.intp)
    if not dofs.size:
        return
    for k in range(1, ab.shape[0]):
        ab[k, dofs] = 0.0                      # column below the diagonal: K[r + k, r]
        left = dofs - k
        ab[k, left[left >= 0]] = 0.0           # row left of the diagonal: K[r, r − k]
    ab[0, dofs] = 1.0


def chain_bands(meshes: Sequence[Mesh]) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Meshes laid end to end: (node offset of each mesh (B + 1,), element start nodes in the
    joint numbering (Σ n_el,), mesh of each element (Σ n_el,)). No element joins two meshes,
    so their bands form one block-diagonal band."""
    n_nodes = np.array([m.n_nodes for m in meshes], dtype=np.intp)
    off = np.concatenate([[0], np.cumsum(n_nodes)])
    owner = np.repeat(np.arange(len(meshes)), n_nodes - 1)
    starts = np.concatenate([off[b] + np.arange(m.n_nodes - 1) for b, m in enumerate(meshes)]) \
        if meshes else np.zeros(0, np.intp)
    return off, starts, owner


def _joined(meshes: Sequence[Mesh]) -> Mesh:
    """The element arrays of several meshes concatenated (element-wise functions take it)."""
    cat = lambda f: np.concatenate([getattr(m, f) for m in meshes])  # noqa: E731
    return Mesh(x_mm=cat("x_mm"), le_mm=cat("le_mm"), d_mm=cat("d_mm"), bore_mm=cat("bore_mm"),
                A_mm2=cat("A_mm2"), I_mm4=cat("I_mm4"), J_mm4=cat("J_mm4"),
                support_nodes=np.zeros(0, np.intp), element_nodes=np.zeros(0, np.intp))


def stack_meshes(meshes: Sequence[Mesh]) -> Mesh:
    """Meshes with equal node, support and element counts as one :class:`Mesh` whose arrays
    carry a leading axis (B, …), for element-wise functions."""
    return Mesh(**{f.name: np.stack([getattr(m, f.name) for m in meshes]) for f in fields(Mesh)})


def _element_matrices(designs: Sequence[Design], meshes: Sequence[Mesh], owner: np.ndarray) -> np.ndarray:
    """Timoshenko element matrices (Σ n_el, 4, 4) of several designs, each with its material
    and shear setting, evaluated once over all their elements."""
    joined = _joined(meshes)
    E = np.array([d.shaft.material.E_GPa * 1e3 for d in designs])[owner]
    G = np.array([d.shaft.material.G_GPa * 1e3 for d in designs])[owner]
    shear = np.array([d.analysis.shear_deformation for d in designs], dtype=bool)[owner]
    return _element_stiffness(joined, E, G, E / (2.0 * G) - 1.0, shear)


def bending_stiffness(mesh: Mesh, *, E_MPa: float, G_MPa: float, shear: bool) -> tuple[np.ndarray, np.ndarray]:
    """Global bending stiffness of one mesh in lower band storage (4, 2N) and the element
    matrices (n_el, 4, 4). DOF order [v0, θ0, v1, θ1, …]; both transverse planes use it."""
    nu = E_MPa / (2.0 * G_MPa) - 1.0
    ke = _element_stiffness(mesh, E_MPa, G_MPa, nu, shear)
    return band_assemble(ke, np.arange(mesh.n_nodes - 1), 2 * mesh.n_nodes), ke


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
    """Consistent element loads of the weight, fe (nc, 2, n_el, 4) = [qL/2, qL²/12, qL/2, −qL²/12]
    with q = weight density × element area [N/mm], and the nodal load vectors F_nodal + fe
    assembled, (nc, 2, N, 2)."""
    L = mesh.le_mm[None, None, :]
    q = q_N_per_mm3[..., None] * mesh.A_mm2[None, None, :]  # (nc, 2, n_el) N/mm
    fe = np.stack([q * L / 2, q * L**2 / 12, q * L / 2, -q * L**2 / 12], axis=-1)
    f = F_nodal.copy()
    f[..., :-1, :] += fe[..., :2]
    f[..., 1:, :] += fe[..., 2:]
    return fe, f


NOT_HELD = "the supports do not hold the shaft: it can move as a rigid body"
# a Cholesky pivot below this share of its diagonal entry: the matrix is singular to working
# precision (a mechanism), not merely flexible (common practice for a singularity test)
_PIVOT_MIN = 1e-13


def _support_stiffness(design: Design) -> np.ndarray:
    """(n_supports,) radial stiffness of each support as typed [N/mm]; NaN: rigid."""
    return np.array([np.nan if s.radial_stiffness_N_per_mm is None else s.radial_stiffness_N_per_mm
                     for s in design.supports], float)


def band_factor(ab: np.ndarray, off: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Banded Cholesky factor of a chain of bands (LAPACK ``dpbtrf``), and for each block
    (``off``: DOF offsets, B + 1) whether it is positive definite to working precision.
    A block that is not has its band replaced by the identity so the others still factor."""
    ab = ab.copy()
    bad = np.zeros(off.size - 1, dtype=bool)
    while True:
        c, info = lapack.dpbtrf(ab, lower=1)
        if info == 0:
            piv = c[0] ** 2 / np.where(ab[0] > 0, ab[0], 1.0)
            weak = np.flatnonzero(piv < _PIVOT_MIN)
            if not weak.size:
                return c, bad
            blocks = np.unique(np.searchsorted(off, weak, side="right") - 1)
        elif info > 0:
            blocks = np.array([np.searchsorted(off, info - 1, side="right") - 1])
        else:  # pragma: no cover - an argument error is a programming error
            raise ValueError(f"dpbtrf argument {-info} is invalid")
        for b in blocks:
            bad[b] = True
            ab[:, off[b]:off[b + 1]] = 0.0
            ab[0, off[b]:off[b + 1]] = 1.0


def band_solve(c: np.ndarray, Z: np.ndarray) -> np.ndarray:
    """K⁻¹·Z from the banded Cholesky factor ``c`` of :func:`band_factor` (LAPACK ``dpbtrs``)."""
    x, info = lapack.dpbtrs(c, Z, lower=1)
    if info != 0:  # pragma: no cover - the factor is valid by construction
        raise ValueError(f"dpbtrs argument {-info} is invalid")
    return x


def solve_bending_many(designs: Sequence[Design], meshes: Sequence[Mesh], F_nodal: Sequence[np.ndarray],
                       q_N_per_mm3: Sequence[np.ndarray],
                       springs: Sequence[np.ndarray | None] | None = None) -> list[BeamSolution | EngineError]:
    """Solve K·u = f of many designs, every load case and both planes, by one banded solve.

    Per design: ``F_nodal`` (n_cases, 2, N, 2) nodal forces and couples [N, N·mm] in each
    plane's own DOFs (x–y plane: Fy and Cz; x–z plane: Fz and −Cy); ``q_N_per_mm3`` (n_cases, 2)
    weight density [N/mm³] along y and z, applied as the consistent load of every element
    [qL/2, qL²/12, qL/2, −qL²/12]; optional ``springs`` (n_cases, n_supports) radial stiffness
    of each support in each case [N/mm] (NaN: as the design says, rigid or typed), for
    bearings whose stiffness depends on the case's load. The designs' bands are laid end to
    end (:func:`chain_bands`), one band per design, or one per load case of a design with
    springs of its own per case, and the right-hand sides side by side (zero columns where a
    block has fewer cases), so all are factored and solved at once; one BeamSolution each, or
    an EngineError for a design whose supports do not hold it.
    """
    B = len(designs)
    if not B:
        return []
    springs = list(springs) if springs is not None else [None] * B
    blocks: list[tuple[int, slice, np.ndarray]] = []  # (design, its cases, support stiffness (ns,); NaN rigid)
    for b, d in enumerate(designs):
        typed = _support_stiffness(d)
        nc = F_nodal[b].shape[0]
        if springs[b] is None:
            blocks.append((b, slice(0, nc), typed))
        else:
            sp = np.asarray(springs[b], float)
            blocks += [(b, slice(j, j + 1), np.where(np.isfinite(sp[j]), sp[j], typed)) for j in range(nc)]
    bm = [meshes[b] for b, _, _ in blocks]
    off, starts, owner = chain_bands(bm)
    dof_off = 2 * off
    n_dof = int(dof_off[-1])
    ke = _element_matrices([designs[b] for b, _, _ in blocks], bm, owner)
    K0 = band_assemble(ke, starts, n_dof)
    R = 2 * max(F_nodal[b][cs].shape[0] for b, cs, _ in blocks)
    rhs = np.zeros((n_dof, R))
    fes, rigid_all = [], []
    Kt = K0.copy()
    for k, ((b, cs, kv), m) in enumerate(zip(blocks, bm)):
        fe, f = _load_vectors(m, F_nodal[b][cs], q_N_per_mm3[b][cs])
        fes.append(fe)
        nc = f.shape[0]
        rhs[dof_off[k]:dof_off[k + 1], :2 * nc] = f.reshape(2 * nc, 2 * m.n_nodes).T
        nodes = np.asarray(m.support_nodes, np.intp)
        el = np.isfinite(kv)
        rigid_all.append(dof_off[k] + 2 * nodes[~el])
        np.add.at(Kt[0], dof_off[k] + 2 * nodes[el], kv[el])
    K0s = Kt.copy()  # with the springs, before the rigid DOFs are removed (reactions use it)
    rigid = np.concatenate(rigid_all) if rigid_all else np.zeros(0, np.intp)
    _pin(Kt, rigid)
    rhs_free = rhs.copy()
    rhs_free[rigid] = 0.0
    c, bad = band_factor(Kt, dof_off)
    u = band_solve(c, rhs_free)
    reac = band_matvec(K0s, u) - rhs  # force from the supports (and springs) on the shaft at every DOF
    parts: list[list] = [[] for _ in range(B)]
    for k, ((b, cs, kv), m) in enumerate(zip(blocks, bm)):
        if bad[k]:
            parts[b].append(None)
            continue
        nc, N = F_nodal[b][cs].shape[0], m.n_nodes
        ub = u[dof_off[k]:dof_off[k + 1], :2 * nc].T.reshape(nc, 2, 2 * N)
        rb = reac[dof_off[k]:dof_off[k + 1], :2 * nc].T.reshape(nc, 2, 2 * N)
        Rb = rb[:, :, 2 * np.asarray(m.support_nodes, np.intp)].copy()
        for j in np.flatnonzero(np.isfinite(kv)):  # a spring's force on the shaft: −k·u
            Rb[:, :, j] = -kv[j] * ub[:, :, 2 * int(m.support_nodes[j])]
        e0 = np.searchsorted(owner, k)
        kb = ke[e0:e0 + N - 1]
        ue = np.stack([ub[:, :, 0:-2:2], ub[:, :, 1:-2:2], ub[:, :, 2::2], ub[:, :, 3::2]], axis=-1)
        end = np.einsum("eij,cpej->cpei", kb, ue) - fes[k]  # k·u_e − consistent load, per element
        V = np.stack([end[..., 0], -end[..., 2]], axis=-1)
        M = np.stack([-end[..., 1], end[..., 3]], axis=-1)
        parts[b].append(BeamSolution(u_mm=ub[:, :, 0::2], slope_rad=ub[:, :, 1::2], V_N=V, M_Nmm=M, R_N=Rb))
    out: list[BeamSolution | EngineError] = []
    for ps in parts:
        if any(p is None for p in ps):
            out.append(EngineError.at("supports", NOT_HELD))
        elif len(ps) == 1:
            out.append(ps[0])
        else:
            out.append(BeamSolution(**{f.name: np.concatenate([getattr(p, f.name) for p in ps])
                                       for f in fields(BeamSolution)}))
    return out


def solve_bending(design: Design, mesh: Mesh, F_nodal: np.ndarray, q_N_per_mm3: np.ndarray) -> BeamSolution:
    """:func:`solve_bending_many` of one design; raises its EngineError when the supports do
    not hold the shaft."""
    sol = solve_bending_many([design], [mesh], [F_nodal], [q_N_per_mm3])[0]
    if isinstance(sol, EngineError):
        raise sol
    return sol


def axial_and_torque(mesh: Mesh, x_load_mm: np.ndarray, Fx_N: np.ndarray, T_Nmm: np.ndarray,
                     fx_per_mm3: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Axial force N and torque T in each element (n_cases, n_el), summed from the left.

    Point axial forces Fx_N and torques T_Nmm (n_cases, n_loads) act at x_load_mm (n_loads,);
    an axial weight density fx_per_mm3 (n_cases,) [N/mm³] acts along the shaft. A load exactly
    at a node counts as left of the element that starts there. N = −Σ_left Fx, T = Σ_left T.
    """
    starts = mesh.x_mm[:-1]
    # running sums over the loads in order of x, read at each element start: O(N + loads)
    order = np.argsort(x_load_mm, kind="stable")
    xs = np.asarray(x_load_mm, float)[order]
    count = np.searchsorted(xs, starts + 1e-9, side="right")  # loads at or left of each start
    zero = np.zeros((Fx_N.shape[0], 1))
    N = -np.concatenate([zero, np.cumsum(Fx_N[:, order], axis=1)], axis=1)[:, count]
    T = np.concatenate([zero, np.cumsum(T_Nmm[:, order], axis=1)], axis=1)[:, count]
    # distributed axial weight: value at each element's mid-point
    cum = np.concatenate([[0.0], np.cumsum(mesh.A_mm2 * mesh.le_mm)])  # volume from the left end
    vol_mid = 0.5 * (cum[:-1] + cum[1:])
    N -= fx_per_mm3[:, None] * vol_mid[None, :]
    return N, T
