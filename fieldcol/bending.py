"""The moments on a column as it stands, read from its record, and the beam-column check.

Sources (each per axis): moments given with the demand (second order included), beam reactions
bearing at an eccentricity (an end moment at the top), the measured bow beyond the column curve's
allowance (an eccentricity at mid-height) and the measured out-of-plumb of a column free to sway
(P-delta). ``fieldcol.codes.beamcolumn`` checks them together.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, Any, Mapping

import numpy as np

from fieldcol.codes import CodeResult
from fieldcol.record import AXES, ColumnInput
from fieldcol.trace import Trace

if TYPE_CHECKING:  # the beam-column check is imported when a column has moments
    from fieldcol.codes.beamcolumn import BeamColumnResult

#: the eccentricity taken for a beam reaction when none is recorded: the face of the column plus
#: 100 mm (about 4 in) to the centre of bearing of a seated or cap-plate connection
DEFAULT_OFFSET = 100.0
DEFAULT_SOURCE = "common practice (from memory): face of the column + 100 mm; measure it where it matters"


def face_distance(col: ColumnInput, axis: str) -> float:
    """Distance (mm) from the section's centroid to the face a beam bears on, bending ``axis``.

    A beam bending the column about its strong axis bears on a flange (d/2); about the weak
    axis on the web of an I (tw/2) or the side wall of a hollow section (b/2).

    Example:
        >>> from fieldcol.record import parse_record
        >>> c = parse_record({"tag": "C", "section": "W14X90", "material": "A992", "length": "12 ft"})
        >>> round(face_distance(c, "strong"), 1)
        177.8
    """
    s = col.section
    d, bf, tw = (float(np.asarray(getattr(s, k)).reshape(-1)[0]) for k in ("d", "bf", "tw"))
    if axis == "strong":
        return d / 2
    return tw / 2 if s.kind == "i" else bf / 2


def moment_sources(col: ColumnInput, bow_excess: float, trace: Trace,
                   warnings: list[dict[str, str]]) -> dict[str, dict[str, float]]:
    """The moments of the record by source (N*mm for ``given`` and ``ends``, mm for ``bow`` and
    ``sway``), each step in the trace.

    Args:
        col: the parsed record; bow_excess: the bow beyond the curve's allowance (mm, 0 if none).
    Returns:
        ``{"given" | "ends" | "bow" | "sway": {"strong": v, "weak": v}}``.

    Example:
        >>> from fieldcol.record import parse_record
        >>> c = parse_record({"tag": "C", "section": "W14X90", "material": "A992", "length": "12 ft",
        ...     "demand": {"axial": "300 kip", "reactions": [{"load": "40 kip", "axis": "strong"}]}})
        >>> round(moment_sources(c, 0.0, Trace(), [])["ends"]["strong"] / 1e6, 1)
        49.4
    """
    out = {src: {ax: 0.0 for ax in AXES} for src in ("given", "ends", "bow", "sway")}
    dem = col.demand
    if dem is not None:
        for ax, m in dem.moments.items():
            out["given"][ax] = abs(m)
            trace.add(f"Mr_given_{ax}", f"required moment given, {ax} axis (second-order effects included)",
                      "record", abs(m), "N*mm", "record; AISC 360-22 H1")
        total = {ax: 0.0 for ax in AXES}
        for r in dem.reactions:
            if r.eccentricity is None:
                e = face_distance(col, r.axis) + DEFAULT_OFFSET
                trace.add("e_R", f"eccentricity of the reaction at {r.field} ({r.axis} axis), not measured",
                          "face of the column + 100 mm", e, "mm", DEFAULT_SOURCE)
            else:
                e = r.eccentricity
                trace.add("e_R", f"eccentricity of the reaction at {r.field} ({r.axis} axis)", "measured", e, "mm",
                          "record")
            total[r.axis] += r.side * r.load * e
        for ax in AXES:
            if any(r.axis == ax for r in dem.reactions):
                out["ends"][ax] = abs(total[ax])
                trace.add(f"M_end_{ax}", f"first-order moment at the top from the beam reactions, {ax} axis",
                          "|sum side R e| (reactions on opposite sides cancel)", abs(total[ax]), "N*mm",
                          "statics; the reactions' loads are taken as part of the axial demand")
            em = dem.end_moments.get(ax)
            if em is not None:
                top = em.top + abs(total[ax])
                out["ends"][ax] = max(top, em.bottom)
                trace.add(f"M2_{ax}", f"larger first-order end moment, {ax} axis ({em.curvature} curvature)",
                          "max(|M_top|" + (" + reactions" if total[ax] else "") + ", |M_bottom|)",
                          out["ends"][ax], "N*mm", "record; AISC 360-22 App. 8.2.1")
                trace.add(f"M1/M2_{ax}", f"ratio of the end moments, {ax} axis (positive in reverse curvature)",
                          "min / max, signed by the curvature", end_ratio(col)[ax], "", "AISC 360-22 App. 8.2.1")
    if bow_excess > 0:
        out["bow"][col.bow_axis] = bow_excess
    if col.plumb:
        ax = col.plumb_axis
        spec = col.axes[ax]
        sway = not (math.isinf(spec.bottom.translation) and math.isinf(spec.top.translation))
        if sway:
            out["sway"][ax] = col.plumb
            trace.add(f"D_{ax}", f"measured out-of-plumb of a column free to sway ({ax} axis): P-delta",
                      "record", col.plumb, "mm", "AISC 360-22 App. 8.2.2; EN 1993-1-1 5.2.2")
        else:
            trace.add(f"D_{ax}", f"measured out-of-plumb, both ends held against sway ({ax} axis): no moment "
                      "in the column; the bracing takes the horizontal force Pr D / L", "record", col.plumb,
                      "mm", "statics")
    return out


def end_ratio(col: ColumnInput) -> dict[str, float]:
    """M1/M2 per axis (AISC sign: positive in reverse curvature) for Cm = 0.6 - 0.4 M1/M2: from
    ``demand.end_moments`` (the reactions' moment added at the top), else 0 (one end moment).

    Example:
        >>> from fieldcol.record import parse_record
        >>> c = parse_record({"tag": "C", "section": "W14X90", "material": "A992", "length": "12 ft",
        ...     "demand": {"axial": "300 kip", "end_moments": {"strong": {"top": "100 kip*ft",
        ...     "bottom": "50 kip*ft", "curvature": "reverse"}}}})
        >>> end_ratio(c)
        {'strong': 0.5, 'weak': 0.0}
    """
    out = {ax: 0.0 for ax in AXES}
    dem = col.demand
    if dem is None:
        return out
    for ax, em in dem.end_moments.items():
        react = abs(sum(r.side * r.load * (r.eccentricity if r.eccentricity is not None
                                           else face_distance(col, r.axis) + DEFAULT_OFFSET)
                        for r in dem.reactions if r.axis == ax))
        top = em.top + react
        m2, m1 = max(top, em.bottom), min(top, em.bottom)
        out[ax] = 0.0 if m2 == 0 else (m1 / m2) * (1.0 if em.curvature == "reverse" else -1.0)
    return out


def sway_load(col: ColumnInput, demand: float | None, trace: Trace | None = None) -> float | None:
    """The buckling load the sway amplifier divides the column's force by (N): the story's, scaled
    to the column's share of the story's gravity load (AISC 360-22 App. 8.2.2 B2 =
    1/(1 - alpha P_story/Pe_story); EN 1993-1-1 5.2.2 (5)B with alpha_cr = Ncr_story/N_story), or
    None where no story is given (the column alone).

    Pe_story from the story's lateral stiffness: AISC (A-8-7) RM (H/Delta_H) L with RM = 0.85
    (every column in moment frames: the lower, conservative value); EN 5.2.1 (4)B (H/delta) h.

    Example:
        >>> from fieldcol.record import parse_record
        >>> c = parse_record({"tag": "C", "section": "W14X90", "material": "A992", "length": "12 ft",
        ...     "demand": {"axial": "300 kip", "story": {"load": "3000 kip", "buckling_load": "30000 kip"}}})
        >>> round(sway_load(c, 300 * 4448.2216) / 4448.2216)
        3000
    """
    st = col.demand.story if col.demand is not None else None
    if st is None or not demand:
        return None
    if st.buckling_load is not None:
        pe, how, clause = st.buckling_load, "given", "record"
    elif col.code == "en1993-1-1":
        pe, how, clause = st.stiffness * col.length, "(H / delta) h", "EN 1993-1-1 5.2.1 (4)B (5.2)"
    else:
        pe, how, clause = 0.85 * st.stiffness * col.length, "RM (H / Delta_H) L, RM = 0.85 (conservative)", \
            "AISC 360-22 App. 8.2.2 (A-8-7)"
    value = pe * demand / st.load
    if trace is not None:
        trace.add("P_story", "total gravity load of the story", "record", st.load, "N", "record")
        trace.add("Pe_story", "elastic buckling load of the story", how, pe, "N", clause)
        trace.add("Pe_sway", "the story's buckling load per the column's share of its load (sway amplifier)",
                  "Pe_story Pr / P_story", value, "N", "AISC 360-22 App. 8.2.2 (A-8-6); EN 1993-1-1 5.2.2")
    return value


def check_bending(col: ColumnInput, Fy: float, axial: CodeResult, Lc: Mapping[str, float],
                  spans: Mapping[str, float], demand: float | None, bow_excess: float, trace: Trace,
                  warnings: list[dict[str, str]]) -> tuple[BeamColumnResult | None, dict[str, Any]]:
    """The beam-column check of a column with moments from its record, or None when it has
    none beyond a bow (the bow alone is checked by ``codes.check_bow``).

    Returns:
        (the result or None, the moment sources).

    Example:
        >>> from fieldcol.assess import assess
        >>> a = assess({"tag": "C", "section": "W14X99", "material": "A992", "length": "14 ft",
        ...     "demand": {"axial": "400 kip", "moments": {"strong": "250 kip*ft", "weak": "80 kip*ft"}}})
        >>> a.governing_mode, round(a.utilization, 2)
        ('beam-column', 0.92)
    """
    sub = Trace()
    src = moment_sources(col, bow_excess, sub, warnings)
    other = any(v > 0 for s in ("given", "ends", "sway") for v in src[s].values())
    if not other:
        return None, src
    if not demand:
        warnings.append({"code": "moments-without-axial",
                         "message": "moments (or the out-of-plumb of a column free to sway) were recorded "
                                    "without an axial demand: they are not checked; give the demand"})
        return None, src
    trace.extend(sub)
    from fieldcol.codes.beamcolumn import check_beam_column

    sway = None
    if any(v > 0 for v in src["sway"].values()):
        pe = sway_load(col, demand, trace)
        if pe is None:
            trace.add("Pe_sway", "the story's gravity load and stiffness not given: the sway amplifier takes "
                      "the column alone (its own load on its own buckling load)", "", "column alone", "",
                      "AISC 360-22 App. 8.2.2; EN 1993-1-1 5.2.2")
        else:
            sway = {ax: pe for ax in AXES}
    res = check_beam_column(col.code, col.section, Fy, col.material.E, col.material.G, demand, axial,
                            span=dict(spans), Lc=dict(Lc), moments=src,
                            basis="asd" if col.basis == "asd" else "lrfd", gamma_M1=col.gamma_M1,
                            end_ratio=end_ratio(col), sway_Pe=sway, member_length=col.length,
                            holes=col.flange_holes,
                            Fu=None if col.flange_holes is None
                            else float(col.material.fu_at(col.section.tmax_nominal)), built=col.built)
    trace.extend(res.trace)
    for w in res.warnings:
        if bool(np.asarray(w.mask).reshape(-1)[0]):
            warnings.append({"code": w.code, "message": w.message})
    return res, src


__all__ = ["DEFAULT_OFFSET", "check_bending", "end_ratio", "face_distance", "moment_sources", "sway_load"]
