"""The one entry of the engine: a column record in, an Assessment out.

``assess(record)`` reads the record, finds the effective length about each axis (table K,
alignment of braces against their requirement, or an elastic buckling analysis), runs the chosen
code check for every mode, and compares the demand. Everything it did is in the trace.
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any, Mapping

import numpy as np

from fieldcol import CAUTION, __version__
from fieldcol.codes import CodeResult, check_aisc360
from fieldcol.demand import combine
from fieldcol.errors import InputError
from fieldcol.record import AXES, AxisInput, ColumnInput, parse_record, record_and_text
from fieldcol.stability import Brace, brace_requirement, effective_length
from fieldcol.trace import Step, Trace
from fieldcol.units import format_quantity, format_reading

if TYPE_CHECKING:  # bow, beam-column, EN, elastic and the buckling analysis: imported when used
    from fieldcol.codes import BowResult
    from fieldcol.codes.beamcolumn import BeamColumnResult

EDITIONS = {"elastic": "classical elastic stability", "aisc360-22": "ANSI/AISC 360-22",
            "en1993-1-1": "EN 1993-1-1:2005+A1:2014"}
_EI_AXIS = {"strong": "Ix", "weak": "Iy"}

#: The one table of words for each governing mode, for the app and the report.
MODE_WORDS = {
    "flexural-strong": "flexural buckling, strong axis",
    "flexural-weak": "flexural buckling, weak axis",
    "torsional": "torsional buckling",
    "yield": "yielding (squash load)",
    "bow": "measured bow (beam-column)",
    "beam-column": "axial force with bending (beam-column interaction)",
    "section-band": "the section where steel was lost (loss band)",
    "tie-joint": "the end rivets or bolts of the lacing or battens",
}


@dataclass(frozen=True)
class AxisLength:
    """Effective length about one axis and how it was found."""

    Lc: float                        # mm
    K: float                         # relative to the governing segment (analysis: full length)
    segment: float                   # mm, the length K applies to
    method: str                      # "theoretical" | "recommended" | "analysis" | "override"
    braces_used: tuple[int, ...]     # indices of the braces counted
    shape: tuple[np.ndarray, np.ndarray] | None = None   # (z mm, w) buckled shape for a sketch


@dataclass
class Assessment:
    """The result of checking one column record.

    Fields: ``column`` (the parsed input), ``result`` (the code check, a batch of one),
    ``lengths`` (strong, weak, twist), ``demand`` (N or None), ``demand_name`` (the governing
    combination or "given"), ``utilization`` (demand / design strength, or None), ``warnings``
    (plain sentences), ``trace`` (every step, restraints first, then the code check).
    """

    column: ColumnInput
    result: CodeResult
    lengths: dict[str, AxisLength]
    demand: float | None
    demand_name: str | None
    utilization: float | None
    warnings: list[dict[str, str]] = field(default_factory=list)
    trace: Trace = field(default_factory=Trace)
    record: dict[str, Any] = field(default_factory=dict)
    bow: BowResult | None = None
    beam: BeamColumnResult | None = None
    band: Any = None                 # fieldcol.band.BandResult when the record has a loss band
    knowledge: float = 1.0
    spans: dict[str, float] = field(default_factory=dict)      # mm between points held, per axis
    sources: dict[str, Any] = field(default_factory=dict)      # moments by source (bending.py)

    def capacities(self) -> dict[str, float]:
        """The capacity (N, before the knowledge factor) of every check that applies, by mode:
        the governing axial mode, ``bow``, ``beam-column`` and ``section-band``.

        Example:
            >>> a = assess({"tag": "C1", "section": "W14X90", "material": "A992", "length": "30 ft"})
            >>> list(a.capacities())
            ['flexural-weak']
        """
        out = {str(np.asarray(self.result.governing).reshape(-1)[0]): _first(self.result.design)}
        if self.bow is not None and math.isfinite(_first(self.bow.capacity)):
            out["bow"] = _first(self.bow.capacity)
        if self.beam is not None:
            out["beam-column"] = _first(self.beam.capacity)
        if self.band is not None:
            out["section-band"] = float(self.band.capacity)
        return out

    @property
    def bow_governs(self) -> bool:
        """True when the measured bow (as a beam-column) lowers the capacity below the axial one."""
        if self.bow is None:
            return False
        cap = _first(self.bow.capacity)
        return math.isfinite(cap) and cap < _first(self.result.design)

    @property
    def bow_unchecked(self) -> bool:
        """True when a bow beyond the curve's allowance was measured but the code gives no
        beam-column capacity."""
        return (self.bow is not None and _first(self.bow.excess) > 0
                and not math.isfinite(_first(self.bow.capacity)))

    @property
    def governing_mode(self) -> str:
        """``flexural-strong``, ``flexural-weak``, ``torsional``, ``yield``, ``bow``,
        ``beam-column`` or ``section-band`` (words for each in ``MODE_WORDS``)."""
        caps = self.capacities()
        for name in ("beam-column", "section-band"):
            if name in caps and math.isnan(caps[name]):   # a check the code does not cover
                return name
        mode = next(iter(caps))
        for name, cap in caps.items():
            if cap < caps[mode]:
                mode = name
        return mode

    @property
    def governing_words(self) -> str:
        """The governing mode in words (``MODE_WORDS``)."""
        return MODE_WORDS.get(self.governing_mode, self.governing_mode)

    @property
    def design_strength(self) -> float:
        """The design (or allowable) axial strength, N: the lowest of the axial modes, the bow,
        the beam-column check and the loss band (each with the moments in proportion to the
        axial force), times the knowledge factor."""
        return self.knowledge * self.capacities()[self.governing_mode]

    @property
    def nominal_strength(self) -> float:
        return float(np.asarray(self.result.nominal).reshape(-1)[0])

    def to_dict(self) -> dict[str, Any]:
        """The documented JSON form: every quantity as ``{"value": ..., "unit": ...}``.

        Example:
            >>> a = assess({"tag": "C1", "section": "W14X90", "material": "A992",
            ...             "length": "30 ft"})
            >>> a.to_dict()["governing_mode"], a.to_dict()["design_strength"]["unit"]
            ('flexural-weak', 'N')
        """
        c, s, r = self.column, self.column.section, self.result
        one = _first
        modes = {}
        for name, m in r.modes.items():
            modes[name] = {
                "effective_length": _q(m.Lc, "mm"),
                "slenderness": _q(m.slenderness, ""),
                "elastic_critical_load": _q(m.Pe, "N"),
                "critical_stress": _q(m.Fcr, "MPa"),
                "nominal_strength": _q(m.Pn, "N"),
                "applies": m.applies,
            }
        return {
            "tag": c.tag,
            "code": c.code,
            "edition": EDITIONS[c.code],
            "basis": c.basis,
            "k_basis": c.k_basis,
            "app_version": __version__,
            "governing_mode": self.governing_mode,
            "nominal_strength": _q(r.nominal, "N"),
            "design_strength": _q(self.design_strength, "N"),
            "axial_design_strength": _q(r.design, "N"),
            "governing_words": self.governing_words,
            "knowledge_factor": _q(self.knowledge, ""),
            "beam_column": None if self.beam is None else {
                "equation": str(np.asarray(self.beam.equation).reshape(-1)[0]),
                "interaction": _q(self.beam.ratio, ""), "capacity": _q(self.beam.capacity, "N"),
                "flexural_strength": {ax: _q(m, "N*mm") for ax, m in self.beam.Mc.items()},
                "required_moment": {ax: _q(m, "N*mm") for ax, m in self.beam.Mr.items()}},
            "section_band": None if self.band is None else {
                "from": _q(self.column.band.start, "mm"), "to": _q(self.column.band.end, "mm"),
                "section_strength": _q(self.band.section_strength if self.band.section_strength is not None
                                       else self.band.axial.design, "N"),
                "capacity": _q(self.band.capacity, "N"), "equation": self.band.equation,
                "interaction": None if self.band.ratio is None else _q(self.band.ratio, ""),
                "stiffness_factor": {ax: _q(f, "") for ax, f in self.band.factors.items()}},
            "bow": None if self.bow is None else {
                "axis": self.bow.axis, "excess": _q(self.bow.excess, "mm"),
                "allowance": f"L/{c.bow_allowance:g}",
                "flexural_strength": _q(self.bow.Mc, "N*mm"),
                "capacity": _q(self.bow.capacity, "N"),
                "interaction": None if self.bow.ratio is None else _q(self.bow.ratio, "")},
            "demand": None if self.demand is None else {**_q(self.demand, "N"),
                                                        "combination": self.demand_name},
            "utilization": None if self.utilization is None else _q(self.utilization, ""),
            "status": self.status,
            "section": {
                "name": s.name, "kind": s.kind, "rolled": s.rolled, "notes": list(s.notes),
                "built": None if c.built is None else c.built.arrangement,
                **{k: _q(getattr(s, k), u) for k, u in (
                    ("A", "mm^2"), ("Ix", "mm^4"), ("Iy", "mm^4"), ("rx", "mm"), ("ry", "mm"),
                    ("J", "mm^4"), ("Cw", "mm^6"), ("d", "mm"), ("bf", "mm"), ("tf", "mm"),
                    ("tw", "mm"))},
            },
            "material": {"name": c.material.name, "tested": c.material.tested,
                         "historic": c.material.historic,
                         "Fy": _q(one(self._fy), "MPa"), "E": _q(c.material.E, "MPa"),
                         "G": _q(c.material.G, "MPa")},
            "lengths": {ax: {"effective_length": _q(L.Lc, "mm"), "K": _q(L.K, ""),
                             "segment": _q(L.segment, "mm"), "method": L.method,
                             "braces_counted": list(L.braces_used)}
                        for ax, L in self.lengths.items()},
            "modes": modes,
            "steps": [_step(st) for st in self.trace.steps],
            "warnings": self.warnings,
            "input": self.record,
            "caution": CAUTION,
        }

    @property
    def status(self) -> str:
        """``"ok"`` (utilization <= 1), ``"over"`` (> 1), ``"no-demand"``, or ``"not-covered"``
        where the code gives no strength for this column (see the warnings)."""
        if not math.isfinite(self.design_strength) or self.bow_unchecked:
            return "not-covered"
        if self.utilization is None:
            return "no-demand"
        return "ok" if self.utilization <= 1.0 else "over"

    @property
    def _fy(self) -> float:
        return float(self.column.material.fy_at(self.column.section.tmax_nominal))


def assess(record: Mapping[str, Any]) -> Assessment:
    """Check one column record.

    Args:
        record: the column record (JSON object; see README "Column record").

    Returns:
        Assessment with every mode, the governing one, the utilization and the trace.

    Raises:
        InputError: naming the field that cannot be used (including mechanisms).

    Example:
        >>> a = assess({"tag": "B/4-L1", "section": "W14X90", "material": "A992",
        ...             "length": "30 ft", "code": "aisc360-22",
        ...             "demand": {"axial": "840 kip", "basis": "lrfd"}})
        >>> a.governing_mode
        'flexural-weak'
    """
    col, text = record_and_text(record)
    trace = Trace()
    warnings: list[dict[str, str]] = []
    sec, mat = col.section, col.material
    Fy = float(mat.fy_at(sec.tmax_nominal))
    trace.add("L", "column length between end restraints", "measured", col.length, "mm", "record")
    trace.add("Fy", f"yield stress, {mat.name}" + (" (coupon tests)" if mat.tested else ""),
              "grade table by thickness" if not mat.tested else "tested", Fy, "MPa", mat.source)
    trace.add("E", "elastic modulus", col.moduli, mat.E, "MPa", _MODULI_CLAUSE.get(col.code, mat.source))
    trace.add("G", "shear modulus", col.moduli, mat.G, "MPa", _MODULI_CLAUSE.get(col.code, mat.source))
    if mat.historic and not mat.tested:
        warnings.append({"code": "historic-grade",
                         "message": f"{mat.name} is a historic grade: confirm the yield stress by "
                                    "coupon tests before relying on this check"})
    if sec.kind in ("rect", "round") and col.built is None:
        spec = record.get("section")
        how = (" (as recorded)" if isinstance(spec, Mapping) and "finish" in spec
               else " (the catalogue row)" if isinstance(spec, str) or "name" in spec
               else " (not recorded: cold-formed taken, the lower curve)")
        trace.add("finish", "hollow section: " + ("hot-finished" if sec.rolled else "cold-formed") + how,
                  "curve a (hot-finished) or c (cold-formed) under EN; AISC E3 makes no difference",
                  "hot-finished" if sec.rolled else "cold-formed", "", "EN 1993-1-1 Table 6.2")
    for note in sec.notes:
        trace.add("section", "how the section was obtained", "", note, "", "record")

    demand, demand_name = None, None
    if col.demand is not None:
        if col.demand.axial is not None:
            demand, demand_name = col.demand.axial, "given"
            trace.add("Pr", "required axial strength (given)", "record", demand, "N", "record")
        else:
            comb = combine(col.demand.loads, col.demand.basis, trace, col.demand.psi0)
            demand, demand_name = comb.axial, comb.name
            trace.add("Pr", f"required axial strength, governing: {comb.name}", "max", demand,
                      "N", comb.clause)

    def run(lengths: dict[str, AxisLength], tr: Trace | None) -> CodeResult:
        res = _code_check(col, Fy, lengths)
        if tr is not None:
            tr.extend(res.trace)
        return res

    twist = _twist_length(col)
    if demand is not None:
        Pr = demand  # the braces must hold the demand
    else:
        # no demand: a first pass with every brace counted as given finds the braced design
        # strength, which the braces must then hold (skipped with a demand: half the check)
        every = {ax: tuple((i, b.stiffness) for i, b in enumerate(col.axes[ax].braces))
                 for ax in AXES}
        first = {ax: _axis_length(col, ax, col.axes[ax], every[ax], Trace()) for ax in AXES}
        first["twist"] = twist
        Pr = _first(run(first, None).design)
    counted = {ax: _qualify(col, ax, col.axes[ax], Pr, demand is not None, trace, warnings)
               for ax in AXES}
    _assumed_rigid(col, counted, warnings)
    lengths = {ax: _axis_length(col, ax, col.axes[ax], counted[ax].model, trace) for ax in AXES}
    trace.add("Lcz", "torsional buckling length: longest length between twist restraints "
              "(K_z = 2 next to an end free to twist)", "max K_z,i L_i", twist.Lc, "mm",
              "common practice")
    lengths["twist"] = twist
    factors: dict[str, float] = {}
    if col.band is not None:
        from fieldcol.band import member_factors

        factors = member_factors(col, {ax: counted[ax].model for ax in AXES}, trace)
        for ax in AXES:
            L0, f = lengths[ax], factors[ax]
            lengths[ax] = AxisLength(L0.Lc / math.sqrt(f), L0.K / math.sqrt(f), L0.segment, L0.method,
                                     L0.braces_used, L0.shape)
            trace.add(f"Lc_{ax}", f"effective length with the loss band, {ax} axis (section as built)",
                      "Lc / sqrt(f_band)", lengths[ax].Lc, "mm", "elastic stability (conservative)")
    result = run(lengths, trace)
    for w in result.warnings:
        if bool(np.asarray(w.mask).reshape(-1)[0]):
            warnings.append({"code": w.code, "message": w.message})
    design = _first(result.design)
    spans = {ax: _longest_span(col.length, counted[ax].qualified) for ax in AXES}
    bow = _bow(col, Fy, lengths, spans, result, demand, trace, warnings)
    from fieldcol.bending import check_bending

    excess = _first(bow.excess) if bow is not None and math.isfinite(_first(bow.capacity)) else 0.0
    beam, sources = check_bending(col, Fy, result, {ax: lengths[ax].Lc for ax in (*AXES, "twist")},
                                  spans, demand, excess, trace, warnings)
    band = None
    if col.band is not None:
        from fieldcol.band import check_band

        band = check_band(col, Fy, lambda sec, fy, *Lc: _code_check(col, fy, dict(zip(
            ("strong", "weak", "twist"), (AxisLength(x, 1.0, x, "band", ()) for x in Lc))), sec),
            result, lengths["twist"].Lc, demand, sources, trace, warnings, factors)
    kappa = col.knowledge
    _appendix5(col, trace)
    if col.code == "elastic":
        warnings.append({"code": "reference-only",
                         "message": "classical elastic buckling and yielding: no resistance "
                                    "factor and no allowance for imperfections; a reference, "
                                    "not a design check"})
    utilization = None
    if demand is not None and math.isfinite(design) and not (
            bow is not None and _first(bow.excess) > 0 and not math.isfinite(_first(bow.capacity))):
        # where the code gives no strength (NaN) there is no utilization, only the warning
        utilization = demand / design if design > 0 else math.inf
        trace.add("U", "utilization, axial",
                  "N_Ed / N_b,Rd" if col.code == "en1993-1-1" else "Pr / design strength",
                  utilization, "",
                  EDITIONS[col.code])
        if bow is not None and bow.ratio is not None and _first(bow.ratio) > utilization:
            utilization = _first(bow.ratio)
            trace.add("U", "utilization with the bow (beam-column interaction governs)",
                      "interaction ratio", utilization, "", EDITIONS[col.code])
        if beam is not None:
            r = _first(beam.ratio)
            if not math.isfinite(r) or r > utilization:
                utilization = r if math.isfinite(r) else None
                trace.add("U", "utilization with bending (beam-column interaction governs)",
                          "interaction ratio, " + str(np.asarray(beam.equation).reshape(-1)[0]),
                          r, "", EDITIONS[col.code])
        if band is not None and band.ratio is not None and utilization is not None \
                and band.ratio > utilization:
            utilization = band.ratio
            trace.add("U", "utilization in the loss band (the section there governs)",
                      "interaction in the band", utilization, "", band.equation)
        if utilization is not None and kappa != 1.0:
            utilization = utilization / kappa
            trace.add("U", "utilization with the knowledge factor", "U / kappa", utilization, "",
                      "knowledge factor of existing-building assessment practice")
    _condition_warnings(col, warnings)
    return Assessment(col, result, lengths, demand, demand_name, utilization, warnings, trace,
                      json.loads(json.dumps(record) if text is None else text), bow, beam, band,
                      kappa, spans, sources)


_MODULI_CLAUSE = {"aisc360-22": "AISC 360-22 Symbols (E, G)", "en1993-1-1": "EN 1993-1-1 3.2.6"}
_APP5 = ("AISC 360-22 App. 5.2", "AISC 360-22 App. 5.2; EN 1993-1-1 gives no rule for existing "
         "structures, common practice")


def _appendix5(col: ColumnInput, trace: Trace) -> None:
    """AISC 360-22 Appendix 5 (evaluation of existing structures): where the material properties
    come from, and the knowledge factor applied to every capacity."""
    mat = col.material
    trace.add("basis", "evaluation of an existing structure: material properties "
              + ("from coupon tests" if mat.tested else "from the documents or the grade of the era (no tests)"),
              "", "tested" if mat.tested else "documents", "", _APP5[col.code == "en1993-1-1"])
    trace.add("kappa", f"knowledge factor ({col.knowledge_label}): multiplies every capacity, divides the "
              "utilization", "minimum 0.75, usual 1.0, comprehensive 1.0, or as given", col.knowledge, "",
              "existing-building assessment practice (ASCE 41 data collection levels; from memory)")


def _bow(col: ColumnInput, Fy: float, lengths: Mapping[str, AxisLength],
         spans: Mapping[str, float], axial: CodeResult, demand: float | None, trace: Trace,
         warnings: list[dict[str, str]]) -> BowResult | None:
    """The measured bow as a beam-column check over the length it was measured on: as recorded
    (``bow_over``), else the longest span between the braces that hold the column about that axis."""
    if col.bow is None:
        return None
    L = col.bow_over if col.bow_over is not None else spans[col.bow_axis]
    trace.add("L_bow", f"length over which the bow acts ({col.bow_axis} axis)",
              "as recorded" if col.bow_over is not None else "longest span between counted braces",
              L, "mm", "record")
    from fieldcol.codes.bow import check_bow

    res = check_bow(col.code, col.section, Fy, col.material.E, col.material.G, L,
                    lengths["strong"].Lc, lengths["weak"].Lc, lengths["twist"].Lc, col.bow,
                    col.bow_axis, basis="asd" if col.basis == "asd" else "lrfd",
                    gamma_M1=col.gamma_M1, Pr=demand, axial=axial, allowance=col.bow_allowance,
                    holes=col.flange_holes, Fu=None if col.flange_holes is None
                    else float(col.material.fu_at(col.section.tmax_nominal)))
    if col.built is not None and col.built.open_axis(col.bow_axis) is not None:
        # the chords of a laced or battened column bend apart: the I-shape beam-column rules
        # do not apply; a bow beyond the curve's allowance is left unchecked (not-covered)
        res.capacity = np.where(np.asarray(res.excess) > 0, np.nan, res.capacity)
        res.ratio = None
    trace.extend(res.trace)
    for w in res.warnings:
        if bool(np.asarray(w.mask).reshape(-1)[0]):
            warnings.append({"code": w.code, "message": w.message})
    excess = _first(res.excess)
    n = col.bow_allowance
    if excess > 0 and not math.isfinite(_first(res.capacity)):
        warnings.append({
            "code": "bow-not-checked",
            "message": f"measured bow {_show(col, col.bow)} exceeds L/{n:g} = {_show(col, L / n)}, but the "
                       "code's flexural rules do not cover this section: the bow is NOT accounted "
                       "for; no strength is given",
        })
    elif excess > 0:
        warnings.append({
            "code": "bow-over-tolerance",
            "message": f"measured bow {_show(col, col.bow)} exceeds L/{n:g} = {_show(col, L / n)}, the "
                       "out-of-straightness the column curve allows for: the excess "
                       f"{_show(col, excess)} is checked as an eccentricity (beam-column interaction)",
        })
    return res


def _code_check(col: ColumnInput, Fy: float, L: Mapping[str, AxisLength],
                section: Any = None) -> CodeResult:
    mat = col.material
    sec = col.section if section is None else section
    args = (sec, Fy, mat.E, mat.G, L["strong"].Lc, L["weak"].Lc, L["twist"].Lc)
    if col.built is not None:
        from fieldcol.codes.builtup import check_builtup
        return check_builtup(col.code, col.built, *args[1:], basis=col.basis,
                             gamma_M1=col.gamma_M1,
                             Fu=float(mat.fu_at(sec.tmax_nominal)))
    if col.plate_joint is not None:
        from fieldcol.codes.coverplates import check_riveted_plates
        return check_riveted_plates(col.code, col.plate_joint, *args, basis=col.basis,
                                    gamma_M1=col.gamma_M1,
                                    high_strength=mat.key.upper() == "S460")
    if col.code == "aisc360-22":
        return check_aisc360(*args, basis=col.basis)
    if col.code == "en1993-1-1":
        from fieldcol.codes.en1993 import check_en1993

        return check_en1993(*args, gamma_M1=col.gamma_M1, high_strength=mat.key.upper() == "S460")
    from fieldcol.codes.elastic import check_elastic

    return check_elastic(*args)


def _axis_length(col: ColumnInput, ax: str, spec: AxisInput,
                 model: tuple[tuple[int, float], ...], trace: Trace) -> AxisLength:
    """Effective length about one axis with the braces in ``model`` ((index, stiffness) pairs)."""
    fld = f"restraints.{ax}"
    idx = tuple(i for i, _ in model)
    braces = [Brace(spec.braces[i].at, k) for i, k in model]
    if spec.k is not None:
        cuts = sorted({0.0, col.length, *(b.at for b in braces)})
        seg = max(b - a for a, b in zip(cuts[:-1], cuts[1:]))
        trace.add(f"K_{ax}", f"effective length factor, {ax} axis (engineer's override)",
                  "given", spec.k, "", "record")
        trace.add(f"Lc_{ax}", f"effective length, {ax} axis", "K x longest braced length",
                  spec.k * seg, "mm", "record")
        return AxisLength(spec.k * seg, spec.k, seg, "override", idx)
    if spec.alignment is not None:
        if spec.braces:
            raise InputError(f"{fld}.alignment", "alignment with braces",
                             "the alignment-chart K is for a column between two joints, not for "
                             "lengths between braces",
                             "use k_basis 'analysis' with partial end springs, or remove the braces")
        Ga, Gb, sway = spec.alignment
        from fieldcol.stability import k_alignment

        k = float(k_alignment(Ga, Gb, sway, field=f"{fld}.alignment"))
        cuts = sorted({0.0, col.length, *(b.at for b in braces)})
        seg = max(b - a for a, b in zip(cuts[:-1], cuts[1:]))
        trace.add(f"K_{ax}", f"effective length factor, {ax} axis, alignment chart "
                  f"(Ga {Ga:g}, Gb {Gb:g}, {'sway' if sway else 'braced'})",
                  "alignment-chart equation solved exactly", k, "",
                  "AISC 360-22 Commentary App. 7")
        trace.add(f"Lc_{ax}", f"effective length, {ax} axis", "K x longest braced length",
                  k * seg, "mm", "AISC 360-22 Commentary App. 7")
        return AxisLength(k * seg, k, seg, "alignment", idx)
    EI = col.material.E * float(np.asarray(getattr(col.section, _EI_AXIS[ax])).reshape(-1)[0])
    if col.k_basis == "analysis":
        from fieldcol.stability import buckling_analysis

        res = buckling_analysis(col.length, EI, spec.bottom, spec.top, braces, field=fld)
        trace.add(f"Pcr_{ax}", f"elastic buckling load of the whole column, {ax} axis",
                  "finite-element eigenvalue (cubic beam elements)", float(res.Pcr), "N",
                  "elastic stability")
        trace.add(f"K_{ax}", f"effective length factor, {ax} axis", "pi sqrt(EI / Pcr) / L",
                  float(res.K), "", "elastic stability")
        trace.add(f"Lc_{ax}", f"effective length, {ax} axis", "K L", float(res.K) * col.length,
                  "mm", "elastic stability")
        return AxisLength(float(res.K) * col.length, float(res.K), col.length, "analysis", idx,
                          (np.asarray(res.z), np.asarray(res.shape)))
    key = (col.length, spec.bottom, spec.top, tuple(braces), col.k_basis, ax)
    known = _TABLE_LENGTHS.get(key)
    if known is None:
        sub = Trace()
        eff = effective_length(col.length, spec.bottom, spec.top, braces, col.k_basis, fld,
                               assume_rigid=True, trace=sub)
        steps = tuple(Step(f"{st.symbol}_{ax}", f"{st.what}, {ax} axis", st.formula, st.value,
                           st.unit, st.clause) for st in sub.steps)
        known = (eff.Lc, eff.K, max(eff.segments, key=lambda s: s.Lc).length, steps)
        if len(_TABLE_LENGTHS) >= 1024:
            _TABLE_LENGTHS.clear()
        _TABLE_LENGTHS[key] = known
    trace.steps.extend(known[3])
    return AxisLength(known[0], known[1], known[2], col.k_basis, idx)


#: a table effective length and its steps (frozen: shared) by length, ends, rigid braces,
#: basis and axis: the same column checked again, or its twin on the next floor, reads the
#: tables once
_TABLE_LENGTHS: dict[tuple, tuple[float, float, float, tuple[Step, ...]]] = {}


@dataclass(frozen=True)
class _Counted:
    """The braces of one axis after the Appendix 6.2 check."""

    model: tuple[tuple[int, float], ...]   # (index, stiffness used) for the effective length
    qualified: tuple[float, ...]           # positions of braces that hold the column (bow spans)


def _qualify(col: ColumnInput, ax: str, spec: AxisInput, Pr: float, given: bool, trace: Trace,
             warnings: list[dict[str, str]]) -> _Counted:
    """Which braces count: each must meet AISC 360-22 Appendix 6.2 stiffness and strength.

    EN 1993-1-1 gives no point-brace rule for columns; the same criterion is used for every code
    (common practice). Without a demand the brace must hold the strength the braced column
    claims (its design strength). Lbr is the shorter adjacent unbraced length (conservative).
    A brace short of strength, or a single tension-only cable, never counts. For the table K a
    brace short of stiffness does not count; the buckling analysis takes every finite brace at
    phi k / 2 (LRFD and EN) or k / (2 Omega) (ASD): Appendix 6.2 asks for twice the ideal
    stiffness divided by phi, so a brace that just qualifies reaches the braced load there.
    """
    if not spec.braces:
        return _Counted((), ())
    basis = "asd" if col.basis == "asd" else "lrfd"
    analysis = col.k_basis == "analysis"
    reduce = {"lrfd": 0.75 / 2, "asd": 1 / (2 * 2.0)}[basis] if col.code != "elastic" else 1.0
    rule = _brace_rule(col)
    P = "N_Ed" if col.code == "en1993-1-1" else "Pr"
    cuts = sorted({0.0, col.length, *(b.at for b in spec.braces)})
    model, qualified = [], []
    for i, b in enumerate(spec.braces):
        j = cuts.index(b.at)
        adj = [cuts[j] - cuts[j - 1]] if j > 0 else []
        if j + 1 < len(cuts):
            adj.append(cuts[j + 1] - cuts[j])
        Lbr = min(adj)
        Pbr, beta = (float(v) for v in brace_requirement(Pr, Lbr, basis, field=b.field))
        what = "the demand" if given else "the braced design strength"
        where = f"brace at {_show(col, b.at)}, {ax} axis"
        trace.add("beta_br", f"stiffness the {where} needs ({P} = {what}); given: "
                  + (_show(col, b.stiffness, "stiffness") if b.stiffness_given else "not recorded"),
                  f"(1/phi or Omega) 8 {P} / Lbr", beta, "N/mm", rule)
        trace.add("P_br", f"strength the {where} needs; given: "
                  + (_show(col, b.strength, "force") if b.strength is not None else "not recorded"),
                  f"0.01 {P}", Pbr, "N", rule)
        ok_k = b.stiffness >= beta
        ok_p = b.strength is None or b.strength >= Pbr
        if b.one_way:
            warnings.append({"code": "brace-one-way",
                             "message": f"The cable at {_show(col, b.at)} ({ax} axis) is not counted: "
                                        "a single cable pulls one way only and cannot hold the "
                                        "column the other way. If it has a partner cable on the "
                                        "other side, or is pretensioned, record that."})
            continue
        if ok_k and ok_p:
            qualified.append(b.at)
        if ok_p and (ok_k or analysis):
            k_used = b.stiffness * reduce if analysis and math.isfinite(b.stiffness) else b.stiffness
            model.append((i, k_used))
            if analysis and math.isfinite(b.stiffness):
                trace.add("k_br", f"stiffness of the {where} used in the buckling analysis",
                          "phi k / 2 (ASD: k / (2 Omega))" if reduce < 1 else "k",
                          k_used, "N/mm", f"{rule} (twice the ideal stiffness)")
            if ok_k:
                continue
        why = []
        if not ok_k:
            why.append(f"it gives {_show(col, b.stiffness, 'stiffness')} of stiffness and needs "
                       f"{_show(col, beta, 'stiffness')}")
        if not ok_p:
            why.append(f"it is good for {_show(col, b.strength, 'force')} and needs "
                       f"{_show(col, Pbr, 'force')}")
        kept = analysis and ok_p
        warnings.append({
            "code": "brace-not-qualified",
            "message": f"The brace at {_show(col, b.at)} ({ax} axis) does not qualify: "
                       f"{' and '.join(why)} ({rule}). "
                       + ("It stays in the buckling analysis at its own, lower stiffness only."
                          if kept else "It is not counted as a brace point."),
        })
    return _Counted(tuple(model), tuple(qualified))


def _brace_rule(col: ColumnInput) -> str:
    """The clause the brace requirement comes from, as this check should cite it."""
    if col.code == "en1993-1-1":
        return ("AISC 360-22 App. 6.2; EN 1993-1-1 gives no stiffness rule for a column brace "
                "point, common practice")
    return "AISC 360-22 App. 6.2"


def _assumed_rigid(col: ColumnInput, counted: Mapping[str, _Counted],
                   warnings: list[dict[str, str]]) -> None:
    """Say which counted braces were taken as rigid or strong enough without a recorded value.

    Braces left out of the check are not named here: saying a brace was both left out and
    taken as rigid would contradict the warning that left it out.
    """
    for ax in AXES:
        for i, _k in counted[ax].model:
            b = col.axes[ax].braces[i]
            taken = [w for w, gap in (("rigid", not b.stiffness_given),
                                      ("strong enough", b.strength is None)) if gap]
            if not taken:
                continue
            missing = [w for w, gap in (("stiffness", not b.stiffness_given),
                                        ("strength", b.strength is None)) if gap]
            warnings.append({
                "code": "brace-assumed",
                "message": f"The brace at {_show(col, b.at)} ({ax} axis) has no "
                           f"{' or '.join(missing)} recorded: it is taken as "
                           f"{' and '.join(taken)}. Confirm it on site against what the trace "
                           f"shows it needs ({_brace_rule(col)}).",
            })


def _twist_length(col: ColumnInput) -> AxisLength:
    """Lcz: the longest length between twist restraints, K_z = 1 between restraints and 2 next
    to an end free to twist (common practice, as for a cantilever)."""
    tw = col.twist
    cuts = sorted({0.0, col.length, *tw.braces})
    if not (tw.bottom_held or tw.top_held or tw.braces):
        raise InputError("restraints.twist", "free at both ends",
                         "nothing prevents the column from twisting (a mechanism)",
                         "hold one end against twisting or add a twist restraint")
    best = (0.0, 1.0, 0.0)
    for a, b in zip(cuts[:-1], cuts[1:]):
        k = 2.0 if (a == 0.0 and not tw.bottom_held) or (b == col.length and not tw.top_held) else 1.0
        if k * (b - a) > best[0]:
            best = (k * (b - a), k, b - a)
    return AxisLength(best[0], best[1], best[2], "common practice K_z", tuple(range(len(tw.braces))))


def _longest_span(length: float, at: tuple[float, ...]) -> float:
    cuts = sorted({0.0, length, *at})
    return max(b - a for a, b in zip(cuts[:-1], cuts[1:]))


#: lengths outside this range (mm: 1 ft to 100 ft) are more likely a slip of the unit than a column
PLAUSIBLE_LENGTH = (304.8, 30480.0)


def _condition_warnings(col: ColumnInput, warnings: list[dict[str, str]]) -> None:
    L = col.length
    lo, hi = PLAUSIBLE_LENGTH
    if not lo * (1 - 1e-9) <= L <= hi * (1 + 1e-9):   # the limits themselves are plausible
        warnings.append({
            "code": "length-implausible",
            "message": f"the length {_show(col, L)} is {'under 1 ft' if L < lo else 'over 100 ft'} "
                       f"({_show(col, lo if L < lo else hi)}): check the entry and its unit "
                       "(plausibility, common practice)"})
    notes = list(col.section.notes) + (list(col.band.section.notes) if col.band is not None else [])
    for note in notes:
        if "more than the section's plate" in note:
            warnings.append({
                "code": "thickness-above-nominal",
                "message": f"a {note.split(' remaining')[0]} thickness reading is above the section's nominal plate: "
                           "mill overrun is possible, but check the reading, the gauge and the "
                           "section's name; the reading is used as measured"})
    if col.plumb is not None and col.plumb > L / 500:
        spec = col.axes[col.plumb_axis]
        sway = not (math.isinf(spec.bottom.translation) and math.isinf(spec.top.translation))
        story = col.demand is not None and col.demand.story is not None
        then = ("checked here as P-delta with the story's gravity load and buckling load as recorded"
                if sway and story else
                "checked here as P-delta with the column's own buckling load (the story not recorded: "
                "give demand.story, or include the story's other columns in the frame analysis)"
                if sway and col.demand is not None else "include the sway effect in the frame analysis")
        warnings.append({
            "code": "plumb-over-tolerance",
            "message": f"measured out-of-plumb {_show(col, col.plumb)} exceeds L/500 = {_show(col, L / 500)} "
                       f"(AISC 303 erection tolerance): {then}",
        })


def _show(col: ColumnInput, value: float, kind: str = "length") -> str:
    """A value in the record's display units, for messages the engineer reads (a short length
    as ``units.format_reading`` writes a reading everywhere: a bow as recorded, ``1 1/8 in``;
    its allowance and excess, worked out, to 0.001 in)."""
    if kind == "length":
        return format_reading(value, col.units)
    return format_quantity(value, kind, col.units)


def _first(v: Any) -> float:
    return float(np.asarray(v, dtype=float).reshape(-1)[0])


def _q(v: Any, unit: str) -> dict[str, Any] | None:
    if v is None:
        return None
    x = _first(v)
    return {"value": x if math.isfinite(x) else None, "unit": unit}


def _step(st: Step) -> dict[str, Any]:
    v = st.value
    try:
        v = _first(v)
        v = v if math.isfinite(v) else None
    except (TypeError, ValueError):  # words (a curve letter): one column's, not the batch's
        arr = np.asarray(v)
        v = str(arr.reshape(-1)[0]) if arr.size == 1 else str(v)
    return {"symbol": st.symbol, "what": st.what, "formula": st.formula, "value": v,
            "unit": st.unit, "clause": st.clause}


__all__ = ["Assessment", "AxisLength", "CAUTION", "EDITIONS", "InputError", "assess"]
