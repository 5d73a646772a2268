"""Section loss: the section that remains after corrosion, from measured thicknesses or a loss.

Conventions (stated in every result's ``notes``):
  * ``flange``, ``web``, ``wall`` are measured REMAINING thicknesses (mm).
  * ``uniform`` is a loss per exposed face (mm), applied to every plate not measured.
  * I shapes: plates are exposed on both faces, so a uniform loss u gives tf - 2u, tw - 2u,
    d - 2u, bf - 2u (flange tips), and a rolled root fillet grows to r + u (the offset of a
    concave arc). A measured flange loss is split equally between its two faces, so the depth
    falls by the loss: d - (tf - tf_remaining); bf is kept.
  * Hollow sections corrode from the outside unless ``from_inside=True``: outside depth, width
    (or diameter) fall by twice the wall loss and the outside corner radius by the wall loss;
    from the inside, the outside dimensions are kept.
The remaining section goes through the same constructors as a new one, so every property and
plate ratio follows (a thinned flange can turn slender). The catalogue designation is kept.
"""

from __future__ import annotations

from dataclasses import replace

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._geometry import S_SLOPE, S_SLOPE_NOTE, i_section, rect_hollow, round_hollow
from fieldcol.sections._section import Section


def _value(x: object, field: str) -> np.ndarray:
    try:
        a = np.asarray(x, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, x, "not a number", "give a thickness in mm") from None
    if not np.all(np.isfinite(a)):
        raise InputError(field, x, "not a finite number", "give a thickness in mm")
    return a


def _remaining(measured: object, nominal: np.ndarray, field: str) -> np.ndarray:
    m = _value(measured, field)
    if np.any(m <= 0):
        raise InputError(field, measured, "a remaining thickness must be greater than zero",
                         "a plate with nothing left cannot be assessed; replace or strengthen it")
    # Above 1.2 x the section's plate it is more likely a typing slip than mill overrun
    # (AISC HSS walls may measure up to 1.1 tnom = 1.18 tdes).
    if np.any(m > 1.2 * nominal + 1e-9):
        raise InputError(field, measured, f"far more than the section's {_fmt(nominal)} mm",
                         "a loss cannot add steel: check the entry or enter the measured section")
    return m


def _fmt(a: np.ndarray) -> str:
    a = np.asarray(a)
    return f"{float(a):g}" if a.ndim == 0 else "per-column"


def _after_loss(t: np.ndarray, loss: np.ndarray, field: str, what: str) -> np.ndarray:
    out = t - loss
    if np.any(out <= 0):
        raise InputError(field, _fmt(loss / (2 if what == "both" else 1)),
                         "the loss consumes the whole plate",
                         "a plate with nothing left cannot be assessed; replace or strengthen it")
    return out


def _note(label: str, value: np.ndarray, how: str, nominal: np.ndarray) -> str:
    v = np.asarray(value)
    above = " (more than the section's plate: measured value used)" if np.any(v > nominal) else ""
    if v.ndim == 0:
        return f"{label} remaining {float(v):.1f} mm {how}{above}"
    return f"{label} remaining {how} (per column){above}"


def with_loss(section: Section, *, flange: object = None, web: object = None, wall: object = None,
              uniform: object = None, from_inside: bool = False) -> Section:
    """The section left after measured or assumed corrosion.

    Args:
        section: the section as built (catalogue or measured).
        flange, web: measured remaining flange / web thickness (mm), I shapes only.
        wall: measured remaining wall thickness (mm), hollow sections only.
        uniform: loss per exposed face (mm), applied to every plate not measured.
        from_inside: hollow sections only: the wall corroded from the inside.
    Returns:
        A new Section with reduced dimensions and properties, the same ``name``, and notes
        such as ``"flange remaining 12.1 mm measured"``.
    Raises:
        InputError: remaining thickness <= 0 or over 1.2 x the section's, a negative loss, a loss
            that consumes a plate, or a plate the section does not have.

    Example:
        >>> from fieldcol.sections import from_catalogue
        >>> s = with_loss(from_catalogue("W14X90"), flange=15.0)
        >>> s.name, s.notes[-1]
        ('W14X90', 'flange remaining 15.0 mm measured')
    """
    if not isinstance(section, Section):
        raise InputError("section", section, "not a Section", "build one with from_catalogue or "
                         "i_section / rect_hollow / round_hollow")
    u = None
    if uniform is not None:
        u = _value(uniform, "uniform")
        if np.any(u < 0):
            raise InputError("uniform", uniform, "a loss cannot be negative",
                             "give the loss per exposed face in mm, or 0")
    notes: list[str] = []
    if section.kind == "i":
        if wall is not None:
            raise InputError("wall", wall, "an I shape has flanges and a web, not a wall",
                             "use flange= and web=")
        if from_inside:
            raise InputError("from_inside", from_inside, "an I shape has no inside",
                             "leave from_inside False")
        d, bf, tf, tw, r = section.d, section.bf, section.tf, section.tw, section.r
        uu = u if u is not None else np.zeros_like(tf)
        if flange is not None:
            tf2 = _remaining(flange, tf, "flange")
            notes.append(_note("flange", tf2, "measured", tf))
        else:
            tf2 = _after_loss(tf, 2 * uu, "uniform", "both")
        if web is not None:
            tw2 = _remaining(web, tw, "web")
            notes.append(_note("web", tw2, "measured", tw))
        else:
            tw2 = _after_loss(tw, 2 * uu, "uniform", "both")
        d2 = d - (tf - tf2)
        bf2 = bf - 2 * uu
        r2 = np.where(r > 0, r + uu, r)
        if u is not None:
            notes.append(f"uniform loss {_fmt(u)} mm per exposed face on unmeasured plates "
                         "(plates exposed both faces)")
        slope = S_SLOPE if S_SLOPE_NOTE in section.notes else 0.0
        new = i_section(d2, bf2, tf2, tw2, r2, rolled=section.rolled, name=section.name,
                        flange_slope=slope)
    else:
        for field, val in (("flange", flange), ("web", web)):
            if val is not None:
                raise InputError(field, val, "a hollow section has walls, not flanges and a web",
                                 "use wall=")
        t = section.tf
        if wall is not None:
            t2 = _remaining(wall, t, "wall")
            notes.append(_note("wall", t2, "measured", t))
        elif u is not None:
            t2 = _after_loss(t, u, "uniform", "one")
            notes.append(f"uniform loss {_fmt(u)} mm on the "
                         f"{'inside' if from_inside else 'outside'} face")
        else:
            t2 = t
        loss = t - t2
        # a wall measured thicker than the design wall keeps the outside size (the extra is inside)
        grow = np.zeros_like(loss) if from_inside else np.maximum(loss, 0.0)
        notes.append("wall loss taken " + ("from the inside: outside dimensions kept"
                                           if from_inside else
                                           "from the outside: outside dimensions reduced"))
        if section.kind == "rect":
            r_out = np.maximum(section.r - grow, 0.0)  # geometry: a corner cannot go below sharp
            new = rect_hollow(section.d - 2 * grow, section.bf - 2 * grow, t2, r_out,
                              rolled=section.rolled, name=section.name)
        else:
            new = round_hollow(section.d - 2 * grow, t2, rolled=section.rolled, name=section.name)
    merged = list(section.notes)
    merged += [n for n in new.notes if n not in merged]
    merged += notes
    return replace(new, notes=tuple(merged), tf_as_built=section.tf_nominal,
                   tmax_as_built=section.tmax_nominal)
