"""EN 1993-1-1 Table 5.2 cross-section class in pure compression and EN 1993-1-5 4.4 effective area."""

from __future__ import annotations

import numpy as np

from fieldcol.trace import Trace

T52 = "EN 1993-1-1 Table 5.2"
EC5 = "EN 1993-1-5 4.4"

# (class 1, class 2, class 3) limits on c/t as multiples of eps (CHS: of eps^2)
OUTSTAND = (9.0, 10.0, 14.0)
INTERNAL = (33.0, 38.0, 42.0)
CHS = (50.0, 70.0, 90.0)


def element_class(ct: np.ndarray, limits: tuple[float, float, float], scale: np.ndarray) -> np.ndarray:
    """Class 1..4 of a plate from its c/t and the three limits times ``scale`` (eps or eps^2).

    Example:
        >>> element_class(np.array([8.0, 9.5, 12.0, 15.0]), OUTSTAND, np.array(1.0)).tolist()
        [1, 2, 3, 4]
    """
    c1, c2, c3 = (lim * scale for lim in limits)
    return np.select([ct <= c1, ct <= c2, ct <= c3], [1, 2, 3], 4)


def rho_internal(lp: np.ndarray, psi: float = 1.0) -> np.ndarray:
    """Reduction factor of an internal compression element, EN 1993-1-5 (4.2).

    Example:
        >>> round(float(rho_internal(np.array(1.0))), 3)
        0.78
    """
    lp_safe = np.maximum(lp, 1e-12)
    return np.where(lp <= 0.673, 1.0, np.minimum(1.0, (lp_safe - 0.055 * (3 + psi)) / lp_safe**2))


def rho_outstand(lp: np.ndarray) -> np.ndarray:
    """Reduction factor of an outstand compression element, EN 1993-1-5 (4.3).

    Example:
        >>> round(float(rho_outstand(np.array(1.0))), 3)
        0.812
    """
    lp_safe = np.maximum(lp, 1e-12)
    return np.where(lp <= 0.748, 1.0, np.minimum(1.0, (lp_safe - 0.188) / lp_safe**2))


def classify(kind: str, sec: dict[str, np.ndarray], eps: np.ndarray, trace: Trace
             ) -> tuple[np.ndarray, np.ndarray]:
    """Section class in compression and the effective area used for Class 4 (A elsewhere).

    Args:
        kind: ``"i"``, ``"rect"`` or ``"round"``; sec: section arrays; eps = sqrt(235/fy).
    Returns:
        (class 1..4 per column, Aeff mm^2; NaN for a Class 4 CHS, which EN 1993-1-1 does not cover).

    Example:
        >>> sec = {"ct_flange": np.array(5.3), "ct_web": np.array(35.0), "tf": np.array(10.7),
        ...        "tw": np.array(7.1), "A": np.array(5381.0)}
        >>> cls, Aeff = classify("i", sec, np.array(1.0), Trace())
        >>> int(cls), float(Aeff)
        (2, 5381.0)
    """
    A = sec["A"]
    if kind == "round":
        cls = trace.add("class", "section class (CHS)", "d/t vs 50/70/90 eps^2",
                        element_class(sec["ct_flange"], CHS, eps**2), "", T52)
        Aeff = trace.add("Aeff", "area used", "A (Class 1-3); Class 4 CHS: not covered (EN 1993-1-6)",
                         np.where(cls == 4, np.nan, A), "mm^2", T52)
        return cls, Aeff
    if kind == "i":
        # flange: four outstands; web: one internal part
        parts = (("flange", sec["ct_flange"], sec["tf"], 4, OUTSTAND, 0.43, rho_outstand, "outstand"),
                 ("web", sec["ct_web"], sec["tw"], 1, INTERNAL, 4.0, rho_internal, "internal"))
    else:
        parts = (("flange", sec["ct_flange"], sec["tf"], 2, INTERNAL, 4.0, rho_internal, "internal"),
                 ("web", sec["ct_web"], sec["tw"], 2, INTERNAL, 4.0, rho_internal, "internal"))
    cls = np.ones(np.shape(A), dtype=int)
    loss = np.zeros(np.shape(A))
    for name, ct, t, count, limits, k_sigma, rho_fn, how in parts:
        lims = "/".join(f"{x:g}" for x in limits)
        c_el = trace.add(f"class,{name}", f"{name} class ({how}, compression)", f"c/t vs {lims} eps",
                         element_class(ct, limits, eps), "", T52)
        cls = np.maximum(cls, c_el)
        if (c_el == 4).any():
            lp = trace.add(f"lp,{name}", f"plate slenderness, {name}",
                           f"(c/t) / (28.4 eps sqrt(k_sigma)), k_sigma = {k_sigma:g}",
                           ct / (28.4 * eps * np.sqrt(k_sigma)), "", f"{EC5} (4.2), (4.3)")
            rho = trace.add(f"rho,{name}", f"reduction factor, {name}",
                            "internal: (lp - 0.055(3 + psi))/lp^2, psi = 1, lp > 0.673; "
                            "outstand: (lp - 0.188)/lp^2, lp > 0.748; <= 1",
                            np.where(c_el == 4, rho_fn(lp), 1.0), "", f"{EC5} (4.2), (4.3)")
            loss = loss + count * (1.0 - rho) * (ct * t) * t
    trace.add("class", "section class in compression", "worst of the parts", cls, "", T52)
    Aeff = np.where(cls == 4, A - loss, A)
    trace.add("Aeff", "area used", "A (Class 1-3); A - sum (1 - rho) c t (Class 4)", Aeff, "mm^2", EC5)
    return cls, Aeff
