"""Shaft dynamics: lateral natural frequencies (consistent-mass finite elements), Rayleigh's
estimate as a cross-check, and the first torsional frequency of the inertias on the shaft.

Units inside: mm, N, tonne (10³ kg), s — a consistent set: N/mm ÷ t = 1/s². Frequencies are
returned in rpm (cycles per minute, 60·ω/2π).

Public functions
----------------
- :func:`dynamics_mesh` — a coarser copy of the solver's mesh for the eigenproblem.
- :func:`consistent_mass` — consistent mass matrix of the beam elements, lower band storage.
- :func:`lateral_bands` — stiffness and mass bands of many designs laid end to end, rigid
  supports removed (the engine's path: banded, O(N) memory).
- :func:`lateral_system` — the same as full matrices (K, M, free DOFs) for inspection and tests.
- :func:`generalized_eigen` — K φ = ω² M φ by a Cholesky factor and ``numpy.linalg.eigh``
  (small dense problems: the Rayleigh–Ritz step of the subspace iteration).
- :func:`subspace_iteration` — the lowest few eigenpairs of a full pair (K, M), by the same
  iteration the engine runs on the bands.
- :func:`lateral_frequencies` — the first few lateral frequencies and mode shapes of a design.
- :func:`lateral_frequencies_many` — the same for many designs at once (``engine.solve_many``):
  their bands laid end to end, one banded Cholesky factor (LAPACK ``dpbtrf``) and one
  subspace iteration over all of them, each converging on its own.
- :func:`rayleigh_frequency` — Rayleigh's quotient with the static deflection shape.
- :func:`torsional_frequency` — first torsional frequency of the element inertias.

Notes
-----
Both transverse planes have the same frequencies (round section, isotropic supports), so one
plane is solved. Element masses are lumped at their nodes (translation only; their diametral
inertia and gyroscopic effects are left out). The shaft's rotary inertia is left out, so with
``analysis.shear_deformation`` the stiffness is Timoshenko's and the mass Euler–Bernoulli's.
Rigid supports pin the deflection; elastic ones add their radial stiffness at the node.

References
----------
.. [1] Przemieniecki, J. S., *Theory of Matrix Structural Analysis*, McGraw-Hill, 1968, §11
   (consistent mass matrix of a beam element).
.. [2] Bathe, K.-J., *Finite Element Procedures*, 1996, §10.2 (reduction of the generalised
   eigenproblem to standard form with the Cholesky factor).
.. [3] Budynas, R. G., Nisbett, J. K., *Shigley's Mechanical Engineering Design*, 9th ed.,
   §7-6, Eq. 7-23 (Rayleigh's method for a shaft with lumped masses) and Eq. 7-22
   (simply supported uniform shaft).
.. [4] Den Hartog, J. P., *Mechanical Vibrations*, 4th ed., 1956 (two-inertia torsional system).

Section and equation numbers are as recalled (memory).
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Sequence

import numpy as np

from engine.beam import (Mesh, _element_matrices, _joined, _pin, band_assemble, band_factor, band_matvec,
                         band_solve, band_to_dense, build_meshes, chain_bands)
from engine.model import Design

__all__ = ["DYNAMICS_ELEMENTS", "dynamics_mesh", "consistent_mass", "lateral_bands", "lateral_system",
           "generalized_eigen", "subspace_iteration", "LateralModes", "lateral_frequencies",
           "lateral_frequencies_many", "rayleigh_frequency", "torsional_frequency", "rad_s_to_rpm"]

# Elements for the eigenproblem: about thirty consistent-mass elements give the first three
# frequencies of the demo shafts within 0.07 % of the 120-element mesh, and keep the eigenproblem small.
DYNAMICS_ELEMENTS = 30


def rad_s_to_rpm(omega):
    """ω [rad/s] → n [rpm] = 60·ω/(2π)."""
    return np.asarray(omega, float) * 30.0 / math.pi


def dynamics_elements(design: Design) -> int:
    """Target element count of the eigenproblem's mesh."""
    return min(DYNAMICS_ELEMENTS, design.analysis.elements)


def dynamics_mesh(design: Design, *, elements: int = DYNAMICS_ELEMENTS) -> Mesh:
    """The solver's mesh rebuilt with ``elements`` target elements (nodes still at every segment
    change, support, element and groove)."""
    return build_meshes(design, (min(elements, design.analysis.elements),))[0]


def _mass_elements(mesh: Mesh, rho_t_mm3) -> np.ndarray:
    """Consistent mass matrices (n_el, 4, 4) [t] of the elements (ρ per element or one)."""
    L = mesh.le_mm
    c = rho_t_mm3 * mesh.A_mm2 * L / 420.0
    one = np.ones_like(L)
    return np.stack([
        np.stack([156 * one, 22 * L, 54 * one, -13 * L], -1),
        np.stack([22 * L, 4 * L**2, 13 * L, -3 * L**2], -1),
        np.stack([54 * one, 13 * L, 156 * one, -22 * L], -1),
        np.stack([-13 * L, -3 * L**2, -22 * L, 4 * L**2], -1),
    ], -2) * c[..., None, None]


def consistent_mass(mesh: Mesh, *, rho_t_mm3: float) -> np.ndarray:
    """Consistent mass matrix of the shaft in lower band storage (4, 2N) [t], DOFs [v0, θ0, v1, θ1, …].

    .. math:: m_e = \\frac{\\rho A L}{420}\\begin{bmatrix}156 & 22L & 54 & -13L\\\\
              22L & 4L^2 & 13L & -3L^2\\\\ 54 & 13L & 156 & -22L\\\\ -13L & -3L^2 & -22L & 4L^2\\end{bmatrix}

    Parameters
    ----------
    mesh : the beam mesh (element lengths [mm] and areas [mm²])
    rho_t_mm3 : density, [t/mm³] (kg/m³ · 10⁻¹²)

    References: Przemieniecki [1], Eq. 11.39 (Euler–Bernoulli beam element).
    """
    return band_assemble(_mass_elements(mesh, rho_t_mm3), np.arange(mesh.n_nodes - 1), 2 * mesh.n_nodes)


def lateral_bands(designs: Sequence[Design], meshes: Sequence[Mesh]):
    """(K, M, off, pinned) of several designs laid end to end: stiffness [N/mm] with the
    support springs and mass [t] with the element masses lumped at their nodes, both in lower
    band storage (4, n); DOF offsets of each design (B + 1,); the DOFs of the rigid supports,
    removed from both (K: identity row and column, M: zero, so they carry no mode)."""
    off, starts, owner = chain_bands(meshes)
    dof_off = 2 * off
    n = int(dof_off[-1])
    K = band_assemble(_element_matrices(designs, meshes, owner), starts, n)
    rho = np.array([d.shaft.material.density_kg_m3 * 1e-12 for d in designs])[owner]
    M = band_assemble(_mass_elements(_joined(meshes), rho), starts, n)
    pinned = []
    for b, (design, mesh) in enumerate(zip(designs, meshes)):
        o = dof_off[b]
        for e, node in zip(design.elements, mesh.element_nodes):
            M[0, o + 2 * node] += e.mass_kg * 1e-3
        for s, node in zip(design.supports, mesh.support_nodes):
            if s.radial_stiffness_N_per_mm is None:
                pinned.append(o + 2 * int(node))
            else:
                K[0, o + 2 * node] += s.radial_stiffness_N_per_mm
    pinned = np.array(pinned, np.intp)
    _pin(K, pinned)
    M[:, pinned] = 0.0
    for k in range(1, 4):
        left = pinned - k
        M[k, left[left >= 0]] = 0.0
    return K, M, dof_off, pinned


def lateral_system(design: Design, mesh: Mesh) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(K, M, free) as full matrices: stiffness [N/mm] with support springs, mass [t] with the
    element masses lumped at their nodes, and the indices of the DOFs left free by the rigid
    supports. For inspection and tests; the engine works on :func:`lateral_bands`."""
    K, M, _, pinned = lateral_bands([design], [mesh])
    free = np.setdiff1d(np.arange(K.shape[1]), pinned)
    return band_to_dense(K), band_to_dense(M), free


def _T(A: np.ndarray) -> np.ndarray:
    """Transpose of the last two axes (a stack of matrices)."""
    return np.swapaxes(A, -1, -2)


def generalized_eigen(K: np.ndarray, M: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Solve K φ = λ M φ for symmetric positive definite K and positive semi-definite M.

    With the Cholesky factor K = L·Lᵀ the problem becomes the standard symmetric one
    (L⁻¹ M L⁻ᵀ) ψ = μ ψ with μ = 1/λ and φ = L⁻ᵀ ψ (Bathe [2] §10.2.5). Factoring K rather
    than M keeps the lowest modes accurate when heavy lumped masses sit on a light shaft (M
    is then badly conditioned, K is not), and a massless DOF only gives λ = ∞.
    Returns (λ ascending, Φ columns M-orthonormal; columns of infinite λ left unscaled).
    Stacks of problems (…, n, n) are solved at once (λ (…, n), Φ (…, n, n)). Meant for small
    problems (the Rayleigh–Ritz step, a few rows).

    >>> lam, _ = generalized_eigen(np.array([[2.0, -1.0], [-1.0, 2.0]]), np.eye(2))
    >>> [round(float(v), 6) for v in lam]
    [1.0, 3.0]
    """
    Lc = np.linalg.cholesky(K)
    Linv = np.linalg.inv(Lc)  # triangular and small: the explicit inverse is cheap and stable here
    B = Linv @ M @ _T(Linv)
    scale = np.abs(B).max(axis=(-2, -1), keepdims=True)
    scale = np.where(scale > 0, scale, 1.0)  # eigh is markedly slower on badly scaled entries here
    mu, psi = np.linalg.eigh((0.5 / scale) * (B + _T(B)))
    mu = mu[..., ::-1] * scale[..., 0]
    phi = _T(Linv) @ psi[..., ::-1]
    with np.errstate(divide="ignore"):
        lam = np.where(mu > 1e-14 * mu[..., :1], 1.0 / np.maximum(mu, 1e-300), np.inf)
    mass = np.sum(phi * (M @ phi), axis=-2)
    phi = phi / np.sqrt(np.where(mass > 0, mass, 1.0))[..., None, :]
    return lam, phi


_START_SEED = 20240611


def _ritz(Kr: np.ndarray, Mr: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The Rayleigh–Ritz step of the subspace iteration on a stack of small pairs (B, p, p):
    the reduction of :func:`generalized_eigen` (K = L·Lᵀ, (L⁻¹ M L⁻ᵀ) ψ = μ ψ, λ = 1/μ,
    Bathe [2] §10.2.5) with the M-normalisation read off μ (φᵀ M φ = ψᵀ(L⁻¹ M L⁻ᵀ)ψ = μ),
    so no further product with M. Returns (λ ascending, Φ). Raises LinAlgError when K is not
    positive definite (the trial space has collapsed)."""
    Linv = np.linalg.inv(np.linalg.cholesky(Kr))
    A = Linv @ Mr @ _T(Linv)
    mu, psi = np.linalg.eigh(0.5 * (A + _T(A)))
    mu, psi = mu[..., ::-1], psi[..., ::-1]
    good = mu > 1e-14 * mu[..., :1]
    with np.errstate(divide="ignore"):
        lam = np.where(good, 1.0 / np.where(good, mu, 1.0), np.inf)
    phi = (_T(Linv) @ psi) / np.sqrt(np.where(good, mu, 1.0))[..., None, :]
    return lam, phi


def _start_vectors(sizes: np.ndarray, diagM: np.ndarray, p: int) -> np.ndarray:
    """Trial vectors of the subspace iteration: the mass diagonal and fixed pseudo-random
    columns, the same for every block by local row (a design's modes do not depend on the
    others solved beside it)."""
    R = np.random.default_rng(_START_SEED).standard_normal((int(sizes.max()), p - 1))
    X = np.empty((diagM.size, p))
    X[:, 0] = diagM
    X[:, 1:] = np.concatenate([R[:m] for m in sizes])
    return X


def _blocks_T(Y: np.ndarray, Z: np.ndarray, off: np.ndarray) -> np.ndarray:
    """Yᵀ·Z of every block of rows (off: B + 1 offsets), (B, p, p)."""
    return np.add.reduceat(Y[:, :, None] * Z[:, None, :], off[:-1], axis=0)


def _subspace(solve_K, mul_M, diagM: np.ndarray, off: np.ndarray, n_modes: int, *,
              tol: float = 1e-11, max_iter: int = 80):
    """The subspace iteration of Bathe [2] §11.6 on B independent blocks of one system.

    ``solve_K(Z)`` = K⁻¹·Z and ``mul_M(Z)`` = M·Z act on the whole chain (n, p); ``off`` are
    the blocks' row offsets. With p = max(2q, q + 4) trial vectors X per block: Y = K⁻¹·M·X,
    the Rayleigh–Ritz problem (YᵀKY) Q = (YᵀMY) Q Λ of size p (YᵀKY = Yᵀ(MX) since KY = MX)
    by :func:`_ritz`, X = Y·Q, until the q lowest λ of a block change by less than
    ``tol`` (relative); a converged block keeps the pairs of the step it converged at.
    Returns (λ (B, q), Φ (n, q) M-orthonormal per block, collapsed (B,) bool: blocks whose
    trial space collapsed, which the caller solves in full).
    """
    sizes = np.diff(off)
    B = sizes.size
    p = max(2 * n_modes, n_modes + 4)
    X = _start_vectors(sizes, diagM, p)
    owner = np.repeat(np.arange(B), sizes)
    lam_out = np.full((B, n_modes), np.nan)
    phi_out = np.zeros((X.shape[0], n_modes))
    done = np.zeros(B, dtype=bool)
    collapsed = np.zeros(B, dtype=bool)
    old = None
    MX = mul_M(X)
    # X = Y·Q block by block; one block without the (n, p, p) gather, by the same arithmetic
    rows_of = ((lambda Z, Q: np.einsum("np,pq->nq", Z, Q[0])) if B == 1  # noqa: E731
               else (lambda Z, Q: np.einsum("np,npq->nq", Z, Q[owner])))
    for _ in range(max_iter):
        Y = solve_K(MX)
        MY = mul_M(Y)
        Kr, Mr = _blocks_T(Y, MX, off), _blocks_T(Y, MY, off)
        Kr, Mr = 0.5 * (Kr + _T(Kr)), 0.5 * (Mr + _T(Mr))
        live = ~done & ~collapsed
        try:
            lam, Q = _ritz(Kr, Mr)
        except np.linalg.LinAlgError:
            lam, Q = np.full((B, p), np.nan), np.zeros((B, p, p))
            for b in np.flatnonzero(live):
                try:
                    lam[b], Q[b] = _ritz(Kr[b:b + 1], Mr[b:b + 1])
                except np.linalg.LinAlgError:
                    # the trial space has collapsed (few masses carry nearly all the mass, so M
                    # has fewer significant directions than p)
                    collapsed[b] = True
            live &= ~collapsed
        X = rows_of(Y, Q)
        MX = rows_of(MY, Q)  # M·X of the next step without another product with M
        low = lam[:, :n_modes]
        if old is not None:
            conv = live & np.all(np.abs(low - old) <= tol * np.abs(low), axis=1)
        else:
            conv = np.zeros(B, dtype=bool)
        rows = conv[owner]
        lam_out[conv] = low[conv]
        phi_out[rows] = X[rows, :n_modes]
        done |= conv
        if np.all(done | collapsed):
            break
        old = low
    else:
        rest = ~done & ~collapsed
        lam_out[rest] = lam[rest, :n_modes]
        phi_out[rest[owner]] = X[rest[owner], :n_modes]
    return lam_out, phi_out, collapsed


def subspace_iteration(K: np.ndarray, M: np.ndarray, n_modes: int, *, tol: float = 1e-11,
                       max_iter: int = 80) -> tuple[np.ndarray, np.ndarray]:
    """The lowest ``n_modes`` eigenpairs of a full pair K φ = λ M φ (K positive definite), by
    the subspace iteration the engine runs on its bands (:func:`_subspace`, Bathe [2] §11.6);
    a pair too small for it (n ≤ p) or whose trial space collapses is solved in full by
    :func:`generalized_eigen`. Returns (λ ascending (q,), Φ (n, q) M-orthonormal)."""
    n = K.shape[-1]
    p = max(2 * n_modes, n_modes + 4)
    if p < n:
        Lc = np.linalg.cholesky(K)
        solve = lambda Z: np.linalg.solve(_T(Lc), np.linalg.solve(Lc, Z))  # noqa: E731
        lam, phi, collapsed = _subspace(solve, lambda Z: M @ Z, np.diagonal(M).copy(), np.array([0, n]),
                                        n_modes, tol=tol, max_iter=max_iter)
        if not collapsed[0]:
            return lam[0], phi
    lam, phi = generalized_eigen(K, M)
    return lam[..., :n_modes], phi[..., :n_modes]


@dataclass(frozen=True)
class LateralModes:
    """First lateral modes: ω [rad/s], n [rpm], mode shapes on the free DOFs (columns,
    M-normalised) with the free DOF numbers, the mesh, and Rayleigh's cross-check of ω₁ [rpm]
    (:func:`rayleigh_frequency`)."""

    omega_rad_s: np.ndarray
    rpm: np.ndarray
    shapes: np.ndarray
    free: np.ndarray
    mesh: Mesh
    rayleigh_rpm: float = math.nan


def _full_block(K: np.ndarray, M: np.ndarray, lo: int, hi: int, n_modes: int) -> tuple[np.ndarray, np.ndarray]:
    """All eigenpairs of one block of the bands, densely: only for a block whose trial space
    collapsed (the eigenproblem's mesh is coarse, about DYNAMICS_ELEMENTS elements)."""
    Kd, Md = band_to_dense(K[:, lo:hi]), band_to_dense(M[:, lo:hi])
    lam, phi = generalized_eigen(Kd, Md)
    return lam[:n_modes], phi[:, :n_modes]


def lateral_frequencies_many(designs: Sequence[Design], *, n_modes: int = 3,
                             meshes: Sequence[Mesh] | None = None) -> list[LateralModes | None]:
    """The first ``n_modes`` lateral natural frequencies of each design on its supports.

    .. math:: (K - \\omega^2 M)\\,\\phi = 0

    The designs' stiffness and mass bands (:func:`lateral_bands`, default meshes
    :func:`dynamics_mesh`) are laid end to end and factored once (banded Cholesky, LAPACK
    ``dpbtrf``); one subspace iteration (:func:`_subspace`) runs over all of them, each block
    converging on its own, so a design's frequencies do not depend on the others beside it.
    Rayleigh's estimate (:func:`rayleigh_frequency`) is solved with the same factor. None for
    a design whose supports do not hold the shaft (K singular).
    """
    if not designs:
        return []
    meshes = [dynamics_mesh(d) for d in designs] if meshes is None else list(meshes)
    K, M, off, pinned = lateral_bands(designs, meshes)
    c, bad = band_factor(K, off)
    solve = lambda Z: band_solve(c, Z)  # noqa: E731
    mul = lambda Z: band_matvec(M, Z)  # noqa: E731
    lam, phi, collapsed = _subspace(solve, mul, M[0].copy(), off, n_modes)
    free_mask = np.ones(K.shape[1], dtype=bool)
    free_mask[pinned] = False
    # Rayleigh's quotient with the static deflection shape under the weights, each pushed the
    # way the first mode moves its point: K y = M r, ω² ≈ yᵀKy / yᵀMy (Shigley [3] Eq. 7-23)
    trans = (np.arange(K.shape[1]) - np.repeat(off[:-1], np.diff(off))) % 2 == 0
    out: list[LateralModes | None] = []
    for b, (design, mesh) in enumerate(zip(designs, meshes)):
        if bad[b]:
            out.append(None)
            continue
        lo, hi = int(off[b]), int(off[b + 1])
        if collapsed[b]:
            lb, pb = _full_block(K, M, lo, hi, n_modes)
        else:
            lb, pb = lam[b], phi[lo:hi]
        fm = free_mask[lo:hi]
        omega = np.sqrt(np.maximum(lb, 0.0))
        r = np.where(trans[lo:hi] & fm, np.sign(pb[:, 0]), 0.0)
        r[trans[lo:hi] & fm & (r == 0)] = 1.0
        out.append((b, lo, hi, omega, pb[fm], np.flatnonzero(fm), mesh, r))
    # the Rayleigh solves of every held design at once, with the same factor
    rhs = np.zeros((K.shape[1], 1))
    for item in out:
        if item is not None:
            _, lo, hi, *_, r = item
            rhs[lo:hi, 0] = r
    y = solve(band_matvec(M, rhs))
    Ky, My = band_matvec(K, y), band_matvec(M, y)
    yKy = np.add.reduceat((y * Ky)[:, 0], off[:-1])
    yMy = np.add.reduceat((y * My)[:, 0], off[:-1])
    modes: list[LateralModes | None] = []
    for item in out:
        if item is None:
            modes.append(None)
            continue
        b, lo, hi, omega, shapes, free, mesh, _ = item
        with np.errstate(divide="ignore", invalid="ignore"):
            ray = float(rad_s_to_rpm(np.sqrt(max(yKy[b], 0.0) / yMy[b])))
        modes.append(LateralModes(omega_rad_s=omega, rpm=rad_s_to_rpm(omega), shapes=shapes, free=free,
                                  mesh=mesh, rayleigh_rpm=ray))
    return modes


def lateral_frequencies(design: Design, *, n_modes: int = 3, mesh: Mesh | None = None) -> LateralModes:
    """The first ``n_modes`` lateral natural frequencies of the shaft on its supports
    (:func:`lateral_frequencies_many` of one design).

    Parameters
    ----------
    design : the design (shaft, supports with optional radial stiffness, element masses)
    n_modes : how many modes to return
    mesh : the mesh to use; default :func:`dynamics_mesh`

    Raises ``numpy.linalg.LinAlgError`` when the supports do not hold the shaft (K singular).

    Notes
    -----
    Check: a uniform simply supported shaft gives ωₙ = (nπ/L)²·√(EI/(ρA)) (Shigley [3]
    Eq. 7-22); with the default mesh the third mode is within 0.01 %.
    """
    m = lateral_frequencies_many([design], n_modes=n_modes, meshes=None if mesh is None else [mesh])[0]
    if m is None:
        raise np.linalg.LinAlgError("the supports do not hold the shaft")
    return m


def rayleigh_frequency(modes: LateralModes) -> float:
    """Rayleigh's estimate of the first lateral frequency [rpm] (Shigley [3] Eq. 7-23).

    .. math:: \\omega_1^2 \\approx \\frac{y^T K y}{y^T M y},\\quad K y = M r

    y is the static deflection under the weights (consistent mass times a unit acceleration
    r), each weight pushed the way the first mode moves its point, as Shigley advises for
    overhangs. For lumped masses this is √(g·Σwᵢyᵢ / Σwᵢyᵢ²). It bounds ω₁ from above.
    Computed with the modes (:func:`lateral_frequencies_many`, same banded factor).
    """
    return float(modes.rayleigh_rpm)


def torsional_frequency(design: Design, mesh: Mesh) -> float | None:
    """First torsional natural frequency of the element inertias on the shaft [rpm].

    Elements with ``inertia_kg_m2`` form a chain of inertias Jᵢ joined by the shaft lengths
    between them, kᵢ = G / Σ(Lₑ/Jₚ,ₑ) over the mesh elements in between (N·mm/rad). For two
    inertias (Den Hartog [4]):

    .. math:: \\omega = \\sqrt{k\\,\\frac{J_1 + J_2}{J_1 J_2}}

    and for more, the lowest non-zero eigenvalue of the chain. The shaft's own inertia is left
    out. Returns None when fewer than two elements carry an inertia.
    """
    items = sorted(((float(mesh.x_mm[n]), e.inertia_kg_m2) for e, n in zip(design.elements, mesh.element_nodes)
                    if getattr(e, "inertia_kg_m2", None)), key=lambda t: t[0])
    if len(items) < 2:
        return None
    G = design.shaft.material.G_GPa * 1e3
    flex = mesh.le_mm / (G * mesh.J_mm4)  # rad per N·mm, per element
    cum = np.concatenate([[0.0], np.cumsum(flex)])
    node_of = lambda x: int(np.argmin(np.abs(mesh.x_mm - x)))  # noqa: E731
    xs = [node_of(x) for x, _ in items]
    J = np.array([j for _, j in items])
    k = []
    for a, b in zip(xs[:-1], xs[1:]):
        f = cum[b] - cum[a]
        k.append(1e-3 / f if f > 0 else np.inf)  # N·m/rad
    k = np.array(k)
    if not np.all(np.isfinite(k)):
        return None  # two inertias at one point: no shaft between them
    n = J.size
    Kt = np.zeros((n, n))
    for i, ki in enumerate(k):
        Kt[i:i + 2, i:i + 2] += ki * np.array([[1.0, -1.0], [-1.0, 1.0]])
    s = 1.0 / np.sqrt(J)
    lam = np.linalg.eigvalsh(s[:, None] * Kt * s[None, :])
    return float(rad_s_to_rpm(math.sqrt(max(lam[1], 0.0))))
