"""Effective length factors from the tables of classical cases, braced segments, twist length."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import NamedTuple, Sequence

import numpy as np

from fieldcol.errors import InputError
from fieldcol.trace import Trace

from ._ends import Brace, End, check_braces, check_length, end, kind, sub

BASES = ("theoretical", "recommended")

# Theoretical K (Timoshenko & Gere, Theory of Elastic Stability) and recommended design K
# (AISC 360-22 Commentary Table C-A-7.1), keyed by the unordered pair of end names.
_K = {
    frozenset(["fixed"]): (0.5, 0.65),
    frozenset(["fixed", "pinned"]): (0.7, 0.80),
    frozenset(["fixed", "guided"]): (1.0, 1.2),
    frozenset(["pinned"]): (1.0, 1.0),
    frozenset(["fixed", "free"]): (2.0, 2.1),
    frozenset(["pinned", "guided"]): (2.0, 2.0),
}

_CLAUSE = {
    "theoretical": "Timoshenko & Gere, Theory of Elastic Stability",
    "recommended": "AISC 360-22 Commentary Table C-A-7.1",
}


def _mechanism(bottom: str, top: str) -> tuple[str, str]:
    """(reason, hint) for an end pair that leaves the column a mechanism."""
    pair = {bottom, top}
    if pair == {"pinned", "free"}:
        loose, other = ("top", "bottom") if top == "free" else ("bottom", "top")
        return (f"the column can sway and rotate freely at the {loose}",
                f"hold the {loose} against sway or fix the {other}")
    if pair == {"free"}:
        return ("neither end is held against sway or rotation",
                "hold both ends against sway, or fix one end")
    if pair == {"guided", "free"}:
        return ("neither end is held against sway: the column can sway as a whole",
                "hold the bottom or the top against sway")
    if pair == {"guided"}:
        return ("both ends can sway together: the column can move sideways as a whole",
                "hold one end against sway or add a brace")
    raise AssertionError(pair)  # pragma: no cover - every pair is a table case or above


def _check_basis(basis: str, field: str, allowed: Sequence[str]) -> str:
    if basis not in allowed:
        raise InputError(sub(field, "basis"), basis, "unknown basis", " or ".join(allowed))
    return basis


def k_table(bottom: End, top: End, basis: str, field: str) -> float:
    """The effective length factor K of a column between two classical ends.

    Args:
        bottom, top: the ends (``End`` or a name; either order gives the same K).
        basis: ``"theoretical"`` (Timoshenko & Gere) or ``"recommended"``
            (AISC 360-22 Commentary Table C-A-7.1 design values).
        field: the field of this axis's restraints, e.g. ``"restraints.weak"``, named in errors.

    Returns:
        K (dimensionless).

    Raises:
        InputError: a partial (spring) end, which has no table value (use basis "analysis"), or
        a pair of ends that leaves the column a mechanism, saying which restraint is missing.

    Example:
        >>> k_table(end("fixed", "b"), end("pinned", "t"), "recommended", "restraints.strong")
        0.8
    """
    basis = _check_basis(basis, field, BASES)
    b = end(bottom, sub(field, "bottom"))
    t = end(top, sub(field, "top"))
    kb, kt = kind(b), kind(t)
    for name, e, k in (("bottom", b, kb), ("top", t, kt)):
        if k == "partial":
            raise InputError(sub(field, name), _words(e), "a spring end has no table value of K",
                             "set k_basis to 'analysis' (the stability analysis takes the springs)")
    pair = frozenset([kb, kt])
    if pair not in _K:
        reason, hint = _mechanism(kb, kt)
        raise InputError(field, f"bottom {kb}, top {kt}", "mechanism: " + reason, hint)
    return _K[pair][BASES.index(basis)]


def k_table_many(bottoms: Sequence[End], tops: Sequence[End], basis: str,
                 field: str) -> np.ndarray:
    """``k_table`` for many columns at once (a lookup; errors name the column index).

    Args:
        bottoms, tops: ends of equal count.
        basis: ``"theoretical"`` or ``"recommended"``.
        field: restraints field; errors name ``field[i]``.

    Returns:
        float64 array of K, one per column.

    Example:
        >>> k_table_many(["fixed", "pinned"], ["free", "pinned"], "theoretical", "weak").tolist()
        [2.0, 1.0]
    """
    if len(bottoms) != len(tops):
        raise InputError(field, f"{len(bottoms)} bottoms, {len(tops)} tops",
                         "needs as many top ends as bottom ends", "one of each per column")
    return np.array([k_table(b, t, basis, f"{field}[{i}]")
                     for i, (b, t) in enumerate(zip(bottoms, tops))], dtype=float)


@dataclass(frozen=True)
class Segment:
    """One length between braced points, checked with its own K.

    Fields: ``bottom``/``top`` positions (mm from the column bottom), ``length`` (mm),
    ``bottom_end``/``top_end`` the end names used, ``K`` and ``Lc = K * length`` (mm).
    """

    bottom: float
    top: float
    length: float
    bottom_end: str
    top_end: str
    K: float
    Lc: float


class EffectiveLength(NamedTuple):
    """``(Lc, K, segments)``: governing effective length (mm), K of the governing segment
    (relative to that segment's own length) and every segment."""

    Lc: float
    K: float
    segments: list[Segment]


def _held(e: End) -> End:
    """The end with its translation held (a rigid brace at that end)."""
    if e.translation == math.inf:
        return e
    if e.label == "partial":
        return End(math.inf, e.rotation, "partial")
    return end({"free": "pinned", "guided": "fixed"}[kind(e)], "")


def effective_length(L: float, bottom: End | str, top: End | str, braces: Sequence[Brace],
                     basis: str, field: str, *, assume_rigid: bool = False,
                     EI: float | None = None, trace: Trace | None = None) -> EffectiveLength:
    """The governing effective length of a column axis with rigid brace points.

    Table bases: rigid braces split the column into segments; each end segment takes the real
    end at its outer end and ``pinned`` at the brace, inner segments are pinned-pinned, and
    ``Lc = max(K_i L_i)`` (common practice: each length between braced points is checked with
    its own K). A brace at an end (``at`` = 0 or L) holds that end against sway (a free top
    becomes pinned, a guided top fixed). Basis ``"analysis"`` runs ``buckling_analysis`` on the
    whole column instead (needs ``EI`` in N*mm^2 when an end or a brace is a finite spring)
    and reports one segment with the K relative to the full length.

    Args:
        L: length in mm.
        bottom, top: the ends.
        braces: brace points. The table bases take them as rigid; one with a finite stiffness
            is refused unless ``assume_rigid=True`` (check it first with ``brace_requirement``).
        basis: ``"theoretical"``, ``"recommended"`` or ``"analysis"``.
        field: the field of this axis's restraints, e.g. ``"restraints.weak"``.
        assume_rigid: take braces with a finite stiffness as rigid (the caller has checked them).
        EI: flexural rigidity, N*mm^2, for basis ``"analysis"``.
        trace: if given, the steps are appended to it.

    Returns:
        ``EffectiveLength(Lc, K, segments)``.

    Example:
        >>> effective_length(6000.0, "pinned", "pinned", [Brace(3000.0)], "theoretical", "weak").Lc
        3000.0
    """
    basis = _check_basis(basis, field, BASES + ("analysis",))
    L = check_length(L, sub(field, "L"))
    b = end(bottom, sub(field, "bottom"))
    t = end(top, sub(field, "top"))
    braces = check_braces(braces, L, field)
    if basis == "analysis":
        return _by_analysis(L, b, t, braces, field, EI, trace)
    for i, br in enumerate(braces):
        if br.stiffness != math.inf and not assume_rigid:
            raise InputError(sub(field, f"braces[{i}].stiffness"), br.stiffness,
                             "a table K needs rigid braces",
                             "check it against brace_requirement and pass assume_rigid=True, "
                             "or use basis 'analysis'")
    inner = sorted({br.at for br in braces if 0.0 < br.at < L})
    if any(br.at == 0.0 for br in braces):
        b = _held(b)
    if any(br.at == L for br in braces):
        t = _held(t)
    cuts = [0.0, *inner, L]
    segments = []
    for i in range(len(cuts) - 1):
        sb = b if i == 0 else end("pinned", "")
        st = t if i == len(cuts) - 2 else end("pinned", "")
        where = field if len(cuts) == 2 else sub(field, f"segment {cuts[i]:g}-{cuts[i + 1]:g} mm")
        try:
            k = k_table(sb, st, basis, where)
        except InputError as e:
            if len(cuts) > 2 and "mechanism" in e.reason:
                raise InputError(e.field, e.text,
                                 "mechanism in the segment table: a free end beyond a brace",
                                 "the column may still be stable by continuity over the brace: "
                                 "use basis 'analysis'") from None
            raise
        n = cuts[i + 1] - cuts[i]
        segments.append(Segment(cuts[i], cuts[i + 1], n, kind(sb), kind(st), k, k * n))
    gov = max(segments, key=lambda s: s.Lc)
    if trace is not None:
        trace.add("K", f"effective length factor, segment {gov.bottom / L:.2f} L to {gov.top / L:.2f} L "
                       f"({gov.bottom_end}-{gov.top_end})", "table", gov.K, "", _CLAUSE[basis])
        trace.add("Lc", "effective length (longest K L over the segments)", "max(K_i L_i)",
                  gov.Lc, "mm", "common practice")
    return EffectiveLength(gov.Lc, gov.K, segments)


def _by_analysis(L: float, b: End, t: End, braces: list[Brace], field: str,
                 EI: float | None, trace: Trace | None) -> EffectiveLength:
    from ._fe import buckling_analysis

    springs = [b.translation, b.rotation, t.translation, t.rotation] + [x.stiffness for x in braces]
    if EI is None:
        if any(0.0 < s < math.inf for s in springs):
            raise InputError(sub(field, "EI"), "missing", "a spring end or brace needs EI",
                             "give EI in N*mm^2")
        EI = 1.0  # with rigid supports only, K does not depend on EI
    res = buckling_analysis(L, EI, b, t, braces, field=field)
    seg = Segment(0.0, L, L, b.label, t.label, res.K, res.K * L)
    if trace is not None:
        trace.add("K", "effective length factor from an elastic buckling analysis",
                  "pi sqrt(EI / Pcr) / L", res.K, "", "elastic stability (finite elements)")
        trace.add("Lc", "effective length", "K L", seg.Lc, "mm", "")
    return EffectiveLength(seg.Lc, res.K, [seg])


def twist_length(L: float, braces_at: Sequence[float], field: str = "restraints.twist") -> float:
    """The longest length between points where twisting is prevented (the ends count as such;
    common practice: K_z = 1, so this is Lcz).

    Args:
        L: column length, mm.
        braces_at: positions (mm from the bottom, 0..L) where twisting is prevented.
        field: the field named in errors.

    Returns:
        Lcz in mm.

    Example:
        >>> twist_length(6000.0, [2000.0])
        4000.0
    """
    L = check_length(L, sub(field, "L"))
    pts = []
    for i, z in enumerate(braces_at):
        f = sub(field, f"braces_at[{i}]")
        if isinstance(z, bool) or not isinstance(z, (int, float, np.floating, np.integer)) \
                or not math.isfinite(z):
            raise InputError(f, z, "not a finite position", "mm from the bottom")
        if not 0.0 <= z <= L:
            raise InputError(f, z, f"outside the column (0 to {L:g} mm)",
                             "measure it from the bottom of the column")
        pts.append(float(z))
    cuts = np.array(sorted({0.0, L, *pts}))
    return float(np.max(np.diff(cuts)))


def _words(e: End) -> str:
    """A spring end in words, with its stiffnesses in the engine's units.

    Example:
        >>> from fieldcol.stability import partial_end
        >>> _words(partial_end(rotation=1e9, translation=float("inf")))
        'a spring end (rotation 1e+09 N*mm/rad, translation held)'
    """
    def one(v: float, unit: str) -> str:
        return "held" if v == float("inf") else "free" if v == 0 else f"{v:.4g} {unit}"

    return f"a spring end (rotation {one(e.rotation, 'N*mm/rad')}, translation {one(e.translation, 'N/mm')})"
