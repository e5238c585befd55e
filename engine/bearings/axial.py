"""Axial resolution: which support carries how much axial force, induced forces included.

Units: N. Arrays are (n_cases, n_supports), supports in design order. Sign: ``Fa_ext_N`` is
the net external axial force on the shaft along +x; ``Fx_N`` is the force each support
exerts ON the shaft (the contract's sign for reactions); ``Fa_N`` is the non-negative axial
load each bearing carries.

Arrangements (``supports[i].axial``):

- one ``both`` (locating bearing), the others ``none`` (floating): the locating bearing takes
  the whole external axial force, either way.
- cross-located: one ``+x`` and one ``-x`` support (and any number floating). A ``+x``
  bearing takes the axial force when the shaft pushes toward +x (it pushes the shaft toward
  -x). With angular contact ball or tapered roller bearings the pair is back-to-back (O) when
  the left one is ``+x``, face-to-face (X) when the left one is ``-x``; each such bearing
  under radial load Fr has an induced axial force S that the other must react:
  tapered S = 0.5·Fr/Y (Y of the row for Fa/Fr > e), angular contact S = e·Fr
  (common practice; not in ISO 281). With P the ``+x`` and M the ``-x`` bearing and
  Ka = Fa_ext (toward P), equilibrium Fa_P − Fa_M = Ka with Fa_i ≥ S_i gives

      Fa_P = max(S_P, S_M + Ka),   Fa_M = Fa_P − Ka.

  Other types in a cross-located pair have S = 0 (deep groove: the bearing that the shaft
  pushes takes Ka, the other none).
- ``both`` on an angular contact or tapered support means a matched pair at that position
  (back-to-back or face-to-face set, rated as two rows): its induced forces cancel inside.

Errors (``engine.model.EngineError``): more than one ``both``; a ``both`` together with a
``+x``/``-x`` support; two supports taking the same direction; a load case in which the shaft
is pushed a way no support takes (path ``supports``); a lone single-direction induced-force
bearing whose induced force nothing reacts.

Public: :class:`AxialSplit`, :func:`resolve_axial`, :func:`induced_ratio`, ``DEFAULT_TAPERED_Y``.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from engine.bearings.equivalent import INDUCED_TYPES, angular_contact_factors
from engine.model import Design, EngineError

__all__ = ["AxialSplit", "resolve_axial", "check_contact_angles", "induced_ratio", "pair_split", "DEFAULT_TAPERED_Y",
           "DEFAULT_CONTACT_ANGLE_DEG", "SOURCE_INDUCED"]

DEFAULT_TAPERED_Y = 1.6  # first-pass Y of a tapered bearing (e ≈ 0.37, α ≈ 14°), common practice
DEFAULT_CONTACT_ANGLE_DEG = 40.0  # angular contact support without contact_angle_deg
SOURCE_INDUCED = ("induced axial force S = 0.5·Fr/Y (tapered), S = e·Fr (angular contact); "
                  "equilibrium Fa_P = max(S_P, S_M + Ka) (common practice, derived; see references.md)")


@dataclass(frozen=True)
class AxialSplit:
    """Result of the axial resolution.

    Attributes
    ----------
    Fa_N : ndarray (n_cases, n_supports)
        Axial load each bearing carries, ≥ 0, induced forces included, [N]
    Fx_N : ndarray (n_cases, n_supports)
        Signed axial force each support exerts on the shaft; rows sum to −Fa_ext, [N]
    induced_N : ndarray (n_cases, n_supports)
        Induced axial force S used for each support (0 where none), [N]
    roles : tuple of str
        Per support: ``locating``, ``floating``, ``+x``, ``-x``
    paired : tuple of bool
        Per support: a matched pair (two rows) at one position
    arrangement : str
        A sentence naming the arrangement
    pair : tuple (i_plus, i_minus) or None
        The cross-located supports (either may be None when only one direction is taken)
    ratio : ndarray (n_cases, n_supports)
        S/Fr used for each support
    warnings : tuple of str
    """

    Fa_N: np.ndarray
    Fx_N: np.ndarray
    induced_N: np.ndarray
    roles: tuple[str, ...] = ()
    paired: tuple[bool, ...] = ()
    arrangement: str = ""
    pair: tuple[int | None, int | None] | None = None
    ratio: np.ndarray | None = None
    warnings: tuple[str, ...] = ()


def induced_ratio(bearing_type: str | None, *, Y=None, contact_angle_deg=None):
    """S/Fr of a single-row bearing under radial load: 0.5/Y (tapered), e(α) (angular contact), 0 else.

    Examples
    --------
    >>> float(induced_ratio("tapered_roller", Y=1.6))
    0.3125
    >>> round(float(induced_ratio("angular_contact_ball", contact_angle_deg=40)), 2)
    1.14
    """
    if bearing_type == "tapered_roller":
        return 0.5 / (DEFAULT_TAPERED_Y if Y is None else np.asarray(Y, float))
    if bearing_type == "angular_contact_ball":
        a = DEFAULT_CONTACT_ANGLE_DEG if contact_angle_deg is None else contact_angle_deg
        return angular_contact_factors(a)["e"]
    return 0.0


def pair_split(S_plus, S_minus, Ka):
    """Axial loads of a cross-located pair: Fa_P = max(S_P, S_M + Ka), Fa_M = Fa_P − Ka.

    ``S_plus``/``S_minus`` are the induced forces of the ``+x`` and ``-x`` bearings and ``Ka``
    the external axial force on the shaft along +x; all broadcast, [N].

    Examples
    --------
    references.md derived check: S_A = 1250 N (A takes -x), S_B = 625 N (B takes +x),
    Ka = 1000 N toward B: Fa_B = 2250 N, Fa_A = 1250 N

    >>> [float(v) for v in pair_split(625.0, 1250.0, 1000.0)]
    [2250.0, 1250.0]
    """
    Fa_P = np.maximum(S_plus, S_minus + Ka)
    return Fa_P, Fa_P - Ka


def _names(design: Design, idx) -> str:
    return ", ".join(design.supports[i].id for i in idx)


def check_contact_angles(design: Design) -> None:
    """Raise EngineError at ``supports[i].contact_angle_deg`` for an angular contact bearing
    whose contact angle lies outside the 20–45° of the factor table (ISO 281 Table 3 rows
    as tabulated in :mod:`engine.bearings.equivalent`)."""
    for i, s in enumerate(design.supports):
        a = s.contact_angle_deg
        if s.bearing_type == "angular_contact_ball" and a is not None and not (20.0 <= a <= 45.0):
            raise EngineError.at(
                f"supports[{i}].contact_angle_deg",
                f"{s.id}: contact angle {a:g}° is outside 20–45°, where the load factors are tabulated "
                "here (below 20° ISO 281 makes them depend on i·Fa/C0, not implemented); use 25° or 40°")


def resolve_axial(design: Design, Fr_N: np.ndarray, Fa_ext_N: np.ndarray, *,
                  Y_induced: np.ndarray | None = None,
                  induced_ratios: np.ndarray | None = None) -> AxialSplit:
    """Split the external axial force between the supports, with induced forces of pairs.

    Parameters
    ----------
    design : engine.model.Design
    Fr_N : ndarray (n_cases, n_supports)
        Radial reaction magnitudes, supports in design order, [N]
    Fa_ext_N : ndarray (n_cases,)
        Net external axial force on the shaft along +x, [N]
    Y_induced : ndarray, optional
        Y (for Fa/Fr > e) of each support's bearing, shape (n_supports,) or
        (n_cases, n_supports); used for tapered supports (S = 0.5·Fr/Y). Default: 1.6, a
        first-pass value (common practice). Angular contact supports use e of their contact
        angle (``contact_angle_deg``, default 40°) and ignore Y.
    induced_ratios : ndarray, optional
        S/Fr per support, overriding the above (used when a catalogue row refines it).

    Returns
    -------
    AxialSplit

    Raises
    ------
    engine.model.EngineError
        Over-constrained or unable to carry the axial force; the message says what to change.
    """
    Fr = np.atleast_2d(np.asarray(Fr_N, float))
    Ka = np.asarray(Fa_ext_N, float).reshape(-1)
    nc, ns = Fr.shape
    sup = design.supports
    if ns != len(sup) or Ka.size != nc:
        raise ValueError(f"Fr_N must be (n_cases, {len(sup)}) and Fa_ext_N ({nc},); got {Fr.shape}, {Ka.shape}")
    check_contact_angles(design)
    roles_in = [s.axial for s in sup]
    both = [i for i, r in enumerate(roles_in) if r == "both"]
    plus = [i for i, r in enumerate(roles_in) if r == "+x"]
    minus = [i for i, r in enumerate(roles_in) if r == "-x"]
    warnings: list[str] = []

    if len(both) > 1:
        raise EngineError.at(
            f"supports[{both[1]}].axial",
            f"supports {_names(design, both)} all locate the shaft both ways: the shaft is axially "
            "over-constrained (thermal growth would load them against each other); keep one "
            "'both' and let the others float ('none'), or use a '+x'/'-x' pair")
    if both and (plus or minus):
        j = (plus + minus)[0]
        raise EngineError.at(
            f"supports[{j}].axial",
            f"{sup[both[0]].id} locates the shaft both ways and {sup[j].id} also takes axial force "
            f"('{roles_in[j]}'): over-constrained; set {sup[j].id} to 'none' (floating), or make "
            f"{sup[both[0]].id} single-direction to form a cross-located pair")
    for group, word in ((plus, "+x"), (minus, "-x")):
        if len(group) > 1:
            raise EngineError.at(
                f"supports[{group[1]}].axial",
                f"supports {_names(design, group)} all take '{word}': how they share the axial force "
                "is not determined by statics; let all but one float ('none'), or model a tandem set "
                "as one support")

    ratio = np.zeros((nc, ns))
    if induced_ratios is not None:
        ratio[:] = np.broadcast_to(np.asarray(induced_ratios, float), (nc, ns))
    else:
        Yb = None if Y_induced is None else np.broadcast_to(np.asarray(Y_induced, float), (nc, ns))
        for i, s in enumerate(sup):
            if s.bearing_type in INDUCED_TYPES:
                ratio[:, i] = induced_ratio(s.bearing_type, Y=None if Yb is None else Yb[:, i],
                                            contact_angle_deg=s.contact_angle_deg)
    for i, s in enumerate(sup):
        single_dir = s.axial in ("+x", "-x")
        if s.bearing_type not in INDUCED_TYPES or not single_dir:
            ratio[:, i] = 0.0
        if s.bearing_type in INDUCED_TYPES and s.axial == "none":
            warnings.append(
                f"{s.id}: a single {s.bearing_type.replace('_', ' ')} bearing set to float has an induced "
                "axial force that nothing reacts; pair it with an opposed bearing ('+x'/'-x') or "
                "make it a matched pair ('both')")
    S = ratio * Fr
    Fa = np.zeros((nc, ns))
    Fx = np.zeros((nc, ns))
    tol = 1e-6 + 1e-9 * max(float(np.max(np.abs(Fr), initial=0.0)), float(np.max(np.abs(Ka), initial=0.0)))
    cases = [c.name for c in design.load_cases] if len(design.load_cases) == nc else [str(j) for j in range(nc)]
    paired = tuple(s.axial == "both" and s.bearing_type in INDUCED_TYPES for s in sup)
    roles = tuple({"both": "locating", "none": "floating"}.get(r, r) for r in roles_in)

    def _fail(direction: str, j: int) -> EngineError:
        return EngineError.at(
            "supports",
            f"in load case '{cases[j]}' the shaft is pushed toward {direction} with "
            f"{abs(Ka[j]):.4g} N but no support takes axial force toward {direction}: make one "
            f"support 'both' (a locating bearing) or set a bearing to '{direction}'")

    pair = None
    if both:
        b = both[0]
        Fa[:, b] = np.abs(Ka)
        Fx[:, b] = -Ka
        others = [s.id for i, s in enumerate(sup) if i != b]
        kind = "matched pair" if paired[b] else "locating bearing"
        arrangement = f"{kind} at {sup[b].id}, floating {', '.join(others)}"
    elif plus or minus:
        P = plus[0] if plus else None
        M = minus[0] if minus else None
        pair = (P, M)
        if P is not None and M is not None:
            Fa_P, Fa_M = pair_split(S[:, P], S[:, M], Ka)
            Fa[:, P], Fa[:, M] = Fa_P, Fa_M
            Fx[:, P], Fx[:, M] = -Fa_P, Fa_M
            left, right = sorted((P, M), key=lambda i: sup[i].x_mm)
            if sup[P].bearing_type in INDUCED_TYPES and sup[M].bearing_type in INDUCED_TYPES:
                form = "back-to-back (O)" if left == P else "face-to-face (X)"
                arrangement = (f"{form} pair: {sup[left].id} takes '{sup[left].axial}', "
                               f"{sup[right].id} takes '{sup[right].axial}'")
            else:
                arrangement = (f"cross-located: {sup[P].id} takes '+x', {sup[M].id} takes '-x'")
        else:
            k = P if P is not None else M
            sign = 1.0 if P is not None else -1.0  # +x bearing carries Ka > 0
            direction = "-x" if P is not None else "+x"
            bad = np.flatnonzero(sign * Ka < -tol)
            if bad.size:
                raise _fail(direction, int(bad[0]))
            if np.any(S[:, k] > tol):
                raise EngineError.at(
                    f"supports[{k}].axial",
                    f"{sup[k].id} is a single {sup[k].bearing_type.replace('_', ' ')} bearing: its induced "
                    f"axial force needs an opposed bearing; set another support to '{direction}' "
                    "(cross-located pair) or make it a matched pair ('both')")
            Fa[:, k] = np.abs(Ka)
            Fx[:, k] = -Ka
            arrangement = f"{sup[k].id} takes '{sup[k].axial}' only; the shaft is not located toward {direction}"
            warnings.append(f"the shaft is located toward {sup[k].axial} only ({sup[k].id}); nothing holds it "
                            f"if the axial force reverses: add a support taking '{direction}'")
    else:
        bad = np.flatnonzero(np.abs(Ka) > tol)
        if bad.size:
            j = int(bad[0])
            raise _fail("+x" if Ka[j] > 0 else "-x", j)
        arrangement = "no support locates the shaft axially"
        warnings.append("no support locates the shaft axially: make one support 'both' (locating) "
                        "or use a '+x'/'-x' pair")
    return AxialSplit(Fa_N=Fa, Fx_N=Fx, induced_N=S, roles=roles, paired=paired,
                      arrangement=arrangement, pair=pair, ratio=ratio, warnings=tuple(warnings))
