"""Built-up sections of older buildings: parts riveted, bolted or welded into one column.

Arrangements (``arrangement``):
  * ``angles-web``: four angles riveted to a web plate, with or without a flange plate on each
    face (the riveted H). Connected along their whole length: one solid section.
  * ``channels``: two channels, toes out (backs facing) or toes in, at a clear ``gap``, tied by
    lacing, by battens, by stitch connectors at a pitch, or by continuous cover plates (a box:
    then solid).
  * ``angles-box``: four angles at the corners of a rectangle, toes in, laced or battened on
    every face (both axes open).
  * ``angles-star``: four equal angles heel to heel in a cross (a star), back to back on
    packing plates of thickness ``gap``, joined by those packings at a ``pitch`` (both axes
    open; the parts stand apart only by the packing).

Properties come from the parts' outlines (``_outline.properties``), placed and summed: A, I,
r exact for the idealised outline; J as each part's thin rectangles (riveted parts twist
each on its own: the safe side); Cw of the solid H as Iy ho^2 / 4 with ho between the flange
centroids; laced, battened and boxed columns are treated as closed for torsion (their ties
keep the chords from warping apart: common practice), so torsional buckling is reported but
does not govern. The x axis is the strong one: an arrangement that comes out stiffer about y
is turned a quarter.

For each open axis (the chords apart, joined only at points) the record keeps what the
built-up rules need: the chord area and its own second moment, the distance h0 between chord
centroids, the smallest radius of gyration of one component (ri), the spacing of the
connection points (a) and the lacing or battens.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._outline import Outline, plate, properties
from fieldcol.sections._parts import Part
from fieldcol.sections._section import Section

ARRANGEMENTS = ("angles-web", "channels", "angles-box", "angles-star")
CONNECTIONS = ("riveted", "bolted", "welded")
LACING_KINDS = ("single", "double", "posts")


@dataclass(frozen=True)
class TieFasteners:
    """The rivets or bolts at one end of a lacing bar or a batten: ``count``, nominal
    ``diameter`` (mm), ``kind`` (``rivet`` or ``bolt``), bolt ``grade`` (None: not recorded),
    ``Fu`` of the fastener's steel (MPa; None: not recorded), ``pitch`` between them along the
    row and ``edge`` (end distance from the last hole's centre, mm; None: not recorded),
    ``field``: where they were read in the record (for errors)."""

    count: int
    diameter: float
    kind: str = "rivet"
    grade: str | None = None
    Fu: float | None = None
    pitch: float | None = None
    edge: float | None = None
    field: str = "fasteners"


@dataclass(frozen=True)
class Lacing:
    """Flat-bar lacing in each of ``planes`` planes: ``kind`` single (zig-zag diagonals),
    double (crossed diagonals) or posts (diagonals with posts); bar ``width`` x ``thickness``
    (mm); ``pitch``: distance along one chord between its lacing points (mm)."""

    kind: str
    width: float
    thickness: float
    pitch: float
    planes: int = 2
    fasteners: TieFasteners | None = None   # at each end of a bar

    @property
    def area(self) -> float:
        return self.width * self.thickness


@dataclass(frozen=True)
class Battens:
    """Batten plates in each of ``planes`` planes at ``spacing`` centre to centre (mm), each
    ``depth`` (along the column) x ``thickness`` (mm)."""

    spacing: float
    depth: float
    thickness: float
    planes: int = 2
    fasteners: TieFasteners | None = None   # at each end of a batten (one chord)

    @property
    def I(self) -> float:
        """In-plane second moment of one batten (bending in its own plane), mm^4."""
        return self.thickness * self.depth**3 / 12


@dataclass(frozen=True)
class OpenAxis:
    """What the built-up rules need about an axis where the chords stand apart.

    axis: ``strong`` or ``weak``; h0: distance between the chords' centroids (mm); Ach: area of
    one chord (mm^2); Ich: one chord's own second moment about its axis parallel to this one
    (mm^4); ri: smallest radius of gyration of one component (mm); a: spacing of the points
    that join the chords (lacing points, battens or stitch connectors, mm); tie: the lacing or
    battens (None: connectors only); back_to_back: the parts touch or stand on packing
    (AISC 360-22 E6.1 Ki).
    """

    axis: str
    h0: float
    Ach: float
    Ich: float
    ri: float
    a: float
    tie: Lacing | Battens | None
    chord: str
    back_to_back: bool = False
    cmax: float = 0.0      # farthest fibre of one chord from its own centroid, across the axis


@dataclass(frozen=True)
class BuiltUp:
    """A built-up section: the composite ``section`` (kind ``"i"``, ``rolled=False``, a plain
    ``Section`` every check can read), the placed ``outlines``, the ``parts``, the
    ``connection`` (riveted, bolted, welded), the ``open_axes``, the plate ``elements``
    (name, width / thickness, type) for local buckling and ``closed`` (torsion)."""

    arrangement: str
    section: Section
    outlines: tuple[Outline, ...]
    parts: tuple[Part, ...]
    connection: str
    open_axes: tuple[OpenAxis, ...] = ()
    elements: tuple[tuple[str, float, str], ...] = ()
    closed: bool = False
    pitch: float | None = None
    notes: tuple[str, ...] = field(default_factory=tuple)

    def open_axis(self, axis: str) -> OpenAxis | None:
        """The open-axis record for ``strong`` or ``weak``, or None (solid about it)."""
        return next((o for o in self.open_axes if o.axis == axis), None)


def _angle_at(part: Part, sx: int, sy: int, x: float, y: float, long_out: bool) -> Outline:
    """An angle with its heel at (x, y), one leg pointing to sx (+1 / -1) along x, the other
    to sy along y; ``long_out``: the longer leg along x."""
    d, b = (max(part.d, part.b), min(part.d, part.b))
    d, b = (b, d) if long_out else (d, b)
    o = replace(part, d=d, b=b).outline()
    if sx < 0:
        o = o.mirrored()
    if sy < 0:
        o = o.turned(2).mirrored()   # (x, y) -> (x, -y)
    return o.moved(x, y)


def _channel_at(part: Part, toward: int, x_back: float) -> Outline:
    """A channel with its web's back on x = x_back, flanges toward +1 / -1, centred on y = 0."""
    o = part.outline().moved(0.0, -part.d / 2)
    if toward < 0:
        o = o.mirrored()
    return o.moved(x_back, 0.0)


def _section(outlines: list[Outline], parts: list[Part], *, J: float, ho: float | None,
             closed: bool, elements: list[tuple[str, float, str]], tmax: float, tmin: float,
             notes: tuple[str, ...], warping: bool = True) -> tuple[Section, bool]:
    """The composite Section (and whether it was turned a quarter to make x the strong axis)."""
    p = properties(outlines)
    turned = p["Iy"] > p["Ix"] * (1 + 1e-9)
    box = np.array([min(o.box()[i] for o in outlines) if i < 2 else max(o.box()[i] for o in outlines)
                    for i in range(4)])
    w, h = box[2] - box[0], box[3] - box[1]
    Ix, Iy = (p["Iy"], p["Ix"]) if turned else (p["Ix"], p["Iy"])
    d, bf = (w, h) if turned else (h, w)
    ymax = max(abs(box[1] - p["cy"]), abs(box[3] - p["cy"]))
    xmax = max(abs(box[0] - p["cx"]), abs(box[2] - p["cx"]))
    cy, cx = (xmax, ymax) if turned else (ymax, xmax)
    A = p["A"]
    hoo = ho if ho is not None else d
    # a cross of thin legs meeting at one line has (nearly) no warping stiffness
    Cw = 0.0 if closed or not warping else Iy * hoo**2 / 4
    out = {"outstand": 0.0, "leg": 0.0, "internal": 0.0, "stem": 0.0}
    for _n, ratio, kind in elements:
        out[kind] = max(out[kind], ratio)
    a = lambda v: np.array(float(v))  # noqa: E731
    sec = Section(
        "i", a(d), a(bf), a(tmax), a(tmin), a(0.0), a(A), a(Ix), a(Iy), a(Ix / cy), a(Iy / cx),
        # plastic moduli taken as the elastic ones (on the safe side; the axial checks do not
        # use them)
        a(Ix / cy), a(Iy / cx), a(np.sqrt(Ix / A)), a(np.sqrt(Iy / A)), a(J), a(Cw), a(hoo),
        # the largest ratios of each kind, for display; each check classifies every element
        a(max(out["outstand"], out["leg"], out["stem"], 1e-6)), a(max(out["internal"], 1e-6)),
        a(max(out["outstand"], out["leg"], out["stem"], 1e-6)), a(max(out["internal"], 1e-6)),
        None, False, notes)
    return sec, turned


def _turn_axis(axis: str, turned: bool) -> str:
    if not turned:
        return axis
    return "weak" if axis == "strong" else "strong"


def angles_web(angle: Part, web_depth: float, web_thickness: float, *,
               flange_plates: tuple[float, float] | None = None, connection: str = "riveted",
               long_leg: str = "flange", pitch: float | None = None,
               field: str = "section.built") -> BuiltUp:
    """Four angles riveted to a web plate (heels at the plate's corners), with an optional
    flange plate (width, thickness) across the angles on each face.

    Example:
        >>> from fieldcol.sections._parts import Part
        >>> b = angles_web(Part("angle", 100, 100, 10, 10), 300, 10)
        >>> round(float(b.section.A))
        10600
    """
    hw, tw = web_depth, web_thickness
    if hw <= 2 * max(angle.d, angle.b):
        raise InputError(f"{field}.web.depth", f"{hw:g} mm", "the web plate is shorter than the "
                         "two angles' legs against it", "give the depth of the web plate")
    out = angle.d >= angle.b if long_leg == "flange" else angle.d < angle.b
    outl = [plate(tw, hw, "web plate")]
    for sx in (1, -1):
        for sy in (1, -1):
            outl.append(_angle_at(angle, sx, -sy, sx * tw / 2, sy * hw / 2, out))
    parts = [Part("plate", tw, hw, tw, tw, name="web plate")] + [angle] * 4
    leg_web = outl[1].box()[3] - outl[1].box()[1]       # the leg against the web
    leg_out = outl[1].box()[2] - outl[1].box()[0]
    # rivet lines at mid-leg (common practice gauge)
    elements = list(angle.elements())
    elements.append(("web plate between rivet lines", (hw - leg_web) / tw, "internal"))
    tmax, tmin = max(tw, angle.tf), min(tw, angle.tf)
    top = [o for o in outl[1:] if o.box()[3] > 0]
    if flange_plates is not None:
        bp, tp = flange_plates
        if bp < 2 * leg_out + tw - 1e-9:
            raise InputError(f"{field}.flange_plates.width", f"{bp:g} mm", "narrower than the "
                             "angles' outstanding legs", None)
        for sy in (1, -1):
            outl.append(plate(bp, tp, "flange plate").moved(0.0, sy * (hw / 2 + tp / 2)))
            parts.append(Part("plate", tp, bp, tp, tp, name="flange plate"))
        top.append(outl[-2])
        gauge = tw + leg_out                       # between the rivet lines across the flange
        elements.append(("flange plate between rivet lines", gauge / tp, "internal"))
        elements.append(("flange plate outstand", (bp - gauge) / 2 / tp, "outstand"))
        tmax, tmin = max(tmax, tp), min(tmin, tp)
    pt = properties(top)
    ho = 2 * pt["cy"]
    J = sum(p.J for p in parts)
    note = (f"built-up H: four angles {angle.name or 'measured'} {connection} to a web plate "
            f"{hw:.0f} x {tw:.1f} mm" + ("" if flange_plates is None else
                                        f", flange plates {flange_plates[0]:.0f} x "
                                        f"{flange_plates[1]:.1f} mm"))
    sec, turned = _section(outl, parts, J=J, ho=ho, closed=False, elements=elements,
                           tmax=tmax, tmin=tmin, notes=(note,))
    return BuiltUp("angles-web", sec, tuple(outl), tuple(parts), connection, (),
                   tuple(elements), False, pitch, (note,))


def channels(channel: Part, gap: float, *, toes: str = "out", tie: Lacing | Battens | None = None,
             plates: tuple[float, float] | None = None, pitch: float | None = None,
             connection: str = "riveted", field: str = "section.built") -> BuiltUp:
    """Two channels at a clear ``gap`` (between the webs' backs with toes out, between the
    toes with toes in), tied by lacing or battens, by stitch connectors at ``pitch``, or by
    continuous cover ``plates`` (width, thickness) on both faces (a closed box).

    Example:
        >>> from fieldcol.sections._parts import Part
        >>> c = Part("channel", 300, 100, 16, 10)
        >>> b = channels(c, 50, tie=Battens(600, 200, 10))
        >>> b.open_axes[0].axis, round(b.open_axes[0].h0)
        ('weak', 109)
    """
    if gap < 0:
        raise InputError(f"{field}.gap", f"{gap:g} mm", "must be zero or more", None)
    if toes == "out":
        outl = [_channel_at(channel, 1, gap / 2), _channel_at(channel, -1, -gap / 2)]
    else:
        outl = [_channel_at(channel, -1, gap / 2 + channel.b),
                _channel_at(channel, 1, -gap / 2 - channel.b)]
    parts = [channel, channel]
    own = channel.own()
    elements = list(channel.elements())
    tmax, tmin = max(channel.tf, channel.tw), min(channel.tf, channel.tw)
    closed = plates is not None or tie is not None
    opens: list[tuple[str, float]] = []
    if plates is not None:
        bp, tp = plates
        width = outl[0].box()[2] - outl[1].box()[0]
        if bp < width - 1e-9:
            raise InputError(f"{field}.plates.width", f"{bp:g} mm", "narrower than the two "
                             f"channels ({width:.0f} mm)", None)
        for sy in (1, -1):
            outl.append(plate(bp, tp, "cover plate").moved(0.0, sy * (channel.d / 2 + tp / 2)))
            parts.append(Part("plate", tp, bp, tp, tp, name="cover plate"))
        inner = width - channel.b if toes == "out" else width - 2 * channel.tw
        elements.append(("cover plate between rivet lines", inner / tp, "internal"))
        tmax, tmin = max(tmax, tp), min(tmin, tp)
    h0 = abs(properties(outl[0])["cx"] - properties(outl[1])["cx"])
    J = sum(p.J for p in parts)
    note = (f"two channels {channel.name or 'measured'}, toes {toes}, {gap:.0f} mm apart, "
            + ("cover plates" if plates else
               "laced" if isinstance(tie, Lacing) else "battened" if isinstance(tie, Battens)
               else "stitched") + f", {connection}")
    # back to back, the two channels warp as an I of depth d - tf
    sec, turned = _section(outl, parts, J=J, ho=channel.d - channel.tf, closed=closed,
                           elements=elements, tmax=tmax, tmin=tmin, notes=(note,))
    axes = ()
    if plates is None:
        a = tie.pitch if isinstance(tie, Lacing) else tie.spacing if isinstance(tie, Battens) \
            else pitch
        if a is None or a <= 0:
            raise InputError(f"{field}.pitch", "", "the spacing of the connectors is needed "
                             "for channels without lacing, battens or plates",
                             "give the pitch of the stitch rivets or bolts")
        ri = float(np.sqrt(own["Imin"] / own["A"]))
        cmax = max(own["cx"], channel.b - own["cx"])
        axes = (OpenAxis(_turn_axis("weak", turned), h0, own["A"], own["Iy"], ri, a, tie,
                         channel.name or "channel", back_to_back=gap <= 25.0 and toes == "out",
                         cmax=cmax),)
    return BuiltUp("channels", sec, tuple(outl), tuple(parts), connection, axes, tuple(elements),
                   closed, pitch, (note,))


def angles_box(angle: Part, depth: float, width: float, tie: Lacing | Battens, *,
               connection: str = "riveted", field: str = "section.built") -> BuiltUp:
    """Four angles at the corners of a ``depth`` x ``width`` rectangle (out to out), toes in,
    laced or battened on all four faces.

    Example:
        >>> from fieldcol.sections._parts import Part
        >>> b = angles_box(Part("angle", 100, 100, 10, 10), 400, 300, Battens(500, 200, 8))
        >>> sorted(o.axis for o in b.open_axes)
        ['strong', 'weak']
    """
    leg = max(angle.d, angle.b)
    for key, v in (("depth", depth), ("width", width)):
        if v <= 2 * leg:
            raise InputError(f"{field}.{key}", f"{v:g} mm", "the angles' legs overlap",
                             "give the out-to-out size")
    outl = []
    for sx in (1, -1):
        for sy in (1, -1):
            outl.append(_angle_at(angle, -sx, -sy, sx * width / 2, sy * depth / 2,
                                  angle.b >= angle.d))
    parts = [angle] * 4
    own = angle.own()
    ri = float(np.sqrt(own["Imin"] / own["A"]))
    pr = properties([outl[0], outl[1]])          # the right-hand pair
    pt = properties([outl[0], outl[2]])          # the top pair
    sec, turned = _section(outl, parts, J=sum(p.J for p in parts), ho=None, closed=True,
                           elements=list(angle.elements()), tmax=angle.tf, tmin=angle.tf,
                           notes=(f"four angles {angle.name or 'measured'} at the corners of "
                                  f"{depth:.0f} x {width:.0f} mm, "
                                  f"{'laced' if isinstance(tie, Lacing) else 'battened'}, "
                                  f"{connection}",))
    a = tie.pitch if isinstance(tie, Lacing) else tie.spacing
    # about y the chords are the right and left pairs; about x the top and bottom pairs
    leg_x, leg_y = outl[0].box()[2] - outl[0].box()[0], outl[0].box()[3] - outl[0].box()[1]
    cx, cy = abs(outl[0].box()[2] - properties(outl[0])["cx"]), abs(outl[0].box()[3] - properties(outl[0])["cy"])
    about_y = OpenAxis(_turn_axis("weak", turned), 2 * abs(pr["cx"]), 2 * own["A"],
                       2 * own["Iy"], ri, a, tie, "two angles", cmax=max(cx, leg_x - cx))
    about_x = OpenAxis(_turn_axis("strong", turned), 2 * abs(pt["cy"]), 2 * own["A"],
                       2 * own["Ix"], ri, a, tie, "two angles", cmax=max(cy, leg_y - cy))
    return BuiltUp("angles-box", sec, tuple(outl), tuple(parts), connection, (about_x, about_y),
                   tuple(angle.elements()), True, None, sec.notes)


def angles_star(angle: Part, gap: float, pitch: float, *, connection: str = "riveted",
                field: str = "section.built") -> BuiltUp:
    """Four angles heel to heel in a cross, their backs ``gap`` apart (the packing plates),
    joined by the packings every ``pitch`` (mm).

    Example:
        >>> from fieldcol.sections._parts import Part
        >>> b = angles_star(Part("angle", 100, 100, 10, 10), 10, 600)
        >>> round(float(b.section.Ix) / float(b.section.Iy), 6)
        1.0
    """
    if abs(angle.d - angle.b) > 1e-9:
        raise InputError(f"{field}.angle", angle.name or f"{angle.d:g} x {angle.b:g} mm",
                         "a star is made of equal angles", "give an equal-leg angle")
    if gap < 0:
        raise InputError(f"{field}.gap", f"{gap:g} mm", "must be zero or more", None)
    if pitch is None or pitch <= 0:
        raise InputError(f"{field}.pitch", "", "the spacing of the packing plates is needed",
                         "give the pitch of the packings along the column")
    outl = [_angle_at(angle, sx, sy, sx * gap / 2, sy * gap / 2, True)
            for sx in (1, -1) for sy in (1, -1)]
    parts = [angle] * 4
    own = angle.own()
    ri = float(np.sqrt(own["Imin"] / own["A"]))
    pr = properties([outl[0], outl[1]])          # the pair on the right of the y axis
    pt = properties([outl[0], outl[2]])          # the pair above the x axis
    sec, turned = _section(outl, parts, J=sum(p.J for p in parts), ho=None, closed=False,
                           elements=list(angle.elements()), tmax=angle.tf, tmin=angle.tf,
                           warping=False,
                           notes=(f"four angles {angle.name or 'measured'} in a star, "
                                  f"{gap:.0f} mm packings every {pitch:.0f} mm, {connection}",))
    leg = angle.b
    cx = properties(outl[0])["cx"] - gap / 2
    about_y = OpenAxis(_turn_axis("weak", turned), 2 * abs(pr["cx"]), 2 * own["A"],
                       2 * own["Iy"], ri, pitch, None, "two angles", back_to_back=True,
                       cmax=max(cx, leg - cx))
    about_x = OpenAxis(_turn_axis("strong", turned), 2 * abs(pt["cy"]), 2 * own["A"],
                       2 * own["Ix"], ri, pitch, None, "two angles", back_to_back=True,
                       cmax=max(cx, leg - cx))
    return BuiltUp("angles-star", sec, tuple(outl), tuple(parts), connection,
                   (about_x, about_y), tuple(angle.elements()), False, pitch, sec.notes)


def with_notes(b: BuiltUp, *more: str) -> BuiltUp:
    """The built-up section with more notes on its Section."""
    return replace(b, section=replace(b.section, notes=b.section.notes + tuple(more)))


def tension_flange(b: BuiltUp) -> tuple[float, float, float, str, str]:
    """The flange a line of fastener holes crosses: (gross area Afg mm^2, thickness the holes
    pass through mm, width across which they lie mm, the axis about which bending puts it in
    tension, the flange in words), for ``angles-web`` (the angles' outstanding legs with the
    flange plate) and ``channels`` (the two channels' flanges on one side, with the cover
    plate). Other arrangements raise ``ValueError``.

    Example:
        >>> from fieldcol.sections._parts import Part
        >>> h = angles_web(Part("angle", 100, 100, 10, 10), 300, 10, flange_plates=(250, 12))
        >>> [round(v) for v in tension_flange(h)[:3]]
        [5000, 22, 200]
    """
    turned = (lambda p: p["Iy"] > p["Ix"] * (1 + 1e-9))(properties(list(b.outlines)))
    axis = _turn_axis("strong", turned)
    plates = [p for p in b.parts if p.kind == "plate" and p.name in ("flange plate", "cover plate")]
    bp, tp = (plates[0].b, plates[0].d) if plates else (0.0, 0.0)
    if b.arrangement == "angles-web":
        box = b.outlines[1].box()
        leg, t = box[2] - box[0], b.parts[1].tf
        return (2 * leg * t + bp * tp, t + tp, 2 * leg, axis,
                "angles' outstanding legs" + (" and flange plate" if plates else ""))
    if b.arrangement == "channels":
        ch = b.parts[0]
        return (2 * ch.b * ch.tf + bp * tp, ch.tf + tp, 2 * ch.b, axis,
                "two channel flanges" + (" and cover plate" if plates else ""))
    raise ValueError(b.arrangement)
