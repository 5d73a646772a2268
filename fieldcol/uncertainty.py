"""How sure the answer is: the capacity of one column sampled from the spread of what was
measured and of the yield stress, with the vectorised engine (all samples in one batch).

What is sampled (each default can be changed; all stated in the result):

- the plate thicknesses (flanges, web, wall): normal, standard deviation 0.1 mm (the resolution of a
  field thickness gauge, common practice), each plate of a sample on its own;
- the depth and width: normal, standard deviation 1.0 mm (a tape or calliper, common practice);
- the yield stress: lognormal with the value the check uses as its median (no credit for
  overstrength: conservative) and a coefficient of variation of 0.07 (structural steel; from
  memory of probabilistic model codes), 0.05 when coupon-tested, 0.10 for an untested historic grade.

The section properties of a sample are those of the column scaled by the ratio of the sample's
plate outline to the nominal one, so that with no spread every sample equals the deterministic
check. Held fixed: the effective lengths (ends and braces as recorded), the moments' sources and
the demand. The loss band's section strength is scaled with the yield stress (its shape is not
resampled). The knowledge factor applies to every sample.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import Any, Mapping

import numpy as np

from fieldcol.assess import Assessment, assess
from fieldcol.bending import end_ratio, sway_load
from fieldcol.codes import check_aisc360, check_bow, check_elastic, check_en1993
from fieldcol.codes.beamcolumn import check_beam_column
from fieldcol.errors import InputError
from fieldcol.sections import Section, i_section, rect_hollow, round_hollow

SEED = 20261204
_PROPS = ("A", "Ix", "Iy", "Sx", "Sy", "Zx", "Zy", "rx", "ry", "J", "Cw", "ho",
          "lam_flange", "lam_web", "ct_flange", "ct_web")


@dataclass(frozen=True)
class Spreads:
    """Standard deviations of the measurements (mm) and the yield stress's coefficient of
    variation (None: by how the yield stress is known, see the module notes)."""

    thickness: float = 0.1
    size: float = 1.0
    fy_cov: float | None = None


@dataclass
class Uncertainty:
    """The distribution of a column's design strength (N) and utilization over the samples.

    Fields: ``samples``, ``seed``, ``deterministic`` (the check itself), ``percentiles`` of the
    design strength {5, 50, 95}, ``mean``, ``utilization`` percentiles (None without a demand),
    ``p_exceed`` (the share of samples whose utilization is above 1; None without a demand),
    ``spreads`` (what was used), ``notes``.
    """

    samples: int
    seed: int
    deterministic: float
    percentiles: dict[int, float]
    mean: float
    utilization: dict[int, float] | None
    p_exceed: float | None
    spreads: dict[str, float]
    notes: list[str] = field(default_factory=list)

    def to_dict(self) -> dict[str, Any]:
        """The JSON form (quantities as ``{"value", "unit"}``).

        Example:
            >>> u = Uncertainty(10, 1, 5.0, {5: 4.0, 50: 5.0, 95: 6.0}, 5.0, None, None, {})
            >>> u.to_dict()["median"]
            {'value': 5.0, 'unit': 'N'}
        """
        q = lambda v, unit="N": {"value": v if v is not None and math.isfinite(v) else None, "unit": unit}  # noqa: E731
        return {"samples": self.samples, "seed": self.seed,
                "deterministic": q(self.deterministic),
                "percentile_5": q(self.percentiles[5]), "median": q(self.percentiles[50]),
                "percentile_95": q(self.percentiles[95]), "mean": q(self.mean),
                "utilization": None if self.utilization is None else {
                    f"percentile_{k}": q(v, "") for k, v in self.utilization.items()},
                "probability_demand_exceeds_capacity": self.p_exceed,
                "spreads": self.spreads, "notes": self.notes}


def _outline(sec: Section, d: Any, b: Any, tf: Any, tw: Any) -> Section:
    if sec.kind == "i":
        return i_section(d, b, tf, tw, float(np.asarray(sec.r).reshape(-1)[0]), rolled=sec.rolled)
    if sec.kind == "rect":
        r = float(np.asarray(sec.r).reshape(-1)[0])
        # a square tube's sampled sides may swap which one is larger: the outline needs d >= b
        return rect_hollow(np.maximum(d, b), np.minimum(d, b), tf, r if r > 0 else None)
    return round_hollow(d, tf)


def sampled_section(sec: Section, n: int, spreads: Spreads, rng: np.random.Generator) -> Section:
    """``n`` samples of a section: its properties scaled by the sampled outline over the nominal one.

    Example:
        >>> from fieldcol.sections import from_catalogue
        >>> s = sampled_section(from_catalogue("W10X49"), 4, Spreads(0.0, 0.0), np.random.default_rng(1))
        >>> bool(np.allclose(s.A, from_catalogue("W10X49").A))
        True
    """
    one = {k: float(np.asarray(getattr(sec, k)).reshape(-1)[0]) for k in ("d", "bf", "tf", "tw")}
    d = one["d"] + spreads.size * rng.standard_normal(n)
    b = one["bf"] + spreads.size * rng.standard_normal(n) if sec.kind != "round" else d
    tf = one["tf"] + spreads.thickness * rng.standard_normal(n)
    tw = one["tw"] + spreads.thickness * rng.standard_normal(n) if sec.kind == "i" else tf
    if np.any(tf <= 0) or np.any(tw <= 0):
        raise InputError("thickness-sd", repr(spreads.thickness), "the spread gives plates of no thickness",
                         "give a smaller standard deviation")
    # an outline too small for its plates: named by the spread that is the larger share of
    # what it spreads (sizes of the depth, thicknesses of the flange)
    too_small = "size-sd" if spreads.size * one["tf"] >= spreads.thickness * one["d"] \
        else "thickness-sd"
    if np.any(d <= 2 * tf):
        spread = spreads.size if too_small == "size-sd" else spreads.thickness
        raise InputError(too_small, repr(spread), "the spread gives outlines too small for their "
                         "plates", "give a smaller standard deviation")
    nominal = _outline(sec, one["d"], one["bf"], one["tf"], one["tw"])
    try:
        sample = _outline(sec, d, b, tf, tw)
    except InputError as e:  # a sampled outline that cannot be drawn (fillets filling the web)
        spread = spreads.size if too_small == "size-sd" else spreads.thickness
        raise InputError(too_small, repr(spread), f"the spread gives sections that cannot be "
                         f"drawn ({e.reason})", "give a smaller standard deviation") from None
    new = {k: float(np.asarray(getattr(sec, k)).reshape(-1)[0])
           * np.asarray(getattr(sample, k), dtype=float)
           / float(np.asarray(getattr(nominal, k)).reshape(-1)[0]) if float(
               np.asarray(getattr(nominal, k)).reshape(-1)[0]) else np.zeros(n) for k in _PROPS}
    return replace(sec, d=d, bf=b, tf=tf, tw=tw, r=np.full(n, float(np.asarray(sec.r).reshape(-1)[0])),
                   tf_as_built=None, tmax_as_built=None, **new)


def run_samples(record: Mapping[str, Any], samples: int, *, seed: int = SEED,
                spreads: Spreads = Spreads(), check: Assessment | None = None) -> Uncertainty:
    """Sample the design strength of one column record.

    Args:
        record: the column record; samples: how many (100 to 1,000,000); seed: the random seed
            (the same seed gives the same answer); spreads: see ``Spreads``; check: the record's
            assessment if already made.
    Returns:
        an ``Uncertainty``.
    Raises:
        InputError: ``samples`` out of range, a bad spread, and whatever the record's check raises.

    Example:
        >>> u = run_samples({"tag": "C", "section": "W10X49", "material": "A992", "length": "14 ft"},
        ...                 1000)
        >>> u.percentiles[5] < u.deterministic * 1.01 < u.percentiles[95] * 1.02
        True
    """
    if isinstance(samples, bool) or not isinstance(samples, int) or not 100 <= samples <= 1_000_000:
        raise InputError("samples", repr(samples), "must be a whole number from 100 to 1000000",
                         "10000 gives the 5th percentile to about 1 %")
    if isinstance(seed, bool) or not isinstance(seed, int) or seed < 0:
        raise InputError("seed", repr(seed), "must be a whole number, 0 or more", "e.g. 1")
    for name, v in (("thickness-sd", spreads.thickness), ("size-sd", spreads.size)):
        if not (math.isfinite(v) and v >= 0):
            raise InputError(name, repr(v), "must be zero or a positive number of mm")
    a = check if check is not None else assess(record)
    col = a.column
    if col.built is not None:
        # the sampled path is the rolled shapes' (no E6 / 6.4 chords, ties or end fasteners):
        # refused rather than answered by the wrong method
        raise InputError("samples", repr(samples), "the uncertainty run does not cover built-up "
                         "sections (laced, battened or stitched parts) yet",
                         "leave --samples out: the deterministic check covers them")
    rng = np.random.default_rng(seed)
    mat = col.material
    Fy0 = float(mat.fy_at(col.section.tmax_nominal))
    cov = spreads.fy_cov
    why = "given"
    if cov is None:
        cov, why = ((0.05, "coupon-tested") if mat.tested else (0.10, "untested historic grade") if mat.historic
                    else (0.07, "structural steel, from memory"))
    if not (math.isfinite(cov) and 0 <= cov <= 0.5):
        raise InputError("fy-cov", repr(cov), "must be a number from 0 to 0.5", "0.07 for structural steel")
    sig = math.sqrt(math.log(1 + cov**2))
    Fy = Fy0 * np.exp(sig * rng.standard_normal(samples))
    sec = sampled_section(col.section, samples, spreads, rng)
    L = {ax: a.lengths[ax].Lc for ax in ("strong", "weak", "twist")}
    args = (sec, Fy, mat.E, mat.G, L["strong"], L["weak"], L["twist"])
    basis = "asd" if col.basis == "asd" else "lrfd"
    with np.errstate(all="ignore"):
        if col.code == "aisc360-22":
            ax = check_aisc360(*args, basis=basis)
        elif col.code == "en1993-1-1":
            ax = check_en1993(*args, gamma_M1=col.gamma_M1, high_strength=mat.key.upper() == "S460")
        else:
            ax = check_elastic(*args)
        caps = [np.asarray(ax.design, dtype=float)]
        Pr = a.demand
        ratios = [] if not Pr else [Pr / caps[0]]
        # with other moments the beam-column check carries the bow over the same span (and never
        # gives more), so the bow alone is sampled only without them or over a length of its own
        if a.bow is not None and math.isfinite(float(np.asarray(a.bow.capacity).reshape(-1)[0])) and (
                a.beam is None or col.bow_over is not None):
            Lb = col.bow_over if col.bow_over is not None else a.spans[col.bow_axis]
            bw = check_bow(col.code, sec, Fy, mat.E, mat.G, Lb, L["strong"], L["weak"], L["twist"], col.bow,
                           col.bow_axis, basis=basis, gamma_M1=col.gamma_M1, Pr=Pr or None, axial=ax,
                           allowance=col.bow_allowance)
            caps.append(np.asarray(bw.capacity, dtype=float))
            if Pr:
                ratios.append(np.asarray(bw.ratio, dtype=float))
        if a.beam is not None:
            pe = sway_load(col, Pr)
            bc = check_beam_column(col.code, sec, Fy, mat.E, mat.G, Pr, ax, span=a.spans, Lc=L,
                                   moments=a.sources, basis=basis, gamma_M1=col.gamma_M1,
                                   end_ratio=end_ratio(col), sway_Pe=None if pe is None else
                                   {"strong": pe, "weak": pe}, member_length=col.length)
            caps.append(bc.capacity)
            ratios.append(bc.ratio)
        notes = ["effective lengths, moments and demand held at their recorded values"]
        if a.band is not None:
            scale = Fy / Fy0
            caps.append(a.band.capacity * scale)
            if Pr and a.band.ratio is not None:
                ratios.append(a.band.ratio / scale)
            notes.append("the loss band's section strength scaled with the yield stress (its shape not resampled)")
        cap = col.knowledge * np.min(np.vstack(caps), axis=0)
        util = None if not ratios else np.max(np.vstack(ratios), axis=0) / col.knowledge
    pct = {k: float(np.nanpercentile(cap, k)) for k in (5, 50, 95)}
    u_pct = None if util is None else {k: float(np.nanpercentile(util, k)) for k in (5, 50, 95)}
    p = None if util is None else float(np.mean(util > 1.0))
    return Uncertainty(samples, seed, a.design_strength, pct, float(np.nanmean(cap)), u_pct, p,
                       {"thickness_sd_mm": spreads.thickness, "size_sd_mm": spreads.size,
                        "fy_cov": cov, "fy_cov_basis": why, "fy_median_MPa": Fy0}, notes)


__all__ = ["SEED", "Spreads", "Uncertainty", "run_samples", "sampled_section"]
