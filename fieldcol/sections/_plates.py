"""Cover plates welded to both flanges of an I section: the built-up section they make.

Conventions (the properties are exact for the idealised outline; the rules below are chosen
on the safe side and stated in every result's ``notes``):
  * Two equal plates ``tp`` x ``bp``, centred on the web, one on the outer face of each flange,
    of the column's own material.
  * A, Ix, Iy, Zx, Zy add the plates to the section's own properties (root fillets and all):
    parallel-axis theorem for Ix, first moments about the mid-depth and web axes for the plastic
    moduli (the section stays doubly symmetric, so the plastic axes stay on the centre lines).
  * Sx uses the extreme fibre at d/2 + tp; Sy at max(bf, bp)/2.
  * J = J0 + 2 bp tp^3 / 3: each plate as a thin rectangle of its own. A plate welded along its
    edges twists with the flange as one thicker plate, whose J is larger ((tf + tp)^3 > tf^3 +
    tp^3), so this is on the safe side.
  * Cw = If ho'^2 / 2 for the doubly symmetric I, with If = Iy / 2 (one flange with its plate; the
    web's small share counted as the unplated section counts it, Cw0 = Iy ho^2 / 4) and ho' the
    distance between the centroids of the combined flanges (flange + plate).
  * Plate slenderness keeps the unplated section's ratios (bf/2tf, h/tw and the EN c/t). A plate
    as wide as the flange, welded continuously, would act with the flange outstand as one thicker
    plate, but a narrower plate does not stiffen the outstand beyond it; taking no credit for
    either is the conservative rule.
  * ``tf`` becomes max(tf, tp), the thickest single plate: it sets the yield stress by thickness
    (each plate keeps the yield stress of its own thickness; the thickest governs) and the
    EN 1993-1-1 Table 6.2 row for welded sections. Taking tf + tp would drop fy a band for a
    combined thickness that no plate has, and a retrofit would then seem to weaken the column.
    The flange width a code rebuilds from ratio x tf stays the real outstand.
  * ``d`` becomes d + 2 tp, ``bf`` stays the flange width, ``r`` the root fillet; ``rolled``
    becomes False (a built-up section for the codes); the catalogue name is kept.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np
from numpy.typing import ArrayLike

from fieldcol.errors import InputError
from fieldcol.sections._section import Section

# A plate may stand past each flange tip by this much (mm): room for a fillet weld laid along the
# flange tip on the plate (common practice). Beyond it the plate is an outstand of its own that
# this model does not check.
OVERHANG = 25.0


def _value(x: object, field: str) -> np.ndarray:
    try:
        a = np.asarray(x, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, x, "not a number", "give the size in mm") from None
    if not np.all(np.isfinite(a)):
        raise InputError(field, x, "not a finite number", "give the size in mm")
    return a


def _first(bad: np.ndarray, values: np.ndarray) -> tuple[str, float]:
    """Index suffix and value of the first flagged element (batches name ``field[i]``)."""
    if np.ndim(bad) == 0:
        return "", float(np.asarray(values).reshape(-1)[0])
    idx = tuple(int(i) for i in np.argwhere(bad)[0])
    vals = np.broadcast_to(values, np.shape(bad))
    return f"[{','.join(map(str, idx))}]", float(vals[idx])


def _note(tp: np.ndarray, bp: np.ndarray, how: str = "welded") -> str:
    if tp.size == 1 and bp.size == 1:
        return f"cover plates 2 x {float(tp):.1f} x {float(bp):.1f} mm {how} to the flanges"
    return f"cover plates 2 x tp x bp (per column) {how} to the flanges"


def with_plates(section: Section, thickness: ArrayLike, width: ArrayLike | None = None, *,
                field: str = "section.plates", how: str = "welded") -> Section:
    """The built-up section of an I with a cover plate welded to the outer face of each flange.

    Args:
        section: an I section (catalogue, measured, or after ``with_loss``).
        thickness: plate thickness tp (mm), > 0; arrays broadcast with the section.
        width: plate width bp (mm), > 0 and at most bf + 2 x 25 mm; None for the flange width.
        field: the field named in errors (``<field>.thickness``, ``<field>.width``).
        how: ``welded`` (default), ``riveted`` or ``bolted``, for the note (the properties are
            the same; ``codes.coverplates`` checks the fasteners' spacing).
    Returns:
        A new Section (kind ``"i"``, ``rolled=False``) with the composite properties (see the
        module notes for the rules) and the note
        ``"cover plates 2 x <tp> x <bp> mm welded to the flanges"``.
    Raises:
        InputError: a hollow section, thickness <= 0, width <= 0 or wider than the flange allows.

    Example:
        >>> from fieldcol.sections import from_catalogue
        >>> s = with_plates(from_catalogue("W14X90"), 12.0, 300.0)
        >>> round(float(s.A - from_catalogue("W14X90").A)), s.rolled, s.notes[-1]
        (7200, False, 'cover plates 2 x 12.0 x 300.0 mm welded to the flanges')
    """
    if not isinstance(section, Section):
        raise InputError("section", section, "not a Section", "build one with from_catalogue or "
                         "i_section")
    if section.kind != "i":
        raise InputError(field, section.name or section.kind,
                         "plates on hollow sections are not modelled",
                         "cover plates are modelled on I sections only")
    tp = _value(thickness, f"{field}.thickness")
    bad = tp <= 0
    if bad.any():
        i, v = _first(bad, tp)
        raise InputError(f"{field}.thickness{i}", f"{v:g} mm", "a plate must be thicker than zero",
                         "give the plate thickness, e.g. 3/8 in")
    bf = section.bf
    bp = np.array(bf, dtype=float) if width is None else _value(width, f"{field}.width")
    bad = bp <= 0
    if bad.any():
        i, v = _first(bad, bp)
        raise InputError(f"{field}.width{i}", f"{v:g} mm", "a plate must be wider than zero",
                         "give the plate width, or leave it out for the flange width")
    try:
        tp, bp = np.broadcast_arrays(tp, bp, bf)[:2]
    except ValueError:
        raise InputError(f"{field}.width", repr(np.shape(bp)), "array shapes do not broadcast "
                         "with the section", "give scalars or arrays of the section's shape") from None
    bad = bp > bf + 2 * OVERHANG + 1e-9
    if bad.any():
        i, v = _first(bad, bp)
        lim = _first(bad, bf + 2 * OVERHANG)[1]
        raise InputError(f"{field}.width{i}", f"{v:g} mm",
                         f"wider than the flange plus {OVERHANG:g} mm each side ({lim:g} mm)",
                         "a plate standing further past the flange tips is an outstand of its "
                         "own that is not modelled; use a narrower plate")
    tp, bp = np.array(tp, dtype=float), np.array(bp, dtype=float)

    d0, tf0 = section.d, section.tf
    Ap = bp * tp
    y = d0 / 2 + tp / 2                     # plate centroid from mid-depth
    A = section.A + 2 * Ap
    Ix = section.Ix + 2 * (bp * tp**3 / 12 + Ap * y**2)
    Iy = section.Iy + 2 * tp * bp**3 / 12
    Zx = section.Zx + 2 * Ap * y
    Zy = section.Zy + tp * bp**2 / 2        # two plates, each half at bp/4 from the web axis
    d = d0 + 2 * tp
    J = section.J + 2 * bp * tp**3 / 3
    # centroid of one combined flange (flange plate + cover plate) from mid-depth
    Af = bf * tf0
    yc = (Af * (d0 / 2 - tf0 / 2) + Ap * y) / (Af + Ap)
    ho = 2 * yc
    Cw = (Iy / 2) * ho**2 / 2
    note = _note(tp, bp, how)
    rules = ("cover plates: plate slenderness of the unplated section kept (no credit for the "
             "plates), tf = the thicker of flange and plate, J with the plates as separate "
             "thin rectangles")
    notes = tuple(n for n in section.notes) + (rules, note)
    return replace(
        section, d=d, tf=np.maximum(tf0, tp), A=A,
        tf_as_built=np.maximum(section.tf_nominal, tp),
        tmax_as_built=np.maximum(section.tmax_nominal, tp), Ix=Ix, Iy=Iy, Sx=Ix / (d / 2),
        Sy=Iy / (np.maximum(bf, bp) / 2), Zx=Zx, Zy=Zy, rx=np.sqrt(Ix / A), ry=np.sqrt(Iy / A),
        J=J, Cw=Cw, ho=ho, rolled=False, notes=notes,
        # the unplated ratios, broadcast to the batch shape of the result
        lam_flange=np.broadcast_to(section.lam_flange, A.shape).copy(),
        lam_web=np.broadcast_to(section.lam_web, A.shape).copy(),
        ct_flange=np.broadcast_to(section.ct_flange, A.shape).copy(),
        ct_web=np.broadcast_to(section.ct_web, A.shape).copy(),
        bf=np.broadcast_to(bf, A.shape).copy(), tw=np.broadcast_to(section.tw, A.shape).copy(),
        r=np.broadcast_to(section.r, A.shape).copy(),
    )
