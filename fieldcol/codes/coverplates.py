"""Cover plates riveted or bolted to the flanges of a rolled shape: the connectors' spacing.

The composite properties are those of welded plates (``sections.with_plates``); what differs is
that the plates are held only at the rivets:

* AISC 360-22 E6.1 (from memory): rivets and bolts taken as snug-tight, so about the strong axis
  (where the plates slip on the flanges as the member bends) (Lc/r)m = sqrt((Lc/r)o^2 +
  (a/ri)^2), ri = tp / sqrt(12) the plate's own least radius, used in E3 in place of Lc/r.
  About the weak axis plate and flange bend about the same line and do not slip. E6.2 spacing
  of the fasteners on an outside plate (all gauge lines fastened): at most 0.75 tp sqrt(E/Fy)
  and 305 mm (12 in); a/ri at most 3/4 of the member's slenderness: warnings.
* EN 1993-1-8 3.5 Table 3.3 (from memory): a plate in compression between fasteners need not
  be checked while p1 / tp < 9 eps; beyond, it buckles over 0.6 p1 (EN 1993-1-1 6.3.1, curve c)
  and only chi_p of the plates' area is counted (A_eff = A - 2 bp tp (1 - chi_p)), the member's
  slenderness kept from the gross section (on the safe side). p1 at most 14 tp and 200 mm:
  a warning.
* The plates never make the column weaker than the shape without them (common practice: a
  plate too loosely held to work with the shape is left out): when the shape alone (``bare``)
  is stronger, it is taken, and a warning says the plates were not counted.
* Holes filled by rivets or bolts are not deducted in compression (AISC 360-22 E3, Pn = Fcr Ag
  on the gross area of B4.3a; EN 1993-1-1 6.2.4 (3), from memory): said in the trace. In
  bending, holes across the tension flange are checked by ``netflange`` (F13.1, 6.2.5 (4)).
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from ._modes import choose
from ._result import CodeResult, Warning
from .aisc360 import check_aisc360
from .en1993 import check_en1993, reduction_factor

E6 = "AISC 360-22 E6"
EN18 = "EN 1993-1-8 3.5 Table 3.3"
CONNECTIONS = ("welded", "riveted", "bolted")
#: what compression does with holes filled by fasteners, and where the codes say so (from memory)
GROSS = ("holes filled by the rivets or bolts are not deducted in compression: the gross area "
         "is used")
GROSS_CLAUSE = "AISC 360-22 E3 (Pn = Fcr Ag), B4.3a; EN 1993-1-1 6.2.4 (3)"


@dataclass(frozen=True)
class PlateJoint:
    """How cover plates are held to the flanges: ``connection`` (welded, riveted, bolted), the
    rivet or bolt ``pitch`` along the column (mm; None when welded), plate ``thickness`` and
    ``width`` (mm); ``bare``: the shape as it is without the plates (a ``Section``), when
    known."""

    connection: str
    pitch: float | None
    thickness: float
    width: float
    bare: Any = None


def check_riveted_plates(code: str, joint: PlateJoint, section: Any, Fy: float, E: float,
                         G: float, Lc_strong: float, Lc_weak: float, Lc_twist: float, *,
                         basis: str = "lrfd", gamma_M1: float = 1.0,
                         high_strength: bool = False) -> CodeResult:
    """Axial strength of a rolled shape with riveted or bolted cover plates (module notes).

    Args:
        code: ``aisc360-22`` or ``en1993-1-1`` (``elastic``: the composite, unchanged).
        joint: the plates and their connectors. section: the plated ``Section``.
        Fy, E, G: MPa. Lc_*: effective lengths (mm). basis, gamma_M1: as the code checks.
    Returns:
        a ``CodeResult`` with the connector steps in its trace.

    Example:
        >>> from fieldcol.sections import from_catalogue, with_plates
        >>> s = with_plates(from_catalogue("W14X90"), 12.0, 300.0)
        >>> j = PlateJoint("riveted", 150.0, 12.0, 300.0)
        >>> r = check_riveted_plates("aisc360-22", j, s, 250, 200000, 77200, 9000, 4500, 4500)
        >>> round(float(next(st.value for st in r.trace.steps if st.symbol == "a/ri")), 1)
        43.3
    """
    tp, a = joint.thickness, float(joint.pitch)
    if code == "aisc360-22":
        rx = float(section.rx)
        o = Lc_strong / rx
        ri = tp / np.sqrt(12)
        m = float(np.sqrt(o**2 + (a / ri)**2))
        res = check_aisc360(section, Fy, E, G, m * rx, Lc_weak, Lc_twist, basis=basis)
        steps = res.trace.steps
        res.trace.steps = []
        t = res.trace
        t.add("(Lc/r)o", "slenderness of the plated member as a unit, strong axis", "Lc / rx", o,
              "", f"{E6}.1")
        t.add("a/ri", f"{joint.connection} pitch over the plate's least radius (tp / sqrt(12))",
              "a / ri", a / ri, "", f"{E6}.1")
        t.add("(Lc/r)m", f"modified slenderness, strong axis ({joint.connection}, taken as "
              "snug-tight)", "sqrt((Lc/r)o^2 + (a/ri)^2)", m, "", f"{E6}.1 (E6-1)")
        t.add("Lc,m,strong", "effective length giving (Lc/r)m, strong axis (used below as "
              "Lc,strong)", "(Lc/r)m rx", m * rx, "mm", f"{E6}.1")
        t.steps.extend(steps)
        worst = max(m, Lc_weak / float(section.ry))
        amax = min(0.75 * tp * np.sqrt(E / Fy), 305.0)
        one = np.ones(np.shape(res.nominal), dtype=bool)
        if a > amax:
            res.warnings.append(Warning("connector-spacing", f"{joint.connection} pitch "
                                        f"{a:.0f} mm exceeds {amax:.0f} mm (0.75 tp sqrt(E/Fy), "
                                        f"at most 305 mm) for an outside plate ({E6}.2)", one))
        if a / ri > 0.75 * worst:
            res.warnings.append(Warning("connector-spacing", f"a/ri = {a / ri:.0f} of a cover "
                                        f"plate exceeds 3/4 of the member's slenderness "
                                        f"({0.75 * worst:.0f}) ({E6}.2)", one))
    elif code == "en1993-1-1":
        res = check_en1993(section, Fy, E, G, Lc_strong, Lc_weak, Lc_twist, gamma_M1=gamma_M1,
                           high_strength=high_strength)
        t = res.trace
        t.steps = [s for s in t.steps if s.symbol not in ("Pn", "mode", "Nb,Rd")]
        eps = np.sqrt(235 / Fy)
        ratio = t.add("p1/tp", f"{joint.connection} pitch over the plate thickness (limit "
                      f"9 eps = {9 * eps:.1f})", "p1 / tp", a / tp, "", EN18)
        one = np.ones(np.shape(res.nominal), dtype=bool)
        if a > min(14 * tp, 200.0):
            res.warnings.append(Warning("connector-spacing", f"{joint.connection} pitch {a:.0f} "
                                        f"mm exceeds 14 tp and 200 mm for a plate in "
                                        f"compression ({EN18})", one))
        chi_p = 1.0
        if ratio >= 9 * eps:
            lb = t.add("lb,plate", "slenderness of a plate between fasteners",
                       "(0.6 p1 / (tp / sqrt(12))) / (93.9 eps)",
                       0.6 * a / (tp / np.sqrt(12)) / (93.9 * eps), "", f"{EN18}; EN 1993-1-1 6.3.1")
            chi_p = t.add("chi,plate", "reduction factor of the plates between fasteners "
                          "(curve c)", "(6.49), alpha 0.49", float(reduction_factor(lb, 0.49)),
                          "", "EN 1993-1-1 6.3.1.2")
        A = float(section.A)
        Aeff = t.add("A_eff,plates", "area with the plates counted at chi_p",
                     "A - 2 bp tp (1 - chi_p)", A - 2 * joint.width * tp * (1 - chi_p), "mm^2",
                     EN18)
        f = Aeff / A
        for k, mode in res.modes.items():
            res.modes[k] = replace(mode, Pn=np.asarray(mode.Pn) * f, Fcr=np.asarray(mode.Fcr) * f)
        nominal, gov = choose(res.modes, t, "EN 1993-1-1 6.3.1.1")
        res.nominal, res.governing = nominal, gov
        res.design = t.add("Nb,Rd", "design buckling resistance", "chi A_eff fy / gamma_M1 "
                           f"(A_eff with the plates between fasteners), gamma_M1 = {gamma_M1:g}",
                           nominal / gamma_M1, "N", f"EN 1993-1-1 6.3.1.1 (6.47); {EN18}")
    else:
        from .elastic import check_elastic
        res = check_elastic(section, Fy, E, G, Lc_strong, Lc_weak, Lc_twist)
    res.trace.add("note", f"cover plates {joint.connection} at {a:.0f} mm: {GROSS}", "", "", "",
                  GROSS_CLAUSE)
    if joint.bare is not None and code in ("aisc360-22", "en1993-1-1"):
        res = _not_below_the_shape(code, res, joint, Fy, E, G, Lc_strong, Lc_weak, Lc_twist,
                                   basis=basis, gamma_M1=gamma_M1, high_strength=high_strength)
    return res


def _not_below_the_shape(code: str, res: CodeResult, joint: PlateJoint, Fy: float, E: float,
                         G: float, Lc_strong: float, Lc_weak: float, Lc_twist: float, *,
                         basis: str, gamma_M1: float, high_strength: bool) -> CodeResult:
    """The shape alone when it is stronger than the plated member at this pitch (scalars only:
    an array of cases keeps the plated result, the lower bound in doubt)."""
    if code == "aisc360-22":
        alone = check_aisc360(joint.bare, Fy, E, G, Lc_strong, Lc_weak, Lc_twist, basis=basis)
    else:
        alone = check_en1993(joint.bare, Fy, E, G, Lc_strong, Lc_weak, Lc_twist,
                             gamma_M1=gamma_M1, high_strength=high_strength)
    if np.ndim(res.nominal) or not float(alone.nominal) > float(res.nominal):
        return res
    one = np.ones(np.shape(alone.nominal), dtype=bool)
    alone.trace.add("note", f"the plated member held by {joint.connection}s at "
                    f"{float(joint.pitch):.0f} mm ({float(res.nominal) / 1e3:.0f} kN nominal) is "
                    "weaker than the shape alone: the plates are not counted", "", "", "",
                    f"{E6 if code == 'aisc360-22' else EN18}; common practice")
    alone.warnings.extend(w for w in res.warnings if w.code == "connector-spacing")
    alone.warnings.append(Warning("plates-not-counted", f"cover plates {joint.connection} at "
                                  f"{float(joint.pitch):.0f} mm pitch are too loosely held to "
                                  "add strength: the shape alone is checked", one))
    return alone
