"""AISC 360-22 local buckling for axial compression: Table B4.1a limits and Section E7 effective area."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fieldcol.trace import Trace

B4 = "AISC 360-22 Table B4.1a"
E71 = "AISC 360-22 E7.1"
E72 = "AISC 360-22 E7.2"


@dataclass
class Element:
    """One kind of plate in the section, all ``count`` of them alike.

    name: e.g. "flange"; lam: width-to-thickness ratio (B4.1); lam_r: its Table B4.1a limit;
    t: thickness (mm); count: how many such plates; c1, c2: Table E7.1 factors.
    """

    name: str
    lam: np.ndarray
    lam_r: np.ndarray
    t: np.ndarray
    count: int
    c1: float
    c2: float

    @property
    def b(self) -> np.ndarray:
        # b = lam t recovers the width the section's own ratio was built from
        return self.lam * self.t


def elements(kind: str, sec: dict[str, np.ndarray], Fy: np.ndarray, E: np.ndarray,
             trace: Trace) -> list[Element]:
    """The plates of an I or rectangular hollow section with their Table B4.1a limits.

    Example:
        >>> sec = {"lam_flange": np.array(8.), "lam_web": np.array(30.), "tf": np.array(10.),
        ...        "tw": np.array(6.), "rolled": np.array(True)}
        >>> [e.name for e in elements("i", sec, np.array(345.), np.array(2e5), Trace())]
        ['flange', 'web']
    """
    root = np.sqrt(E / Fy)
    if kind == "i":
        rolled = sec["rolled"]
        kc = np.clip(4.0 / np.sqrt(sec["lam_web"]), 0.35, 0.76)
        if not rolled.all():
            trace.add("kc", "flange buckling coefficient (built-up)", "4 / sqrt(h/tw), 0.35 <= kc <= 0.76",
                      np.where(rolled, np.nan, kc), "", B4)
        lam_rf = np.where(rolled, 0.56 * root, 0.64 * np.sqrt(kc * E / Fy))
        trace.add("lr,flange", "flange limit (axial)", "rolled 0.56 sqrt(E/Fy); built-up 0.64 sqrt(kc E/Fy)",
                  lam_rf, "", B4)
        lam_rw = trace.add("lr,web", "web limit (axial)", "1.49 sqrt(E/Fy)", 1.49 * root, "", B4)
        # four half-flanges of width bf/2 make up both flanges
        return [Element("flange", sec["lam_flange"], lam_rf, sec["tf"], 4, 0.22, 1.49),
                Element("web", sec["lam_web"], lam_rw, sec["tw"], 1, 0.18, 1.31)]
    lam_r = trace.add("lr,wall", "HSS wall limit (axial)", "1.40 sqrt(E/Fy)", 1.40 * root, "", B4)
    return [Element("flange", sec["lam_flange"], lam_r, sec["tf"], 2, 0.20, 1.38),
            Element("web", sec["lam_web"], lam_r, sec["tw"], 2, 0.20, 1.38)]


def effective_area(elems: list[Element], A: np.ndarray, Fy: np.ndarray, Fcr: np.ndarray,
                   trace: Trace, tag: str) -> np.ndarray:
    """Ae = A - sum (b - be) t over the elements slender at this Fcr (E7.1).

    Args:
        elems: from ``elements``; A: gross area (mm^2); Fy, Fcr: MPa; tag: mode label for the trace.
    Returns:
        Ae (mm^2).

    Example:
        >>> e = Element("wall", np.array(60.), np.array(33.7), np.array(5.), 4, 0.20, 1.38)
        >>> Ae = effective_area([e], np.array(6400.), np.array(345.), np.array(300.), Trace(), "x")
        >>> round(float(Ae), 1)
        4558.1
    """
    loss = np.zeros(np.broadcast_shapes(A.shape, Fcr.shape))
    for e in elems:
        slender = e.lam > e.lam_r * np.sqrt(Fy / Fcr)
        if not slender.any():
            continue
        Fel = (e.c2 * e.lam_r / e.lam) ** 2 * Fy
        ratio = np.sqrt(Fel / Fcr)
        # be <= b: just past the limit the formula gives up to 0.2 % more than b
        be = np.where(slender, np.minimum(e.b, e.b * (1 - e.c1 * ratio) * ratio), e.b)
        trace.add(f"be,{e.name},{tag}", f"effective width of the {e.name}, {tag}",
                  "lam > lr sqrt(Fy/Fcr): b (1 - c1 sqrt(Fel/Fcr)) sqrt(Fel/Fcr), "
                  f"Fel = (c2 lr/lam)^2 Fy, c1 = {e.c1}, c2 = {e.c2}; else b", be, "mm",
                  f"{E71} (Table E7.1)")
        loss = loss + e.count * (e.b - be) * e.t
    return trace.add(f"Ae,{tag}", f"effective area, {tag}", "A - sum (b - be) t", A - loss, "mm^2", E71)


def round_effective_area(A: np.ndarray, Dt: np.ndarray, Fy: np.ndarray, E: np.ndarray,
                         trace: Trace) -> tuple[np.ndarray, np.ndarray]:
    """Round HSS (E7.2): Ae = A for D/t <= 0.11 E/Fy, else [0.038 E/(Fy D/t) + 2/3] A (<= A)
    below 0.45 E/Fy.

    Returns:
        (Ae mm^2, mask where D/t >= 0.45 E/Fy: outside E7.2, Ae is NaN there).

    Example:
        >>> a = np.array
        >>> Ae, out = round_effective_area(a(1000.), a(80.), a(345.), a(2e5), Trace())
        >>> round(float(Ae), 1), bool(out)
        (942.0, False)
    """
    lam_r = trace.add("lr,D/t", "round HSS limit (axial)", "0.11 E/Fy", 0.11 * E / Fy, "", B4)
    outside = np.asarray(Dt >= 0.45 * E / Fy)
    # Ae <= A: just past 0.11 E/Fy the bracket is up to 1.012, which would add area
    Ae = np.where(Dt <= lam_r, A, np.minimum(A, (0.038 * E / (Fy * Dt) + 2.0 / 3.0) * A))
    Ae = np.where(outside, np.nan, Ae)
    trace.add("Ae", "effective area (round HSS)",
              "D/t <= 0.11 E/Fy: A; D/t < 0.45 E/Fy: [0.038 E/(Fy D/t) + 2/3] A <= A; beyond: not covered",
              Ae, "mm^2", E72)
    return Ae, outside
