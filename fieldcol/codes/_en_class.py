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


def internal_limits_bending(alpha: np.ndarray, psi: np.ndarray, eps: np.ndarray
                            ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Table 5.2 (sheet 1) c/t limits of an internal part in bending and compression.

    Class 1: 396 eps / (13 alpha - 1) for alpha > 0.5, else 36 eps / alpha; Class 2: 456 eps /
    (13 alpha - 1), else 41.5 eps / alpha (alpha: the compressed share of c under the plastic
    stress distribution). Class 3: 42 eps / (0.67 + 0.33 psi) for psi > -1, else
    62 eps (1 - psi) sqrt(-psi) (psi: the end-stress ratio of the elastic distribution).

    Args:
        alpha: compressed share of c (0 < alpha <= 1); psi: sigma_2 / sigma_1 (<= 1); eps: sqrt(235/fy).
    Returns:
        (class 1 limit, class 2 limit, class 3 limit) on c/t.

    Example:
        >>> l1, l2, l3 = internal_limits_bending(np.array(1.0), np.array(1.0), np.array(1.0))
        >>> round(float(l1), 1), round(float(l2), 1), round(float(l3), 1)
        (33.0, 38.0, 42.0)
    """
    a = np.clip(alpha, 1e-9, 1.0)
    over = a > 0.5
    den = np.where(over, 13 * a - 1, 1.0)
    l1 = np.where(over, 396 * eps / den, 36 * eps / a)
    l2 = np.where(over, 456 * eps / den, 41.5 * eps / a)
    p = np.minimum(psi, 1.0)
    l3 = np.where(p > -1, 42 * eps / (0.67 + 0.33 * p), 62 * eps * (1 - p) * np.sqrt(np.abs(p)))
    return l1, l2, l3


def web_under_bending(ct: np.ndarray, tw: np.ndarray, fy: np.ndarray, eps: np.ndarray, N: np.ndarray,
                      M: np.ndarray, A: np.ndarray, I: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Class of the web of an I under axial force N (compression, N) and a strong-axis moment M (N*mm).

    alpha from the plastic distribution: the web carries N about the centre of c (the section at
    its plastic moment reduced for N), alpha = (1 + N / (c tw fy)) / 2 <= 1. psi from the elastic
    stresses at the ends of c: (N/A - M c/(2 I)) / (N/A + M c/(2 I)). Where M = 0 the web is in
    pure compression (alpha = psi = 1).

    Args:
        ct: c/t of the web; tw: web thickness (mm); fy, eps; N (N); M (N*mm); A (mm^2); I (mm^4).
    Returns:
        (class 1..4 of the web, alpha, psi).

    Example:
        >>> cls, a, p = web_under_bending(np.array(40.3), np.array(9.4), np.array(355.), np.array(0.8136),
        ...     np.array(127e3), np.array(356e6), np.array(9880.), np.array(3.374e8))
        >>> int(cls), round(float(a), 2)
        (1, 0.55)
    """
    c = ct * tw
    bent = M > 0
    alpha = np.where(bent, np.minimum(1.0, 0.5 * (1 + N / (c * tw * fy))), 1.0)
    s_n = N / A
    s_m = M * c / (2 * I)
    psi = np.where(bent, (s_n - s_m) / np.maximum(s_n + s_m, 1e-300), 1.0)
    l1, l2, l3 = internal_limits_bending(alpha, psi, eps)
    cls = np.select([ct <= l1, ct <= l2, ct <= l3], [1, 2, 3], 4)
    return cls, alpha, psi


def web_thresholds(ct: np.ndarray, eps: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The Table 5.2 limits of an internal part turned round: the largest alpha at which c/t is
    still Class 1 and Class 2, and the largest psi at which it is still Class 3, per column.

    The limits fall as alpha and psi rise, so ``alpha <= a1`` is the same test as
    ``c/t <= 396 eps/(13 alpha - 1)`` (or 36 eps/alpha), and so on: a load-by-load check then costs
    three comparisons (the capacity's bisection classifies at every trial load).

    Args:
        ct: c/t of the part; eps: sqrt(235/fy).
    Returns:
        (a1, a2, p3).

    Example:
        >>> a1, a2, p3 = web_thresholds(np.array(40.3), np.array(0.8136))
        >>> round(float(a1), 3), round(float(a2), 3), round(float(p3), 3)
        (0.692, 0.785, 0.539)
    """
    ct = np.maximum(ct, 1e-12)
    r1 = (396 * eps / ct + 1) / 13
    a1 = np.where(r1 > 0.5, r1, 36 * eps / ct)
    r2 = (456 * eps / ct + 1) / 13
    a2 = np.where(r2 > 0.5, r2, np.minimum(41.5 * eps / ct, 0.5))
    p3 = (42 * eps / ct - 0.67) / 0.33
    deep = p3 <= -1
    if np.any(deep):
        # psi <= -1: 62 eps (1 - psi) sqrt(-psi) = c/t, with q = -psi: (1 + q) sqrt(q) = c/(62 eps t),
        # rising in q; halve the bracket [1, (c/(62 eps t))^(2/3) + 1]
        target = ct / (62 * eps)
        lo = np.ones(np.shape(ct))
        hi = np.maximum(target, 1.0) ** (2 / 3) + 1
        for _ in range(60):
            mid = 0.5 * (lo + hi)
            low = (1 + mid) * np.sqrt(mid) < target
            lo, hi = np.where(low, mid, lo), np.where(low, hi, mid)
        p3 = np.where(deep, -lo, p3)
    return a1, a2, p3
