"""Fastener holes in the tension flange of a member in bending (riveted or bolted sections).

In compression the holes are filled by the rivets or bolts and the gross area is used (AISC
360-22 E3, Pn = Fcr Ag; EN 1993-1-1 6.2.4 (3)). In bending the flange in tension is weakened
at a line of holes across it:

* AISC 360-22 F13.1 (from memory): where Fu Afn >= Yt Fy Afg, tensile rupture of the flange
  does not apply; else Mn <= Fu Afn / Afg Sx (F13-1). Yt = 1.0 for Fy/Fu <= 0.8, else 1.1.
  Afn per B4.3b: each hole taken 1/16 in (2 mm) wider than its nominal diameter.
* EN 1993-1-1 6.2.5 (4) (from memory): holes in the tension flange may be ignored where
  A_f,net 0.9 fu / gamma_M2 >= A_f fy / gamma_M0 (6.16) (gamma_M0 1.0, gamma_M2 1.25
  recommended). The clause gives no resistance where (6.16) fails: the extreme fibre stress is
  then limited to 0.9 fu (A_f,net / A_f) / gamma_M2 on the elastic modulus, the form of F13-1
  (a judgement, said in the trace). Holes are deducted at d0 (6.2.2.2).

The check is one of the section at the holes; it caps the flexural strength the beam-column
interaction uses about the axis that puts the flange in tension (``FlangeHoles.axis``).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fieldcol.errors import InputError
from fieldcol.trace import Trace

F13 = "AISC 360-22 F13.1"
EN625 = "EN 1993-1-1 6.2.5 (4)"
#: AISC 360-22 B4.3b (from memory): a hole's width for the net area is 1/16 in (2 mm) more
#: than its nominal diameter
HOLE_ALLOWANCE = 2.0
GAMMA_M0, GAMMA_M2 = 1.0, 1.25


@dataclass(frozen=True)
class FlangeHoles:
    """A line of fastener holes across one flange at one cross-section.

    diameter: the hole (mm; a driven rivet fills its hole); count: holes across one flange;
    thickness: the steel the holes pass through (mm: flange plus cover or flange plate);
    Afg: gross area of one flange (mm^2, plates included); axis: ``strong`` or ``weak``, the
    axis about which bending puts that flange in tension; where: the flange in words.

    Example:
        >>> h = FlangeHoles(23.8, 2, 30.0, 9000.0)
        >>> round(h.net(2.0))
        7452
    """

    diameter: float
    count: int
    thickness: float
    Afg: float
    axis: str = "strong"
    where: str = "flange"

    def net(self, allowance: float = 0.0) -> float:
        """Afn: the flange's area left at the line of holes (mm^2), each hole ``allowance``
        wider than its diameter."""
        return self.Afg - self.count * (self.diameter + allowance) * self.thickness


def _need_fu(Fu: float | None) -> None:
    if Fu is None or not np.all(np.isfinite(np.asarray(Fu, dtype=float))):
        raise InputError("material.Fu", "", "the tensile strength is needed for the fastener holes "
                         "in the tension flange (AISC 360-22 F13.1, EN 1993-1-1 6.2.5 (4))",
                         "give Fu with the material's values, or a grade")


def aisc_tension_flange(h: FlangeHoles, Fy: float, Fu: float, S: float, Mn: np.ndarray,
                        t: Trace) -> np.ndarray:
    """AISC 360-22 F13.1: the nominal flexural strength with holes in the tension flange.

    Args:
        h: the holes; Fy, Fu: MPa; S: elastic section modulus about ``h.axis`` (mm^3);
        Mn: the strength without holes (N*mm); t: the trace.
    Returns:
        Mn, capped by (F13-1) where tensile rupture applies.

    Example:
        >>> h = FlangeHoles(23.8, 4, 30.0, 9000.0)
        >>> m = aisc_tension_flange(h, 248.2, 350.0, 2.0e6, np.array(5.0e8), Trace())
        >>> round(float(m) / 1e6)
        459
    """
    _need_fu(Fu)
    Afn = t.add("Afn", f"net area of the tension flange ({h.count} holes of {h.diameter:.1f} mm "
                f"+ 2 mm across the {h.where})", "Afg - n (dh + 2 mm) t", h.net(HOLE_ALLOWANCE),
                "mm^2", f"{F13}; AISC 360-22 B4.3b")
    t.add("Afg", f"gross area of the tension flange ({h.where})", "section", h.Afg, "mm^2", F13)
    Yt = t.add("Yt", "hole reduction coefficient", "1.0 if Fy/Fu <= 0.8, else 1.1",
               1.0 if Fy / Fu <= 0.8 else 1.1, "", F13)
    ratio = t.add("FuAfn/YtFyAfg", "tension flange: rupture at the holes against yield of the "
                  "gross flange (>= 1: tensile rupture does not apply; < 1: (F13-1) limits Mn)",
                  "Fu Afn / (Yt Fy Afg)", Fu * Afn / (Yt * Fy * h.Afg), "", F13)
    applies = np.asarray(ratio) < 1
    if not applies.any():
        return Mn
    cap = t.add(f"Mn,holes_{h.axis}", f"flexural strength at the holes, {h.axis} axis",
                "Fu Afn / Afg S", Fu * Afn / h.Afg * S, "N*mm", f"{F13} (F13-1)")
    return np.where(applies, np.minimum(Mn, cap), Mn)


def en_tension_flange(h: FlangeHoles, fy: float, fu: float, W: float, M_Rd: np.ndarray,
                      t: Trace) -> np.ndarray:
    """EN 1993-1-1 6.2.5 (4) with (6.16): the design moment resistance with holes in the
    tension flange (module notes for the resistance where (6.16) fails).

    Args:
        h: the holes; fy, fu: MPa; W: elastic section modulus about ``h.axis`` (mm^3);
        M_Rd: the design moment resistance without holes (N*mm); t: the trace.
    Returns:
        M_Rd, capped where (6.16) is not met.

    Example:
        >>> h = FlangeHoles(22.0, 4, 30.0, 9000.0)
        >>> m = en_tension_flange(h, 235.0, 360.0, 2.0e6, np.array(4.7e8), Trace())
        >>> round(float(m) / 1e6)
        366
    """
    _need_fu(fu)
    Afn = t.add("A_f,net", f"net area of the tension flange ({h.count} holes of d0 "
                f"{h.diameter:.1f} mm across the {h.where})", "A_f - n d0 t", h.net(),
                "mm^2", "EN 1993-1-1 6.2.2.2")
    t.add("A_f", f"gross area of the tension flange ({h.where})", "section", h.Afg, "mm^2", EN625)
    ratio = t.add("(6.16)", "tension flange: A_f,net 0.9 fu / gamma_M2 over A_f fy / gamma_M0 "
                  "(gamma_M0 1.0, gamma_M2 1.25 recommended)", "(A_f,net 0.9 fu / gamma_M2) / "
                  "(A_f fy / gamma_M0)", (Afn * 0.9 * fu / GAMMA_M2) / (h.Afg * fy / GAMMA_M0),
                  "", f"{EN625} (6.16)")
    fails = np.asarray(ratio) < 1
    if not fails.any():
        t.add("note", "holes in the tension flange ignored: (6.16) is met", "", "", "", EN625)
        return M_Rd
    cap = t.add(f"M_Rd,holes_{h.axis}", f"moment resistance at the holes, {h.axis} axis: "
                "(6.16) not met, the extreme fibre stress limited to the flange's rupture at "
                "the holes (EN gives no formula: the form of AISC 360-22 F13-1, judgement)",
                "W_el 0.9 fu (A_f,net / A_f) / gamma_M2", W * 0.9 * fu * Afn / h.Afg / GAMMA_M2,
                "N*mm", f"{EN625}; judgement")
    return np.where(fails, np.minimum(M_Rd, cap), M_Rd)


__all__ = ["FlangeHoles", "HOLE_ALLOWANCE", "aisc_tension_flange", "en_tension_flange"]
