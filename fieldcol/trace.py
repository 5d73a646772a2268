"""Calculation trace: the ordered steps an engineer checks line by line."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np


@dataclass(frozen=True)
class Step:
    """One line of a calculation sheet.

    Args:
        symbol: the symbol as printed, e.g. ``"Fe"``.
        what: what the quantity is, e.g. ``"elastic buckling stress, weak axis"``.
        formula: the formula as printed, e.g. ``"pi^2 E / (Lc/r)^2"``.
        value: a float, or a numpy array for a batch (one value per column).
        unit: a unit pint can read (``"MPa"``, ``"N"``, ``"mm"``, ``""`` for pure numbers).
        clause: the clause it comes from, e.g. ``"AISC 360-22 E3"``.

    Example:
        >>> Step("Fe", "elastic buckling stress", "pi^2 E/(Lc/r)^2", 210.0, "MPa", "AISC 360-22 E3").unit
        'MPa'
    """

    symbol: str
    what: str
    formula: str
    value: Any
    unit: str
    clause: str

    def at(self, i: int | tuple) -> "Step":
        """The step for one column ``i`` of a batch (scalars pass through)."""
        v = np.asarray(self.value)
        value = v.item() if v.ndim == 0 else v[i].item()
        return Step(self.symbol, self.what, self.formula, value, self.unit, self.clause)


_new_step = object.__new__


@dataclass
class Trace:
    """An ordered list of steps; ``add`` returns the value so formulas read naturally.

    Example:
        >>> t = Trace()
        >>> a = t.add("A", "gross area", "", 100.0, "mm^2", "")
        >>> len(t.steps), a
        (1, 100.0)
    """

    steps: list[Step] = field(default_factory=list)

    def add(self, symbol: str, what: str, formula: str, value: Any, unit: str, clause: str) -> Any:
        """Append a step; returns ``value``."""
        # a check adds some fifty steps: filled in one call rather than through the frozen
        # dataclass's six guarded assignments (the same Step either way)
        step = _new_step(Step)
        step.__dict__.update(symbol=symbol, what=what, formula=formula, value=value, unit=unit,
                             clause=clause)
        self.steps.append(step)
        return value

    def extend(self, other: "Trace") -> None:
        self.steps.extend(other.steps)


# How each code writes the axes: AISC x (strong), y (weak), z (twist); EN y-y, z-z, T.
_SUFFIX = {"aisc360-22": {"strong": "x", "weak": "y", "twist": "z", "torsion": "z", "T": "z"},
           "en1993-1-1": {"strong": "y", "weak": "z", "twist": "T", "torsion": "T", "T": "T"}}
_SUFFIX["elastic"] = _SUFFIX["aisc360-22"]
_EN_NAMES = {"Lc": "L_cr", "Ncr": "N_cr", "alpha": "α", "lb": "λ-bar", "Phi": "Φ", "chi": "χ",
             "Nb": "χ_{s} A f_y", "ignore": "λ-bar_{s} ≤ 0.2", "Pcr": "N_cr", "K": "K", "curve": "curve",
             "Fy": "f_y", "fy": "f_y", "Pr": "N_Ed", "Ix": "I_y", "Iy": "I_z", "rx": "i_y",
             "ry": "i_z", "J": "I_t", "Cw": "I_w", "eps": "ε", "Aeff": "A_eff", "Nc": "N_c,Rk",
             "Pn": "N_Rk", "Nb,Rd": "N_b,Rd", "Lcz": "L_cr,T", "beta_br": "β_br",
             "gamma_M1": "γ_M1", "L": "L", "U": "N_Ed / N_b,Rd", "chi_LT": "χ_LT",
             "lb,LT": "λ-bar_LT", "alpha_LT": "α_LT", "Pn,yield": "N_c,Rk", "C1": "C_1",
             "chi_LT,0": "χ_LT,0", "Phi_LT": "Φ_LT", "alpha,web": "α_web", "psi,web": "ψ_web"}
# (the torsional length as the other lengths are written: Lc,x, Lc,y, Lc,z)
_US_NAMES = {"Lcz": "Lc,z", "beta_br": "β_br", "phiPn": "φPn", "Pn/Omega": "Pn/Ω", "Lc/r": "Lc/r",
             "Pcr": "Pcr", "Lc": "Lc", "K": "K{s}", "Fe": "Fe", "Fcr": "Fcr", "Pn": "Pn",
             "slender": "slender"}


def display_symbol(symbol: str, code: str) -> str:
    """The symbol of a trace step as the code's own text writes it.

    Steps are keyed by axis name inside the engine (``chi,weak``, ``Lc_weak``); an engineer
    reading an EN 1993-1-1 check expects ``χ_z`` and ``L_cr,z``, and one reading an AISC
    360-22 check ``Lc,y``. Unknown symbols come back unchanged.

    Args:
        symbol: the step's symbol as the engine wrote it.
        code: ``aisc360-22``, ``en1993-1-1`` or ``elastic``.

    Returns:
        The symbol to show.

    Example:
        >>> display_symbol("chi,weak", "en1993-1-1"), display_symbol("Lc_weak", "aisc360-22")
        ('χ_z', 'Lc,y')
        >>> display_symbol("Nb,Rd", "en1993-1-1"), display_symbol("Pr", "en1993-1-1")
        ('N_b,Rd', 'N_Ed')
    """
    en = code == "en1993-1-1"
    names = _EN_NAMES if en else _US_NAMES
    suffix = _SUFFIX.get(code, _SUFFIX["aisc360-22"])
    if symbol in names and symbol not in ("Lc", "K", "Pcr"):
        return names[symbol]
    for sep in (",", "_"):
        base, _, tag = symbol.rpartition(sep)
        if base and tag in suffix:
            name = names.get(base, base)
            s = suffix[tag]
            if "{s}" in name:
                return name.format(s=s)
            if en:
                if "_" in name or "," in name:
                    return f"{name},{s}"
                return f"{name}_{s}"
            return f"{name},{s}"
    return symbol
