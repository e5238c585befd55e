"""Shaft dynamics: lateral natural frequencies (consistent-mass finite elements), Rayleigh's
estimate as a cross-check, and the first torsional frequency of the inertias on the shaft.

Units inside: mm, N, tonne (10³ kg), s — a consistent set: N/mm ÷ t = 1/s². Frequencies are
returned in rpm (cycles per minute, 60·ω/2π).

Public functions
----------------
- :func:`dynamics_mesh` — a coarser copy of the solver's mesh for the eigenproblem.
- :func:`consistent_mass` — global consistent mass matrix of the beam elements.
- :func:`lateral_system` — K (from :func:`engine.beam.bending_stiffness`), M, free DOFs.
- :func:`generalized_eigen` — K φ = ω² M φ by a Cholesky factor and ``numpy.linalg.eigh``.
- :func:`subspace_iteration` — the lowest few eigenpairs (used for the design's modes).
- :func:`lateral_frequencies` — the first few lateral frequencies and mode shapes of a design.
- :func:`lateral_frequencies_many` — the same for many designs at once (studies): one
  stacked eigenproblem per group of equal size, numpy's linear algebra broadcast over it.
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

from engine.beam import Mesh, assemble, bending_stiffness, build_mesh, stack_meshes
from engine.model import Design

__all__ = ["DYNAMICS_ELEMENTS", "dynamics_mesh", "consistent_mass", "lateral_system",
           "generalized_eigen", "subspace_iteration", "LateralModes", "lateral_frequencies",
           "lateral_frequencies_many", "rayleigh_frequency", "torsional_frequency", "rad_s_to_rpm"]

# Elements for the eigenproblem: about thirty consistent-mass elements give the first three
# frequencies of the demo shafts within 0.07 % of the 120-element mesh, and keep the eigenproblem small.
DYNAMICS_ELEMENTS = 30


def rad_s_to_rpm(omega):
    """ω [rad/s] → n [rpm] = 60·ω/(2π)."""
    return np.asarray(omega, float) * 30.0 / math.pi


def dynamics_mesh(design: Design, *, elements: int = DYNAMICS_ELEMENTS) -> Mesh:
    """The solver's mesh rebuilt with ``elements`` target elements (nodes still at every segment
    change, support, element and groove)."""
    n = min(elements, design.analysis.elements)
    d = design.model_copy(update={"analysis": design.analysis.model_copy(update={"elements": n})})
    return build_mesh(d)


def consistent_mass(mesh: Mesh, *, rho_t_mm3: float) -> np.ndarray:
    """Global consistent mass matrix (2N, 2N) [t], DOFs [v0, θ0, v1, θ1, …].

    .. math:: m_e = \\frac{\\rho A L}{420}\\begin{bmatrix}156 & 22L & 54 & -13L\\\\
              22L & 4L^2 & 13L & -3L^2\\\\ 54 & 13L & 156 & -22L\\\\ -13L & -3L^2 & -22L & 4L^2\\end{bmatrix}

    Parameters
    ----------
    mesh : the beam mesh (element lengths [mm] and areas [mm²]); a stack of meshes
        (:func:`engine.beam.stack_meshes`) gives a stack of matrices (B, 2N, 2N)
    rho_t_mm3 : density, [t/mm³] (kg/m³ · 10⁻¹²)

    References: Przemieniecki [1], Eq. 11.39 (Euler–Bernoulli beam element).
    """
    L = mesh.le_mm
    c = rho_t_mm3 * mesh.A_mm2 * L / 420.0
    one = np.ones_like(L)
    me = np.stack([
        np.stack([156 * one, 22 * L, 54 * one, -13 * L], -1),
        np.stack([22 * L, 4 * L**2, 13 * L, -3 * L**2], -1),
        np.stack([54 * one, 13 * L, 156 * one, -22 * L], -1),
        np.stack([-13 * L, -3 * L**2, -22 * L, 4 * L**2], -1),
    ], -2) * c[..., None, None]
    return assemble(me, mesh.n_nodes)


def _lateral_systems(designs: Sequence[Design], mesh: Mesh) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(K, M, free) of B designs sharing a material on a stack of meshes (B, …) with the same
    number of rigid supports: (B, n, n) each, free (B, n_free). See :func:`lateral_system`."""
    mat = designs[0].shaft.material
    K, _ = bending_stiffness(mesh, E_MPa=mat.E_GPa * 1e3, G_MPa=mat.G_GPa * 1e3,
                             shear=designs[0].analysis.shear_deformation)
    M = consistent_mass(mesh, rho_t_mm3=mat.density_kg_m3 * 1e-12)
    keep = np.ones(K.shape[:2], dtype=bool)
    for b, design in enumerate(designs):
        for e, node in zip(design.elements, mesh.element_nodes[b]):
            M[b, 2 * node, 2 * node] += e.mass_kg * 1e-3
        for s, node in zip(design.supports, mesh.support_nodes[b]):
            if s.radial_stiffness_N_per_mm is None:
                keep[b, 2 * node] = False
            else:
                K[b, 2 * node, 2 * node] += s.radial_stiffness_N_per_mm
    free = np.nonzero(keep)[1].reshape(len(designs), -1)
    return K, M, free


def lateral_system(design: Design, mesh: Mesh) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(K, M, free): stiffness [N/mm] with support springs, mass [t] with the element masses
    lumped at their nodes, and the indices of the DOFs left free by the rigid supports."""
    K, M, free = _lateral_systems([design], stack_meshes([mesh]))
    return K[0], M[0], free[0]


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
    Stacks of problems (…, n, n) are solved at once (λ (…, n), Φ (…, n, n)).

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


def subspace_iteration(K: np.ndarray, M: np.ndarray, n_modes: int, *, tol: float = 1e-11,
                       max_iter: int = 80) -> tuple[np.ndarray, np.ndarray]:
    """The lowest ``n_modes`` eigenpairs of K φ = λ M φ by subspace iteration (Bathe [2] §11.6).

    With K = L·Lᵀ (Cholesky) and p = max(2q, q + 4) trial vectors X:
    Y = K⁻¹·M·X, then the Rayleigh–Ritz problem (YᵀKY) q = λ (YᵀMY) q of size p is solved with
    :func:`generalized_eigen` (``numpy.linalg.eigh``), X = Y·Q, until the q lowest λ change by
    less than ``tol`` (relative). Mode i converges as (λᵢ/λ_{p+1})^k. Only small products and a
    p×p eigenproblem per step: on a busy 2-core machine this is far steadier than a full
    dense eigensolver, whose threaded kernels stall under load. The start vectors are the mass
    diagonal and fixed pseudo-random columns (reproducible). Should the trial space collapse
    (a practically massless shaft with a single heavy mass), the full problem is solved.
    A stack of problems (…, n, n) iterates together until every one has converged.

    Returns (λ ascending (…, q), Φ (…, n, q) M-orthonormal).
    """
    n = K.shape[-1]
    p = min(n, max(2 * n_modes, n_modes + 4))
    if p >= n:
        lam, phi = generalized_eigen(K, M)
        return lam[..., :n_modes], phi[..., :n_modes]
    Linv = np.linalg.inv(np.linalg.cholesky(K))  # K⁻¹ = Linvᵀ·Linv
    LinvT = _T(Linv)
    X = np.empty(K.shape[:-2] + (n, p))
    X[..., 0] = np.diagonal(M, axis1=-2, axis2=-1)
    X[..., 1:] = np.random.default_rng(20240611).standard_normal((n, p - 1))
    old = None
    for _ in range(max_iter):
        MX = M @ X
        Y = LinvT @ (Linv @ MX)
        Kr, Mr = _T(Y) @ MX, _T(Y) @ (M @ Y)  # YᵀKY = Yᵀ(MX) since KY = MX
        try:
            lam, Q = generalized_eigen(0.5 * (Kr + _T(Kr)), 0.5 * (Mr + _T(Mr)))
        except np.linalg.LinAlgError:
            # the trial space has collapsed (few masses carry nearly all the mass, so M has
            # fewer significant directions than p): solve the full problem instead
            lam, phi = generalized_eigen(K, M)
            return lam[..., :n_modes], phi[..., :n_modes]
        X = Y @ Q
        low = lam[..., :n_modes]
        if old is not None and np.all(np.abs(low - old) <= tol * np.abs(low)):
            break
        old = low
    return lam[..., :n_modes], X[..., :n_modes]


@dataclass(frozen=True)
class LateralModes:
    """First lateral modes: ω [rad/s], n [rpm], mode shapes on the free DOFs (columns,
    M-normalised), the reduced matrices, and Rayleigh's cross-check of ω₁ [rpm]
    (:func:`rayleigh_frequency`)."""

    omega_rad_s: np.ndarray
    rpm: np.ndarray
    shapes: np.ndarray
    K: np.ndarray
    M: np.ndarray
    free: np.ndarray
    mesh: Mesh
    rayleigh_rpm: float = math.nan


def _rayleigh_rpm(K: np.ndarray, M: np.ndarray, free: np.ndarray, mode1: np.ndarray) -> np.ndarray:
    """Rayleigh's quotient (see :func:`rayleigh_frequency`) for a stack of reduced systems:
    K, M (…, n, n), free (…, n) DOF numbers, mode1 (…, n) first mode shape. [rpm], (…)."""
    trans = (free % 2) == 0
    r = np.where(trans, np.sign(mode1), 0.0)
    r[trans & (r == 0)] = 1.0
    y = np.linalg.solve(K, (M @ r[..., None]))[..., 0]
    yKy = np.sum(y * (K @ y[..., None])[..., 0], axis=-1)
    yMy = np.sum(y * (M @ y[..., None])[..., 0], axis=-1)
    with np.errstate(divide="ignore", invalid="ignore"):
        return rad_s_to_rpm(np.sqrt(np.maximum(yKy, 0.0) / yMy))


def _modes_of(designs: Sequence[Design], meshes: Sequence[Mesh], n_modes: int) -> list[LateralModes]:
    """Modes of designs whose eigenproblems have one size (one stacked problem)."""
    K, M, free = _lateral_systems(designs, stack_meshes(meshes))
    keep = np.zeros(K.shape[:2], dtype=bool)
    np.put_along_axis(keep, free, True, axis=1)
    both = keep[:, :, None] & keep[:, None, :]
    shape = (len(designs), free.shape[1], free.shape[1])
    Kf, Mf = K[both].reshape(shape), M[both].reshape(shape)  # rows and columns of the free DOFs
    lam, phi = subspace_iteration(Kf, Mf, n_modes)
    omega = np.sqrt(np.maximum(lam, 0.0))
    rpm = rad_s_to_rpm(omega)
    ray = _rayleigh_rpm(Kf, Mf, free, phi[..., 0])
    return [LateralModes(omega_rad_s=omega[k], rpm=rpm[k], shapes=phi[k], K=Kf[k], M=Mf[k], free=free[k],
                         mesh=meshes[k], rayleigh_rpm=float(ray[k])) for k in range(len(designs))]


def lateral_frequencies(design: Design, *, n_modes: int = 3, mesh: Mesh | None = None) -> LateralModes:
    """The first ``n_modes`` lateral natural frequencies of the shaft on its supports.

    .. math:: (K - \\omega^2 M)\\,\\phi = 0

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
    mesh = dynamics_mesh(design) if mesh is None else mesh
    return _modes_of([design], [mesh], n_modes)[0]


def lateral_frequencies_many(designs: Sequence[Design], *, n_modes: int = 3) -> list[LateralModes | None]:
    """:func:`lateral_frequencies` of many designs (default meshes), one list entry each.

    Designs whose eigenproblems have the same size (nodes, rigid supports, element and support
    counts, material and shear setting) are solved as one stack, so a study of hundreds of
    variants makes a few calls into LAPACK instead of hundreds. The stack iterates until its
    slowest member has converged, so a design's frequencies agree with its own
    :func:`lateral_frequencies` to the iteration's tolerance (1e-11 relative on ω², or better).
    None where the supports do not hold the shaft (the eigenproblem has no solution).
    """
    meshes = [dynamics_mesh(d) for d in designs]
    groups: dict[tuple, list[int]] = {}
    for k, (d, m) in enumerate(zip(designs, meshes)):
        mat = d.shaft.material
        key = (m.n_nodes, len(d.elements), len(d.supports),
               sum(s.radial_stiffness_N_per_mm is None for s in d.supports),
               mat.E_GPa, mat.G_GPa, mat.density_kg_m3, d.analysis.shear_deformation)
        groups.setdefault(key, []).append(k)
    out: list[LateralModes | None] = [None] * len(designs)
    for ks in groups.values():
        try:
            modes = _modes_of([designs[k] for k in ks], [meshes[k] for k in ks], n_modes)
        except np.linalg.LinAlgError:  # some member is not held: solve each alone
            modes = []
            for k in ks:
                try:
                    modes.append(_modes_of([designs[k]], [meshes[k]], n_modes)[0])
                except np.linalg.LinAlgError:
                    modes.append(None)
        for k, m in zip(ks, modes):
            out[k] = m
    return out


def rayleigh_frequency(modes: LateralModes) -> float:
    """Rayleigh's estimate of the first lateral frequency [rpm] (Shigley [3] Eq. 7-23).

    .. math:: \\omega_1^2 \\approx \\frac{y^T K y}{y^T M y},\\quad K y = M r

    y is the static deflection under the weights (consistent mass times a unit acceleration
    r), each weight pushed the way the first mode moves its point, as Shigley advises for
    overhangs. For lumped masses this is √(g·Σwᵢyᵢ / Σwᵢyᵢ²). It bounds ω₁ from above.
    """
    return float(_rayleigh_rpm(modes.K, modes.M, modes.free, modes.shapes[:, 0]))


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
