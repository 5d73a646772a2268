"""Required axial strength from service loads: the standard gravity combinations of each code.

AISC 360-22 takes its combinations from ASCE/SEI 7-22 (2.3.1 strength design, 2.4.1 allowable
stress design); EN 1993-1-1 from EN 1990 6.4.3.2 (6.10) with the recommended partial factors and
combination factors of Annex A1 (Tables A1.1 and A1.2(B)). Only the gravity loads a column record
carries are combined: dead, live (imposed), snow and roof live. Values recalled from memory of those
standards; local codes and National Annexes govern.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Mapping

from fieldcol.trace import Trace

# ASCE 7-22 2.3.1 (LRFD): 1.4D; 1.2D + 1.6L + 0.5(Lr or S); 1.2D + 1.6(Lr or S) + L.
# The live load factor 1.0 in the third is kept (0.5 is permitted only for some occupancies).
_LRFD = (
    ("1.4D", {"dead": 1.4}),
    ("1.2D + 1.6L + 0.5Lr", {"dead": 1.2, "live": 1.6, "roof_live": 0.5}),
    ("1.2D + 1.6L + 0.5S", {"dead": 1.2, "live": 1.6, "snow": 0.5}),
    ("1.2D + 1.6Lr + L", {"dead": 1.2, "roof_live": 1.6, "live": 1.0}),
    ("1.2D + 1.6S + L", {"dead": 1.2, "snow": 1.6, "live": 1.0}),
)
# ASCE 7-22 2.4.1 (ASD): D; D + L; D + (Lr or S); D + 0.75L + 0.75(Lr or S).
_ASD = (
    ("D", {"dead": 1.0}),
    ("D + L", {"dead": 1.0, "live": 1.0}),
    ("D + Lr", {"dead": 1.0, "roof_live": 1.0}),
    ("D + S", {"dead": 1.0, "snow": 1.0}),
    ("D + 0.75L + 0.75Lr", {"dead": 1.0, "live": 0.75, "roof_live": 0.75}),
    ("D + 0.75L + 0.75S", {"dead": 1.0, "live": 0.75, "snow": 0.75}),
)
# EN 1990 (6.10), gamma_G 1.35, gamma_Q 1.5; recommended psi0 (Table A1.1): imposed 0.7
# (categories A-D; storage, category E, is 1.0), snow 0.5 (sites at or below 1000 m; 0.7 above
# and in Nordic countries); roof imposed (category H) 0.0 and not combined with snow
# (EN 1991-1-1 3.3.2). The record may set psi0 for "live" and "snow".
PSI0 = {"live": 0.7, "snow": 0.5}


def _en(psi0: Mapping[str, float]) -> tuple:
    q, s = psi0["live"], psi0["snow"]
    return (
        ("1.35G", {"dead": 1.35}),
        (f"1.35G + 1.5Q + 1.5({s:g})S", {"dead": 1.35, "live": 1.5, "snow": 1.5 * s}),
        (f"1.35G + 1.5S + 1.5({q:g})Q", {"dead": 1.35, "snow": 1.5, "live": 1.5 * q}),
        (f"1.35G + 1.5Qroof + 1.5({q:g})Q", {"dead": 1.35, "roof_live": 1.5, "live": 1.5 * q}),
    )


_EN = _en(PSI0)
_TABLES = {"lrfd": (_LRFD, "ASCE/SEI 7-22 2.3.1"), "asd": (_ASD, "ASCE/SEI 7-22 2.4.1"),
           "en": (_EN, "EN 1990 6.4.3.2 (6.10), Table A1.2(B)"),
           "none": (_ASD, "service loads, unfactored sums")}


@dataclass(frozen=True)
class Combination:
    """The governing combination: its name, the required axial strength (N) and its clause."""

    name: str
    axial: float
    clause: str


def combine(loads: Mapping[str, float], basis: str, trace: Trace | None = None,
            psi0: Mapping[str, float] | None = None) -> Combination:
    """The largest required axial strength over the gravity combinations of ``basis``.

    Gravity loads only: lateral loads (wind, seismic) and their combinations are not included.

    Args:
        loads: service loads in N by type (``dead``, ``live``, ``snow``, ``roof_live``).
        basis: ``"lrfd"``, ``"asd"``, ``"en"`` or ``"none"`` (elastic check: service sums).
        trace: if given, each combination is added as a step.
        psi0: EN combination factors for ``live`` and ``snow`` (default ``PSI0``).

    Returns:
        Combination(name, axial N, clause).

    Example:
        >>> combine({"dead": 100.0, "live": 50.0}, "lrfd").name
        '1.2D + 1.6L + 0.5Lr'
    """
    table, clause = _TABLES[basis]
    if basis == "en" and psi0:
        table = _en({**PSI0, **psi0})
    best: Combination | None = None
    for name, factors in table:
        value = sum(f * loads.get(k, 0.0) for k, f in factors.items())
        if trace is not None:
            trace.add("Pu" if basis == "lrfd" else ("NEd" if basis == "en" else "Pa"),
                      "required axial strength, load combination", name, value, "N", clause)
        if best is None or value > best.axial:
            best = Combination(name, value, clause)
    assert best is not None
    return best
