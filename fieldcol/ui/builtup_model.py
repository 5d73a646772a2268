"""View-model of the Section tab's built-up card: a column made of parts (channels, angles,
plates), entered as the arrangement and the few dimensions to measure, shown as a sketch
with its properties before it is saved.

No Flet here. Entries are kept as typed, keyed ``channel``, ``gap``, ``battens.spacing``, ...
(a bare number takes the site's unit when saved, as every entry of the app does).

Public API::

    ARRANGEMENTS, TIES, entries(arrangement, tie, connection) -> list[Entry]
    built_record(arrangement, tie, typed, system) -> dict      (the record's ``built`` object)
    built_preview(arrangement, tie, typed, system) -> BuiltPreview
    built_typed(section) -> (arrangement, tie, typed)           (to fill the card again)
    save_built(store, column_id, arrangement, tie, typed) -> Change
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import TYPE_CHECKING, Any

from fieldcol.errors import InputError
from fieldcol.ui.model import Line
from fieldcol.ui.readings import Change, typed_length

if TYPE_CHECKING:
    from fieldcol.store import Store

ARRANGEMENTS = [("channels", "Two channels"), ("angles-web", "Angles and web plate"),
                ("angles-box", "Four angles"), ("angles-star", "Angles in a star")]
TIES = {"channels": [("battens", "Battens"), ("lacing", "Lacing"), ("plates", "Cover plates"),
                     ("stitch", "Rivets only")],
        "angles-web": [("none", "No flange plates"), ("flange_plates", "Flange plates")],
        "angles-box": [("battens", "Battens"), ("lacing", "Lacing")],
        "angles-star": [("packings", "Packings")]}
CONNECTIONS = [("riveted", "Riveted"), ("bolted", "Bolted"), ("welded", "Welded")]


@dataclass(frozen=True)
class Entry:
    """One thing to type: its key (a dotted path in the record's ``built`` object), its label,
    its kind (``part``: a catalogue name; ``length``; ``count``: a whole number), a hint, and
    whether it may be left empty (``optional``: the entries of one group, such as the
    fasteners at a batten's end, are given all together or not at all)."""

    key: str
    label: str
    kind: str = "length"
    hint: str = ""
    optional: bool = False


_PART_HINT = {"channel": "e.g. C12X20.7, MC10X25, UPN 200", "angle": "e.g. L4X4X1/2, L6X4X3/8"}
_BASE = {
    "channels": [Entry("channel", "Channel", "part", _PART_HINT["channel"]),
                 Entry("gap", "Clear gap", hint="between the webs' backs")],
    "angles-web": [Entry("angle", "Angle", "part", _PART_HINT["angle"]),
                   Entry("web.depth", "Web plate depth"),
                   Entry("web.thickness", "Web plate thickness")],
    "angles-box": [Entry("angle", "Angle", "part", _PART_HINT["angle"]),
                   Entry("depth", "Depth out to out"), Entry("width", "Width out to out")],
    "angles-star": [Entry("angle", "Angle", "part", "an equal angle, e.g. L3X3X3/8"),
                    Entry("gap", "Packing thickness", hint="between the angles' backs"),
                    Entry("pitch", "Packing pitch", hint="along the column")],
}
_TIE = {
    "battens": [Entry("battens.spacing", "Batten spacing", hint="centre to centre"),
                Entry("battens.depth", "Batten depth", hint="along the column"),
                Entry("battens.thickness", "Batten thickness")],
    "lacing": [Entry("lacing.width", "Lacing bar width"),
               Entry("lacing.thickness", "Lacing bar thickness"),
               Entry("lacing.pitch", "Lacing pitch", hint="between lacing rivets on one chord")],
    "plates": [Entry("plates.width", "Cover plate width"),
               Entry("plates.thickness", "Cover plate thickness")],
    "stitch": [Entry("pitch", "Rivet pitch", hint="between the stitch rivets along the column")],
    "flange_plates": [Entry("flange_plates.width", "Flange plate width"),
                      Entry("flange_plates.thickness", "Flange plate thickness")],
    "none": [],
}
_FASTENER_WORDS = {"riveted": ("Rivets", "Rivet"), "bolted": ("Bolts", "Bolt")}


def _optional(arrangement: str, tie: str, connection: str) -> list[Entry]:
    """The fasteners at each end of a batten or lacing bar (checked as the ``tie-joint``
    mode) and the rivet or bolt holes across a flange (the net flange in bending), for a
    riveted or bolted section; a welded one has neither."""
    if connection not in _FASTENER_WORDS:
        return []
    many, one = _FASTENER_WORDS[connection]
    out: list[Entry] = []
    if tie in ("battens", "lacing"):
        bar = "batten" if tie == "battens" else "bar"
        out += [Entry(f"{tie}.fasteners.count", f"{many} at each end", "count",
                      f"of one {bar}, e.g. 2", True),
                Entry(f"{tie}.fasteners.diameter", f"{one} diameter", optional=True)]
    if arrangement in ("channels", "angles-web"):
        out += [Entry("holes.diameter", "Hole diameter", hint="in a flange", optional=True),
                Entry("holes.per_flange", "Holes across one flange", "count",
                      "at one height, e.g. 2", True)]
    return out


# said above the optional entries
OPTIONAL_WORDS = "Rivets or bolts and their holes, where you can see them (optional; for the " \
                 "ties' end joints and the net flange in bending):"
# what to measure, said under the sketch
MEASURE = {
    "channels": "Measure one channel (or read its mark), the clear gap between the two, and "
                "the ties: batten spacing and size, lacing bar and pitch, or the cover plates.",
    "angles-web": "Measure one angle, the web plate between the angles' heels and its "
                  "thickness, and the flange plates if there are any.",
    "angles-box": "Measure one angle and the outside size of the box, then the battens or the "
                  "lacing on one face.",
    "angles-star": "Measure one angle, the packing between the backs and the spacing of the "
                   "packings along the column.",
}


@dataclass
class BuiltPreview:
    """What the card shows before saving: property lines, the parts as polygons scaled to a
    unit box (y down), what to measure, and an error naming the entry (or None)."""

    lines: list[Line] = field(default_factory=list)
    polygons: list[list[tuple[float, float]]] = field(default_factory=list)
    measure: str = ""
    error: str | None = None
    error_key: str | None = None
    # the lacing bars or battens seen in the cross-section (thin plates on the open faces)
    ties: list[list[tuple[float, float]]] = field(default_factory=list)
    # a side view of one open face over three panels: the two chords and the lacing or
    # battens between them, as polylines in a unit box (y down); empty when solid
    elevation: list[list[tuple[float, float]]] = field(default_factory=list)
    elevation_label: str = ""


def _elevation(tie: Any, h0: float) -> tuple[list[list[tuple[float, float]]], str]:
    """Polylines of one open face seen from the side: chords at x = 0.2 and 0.8, three panels
    of the ties over the height, to scale along the column (the width is not to scale)."""
    from fieldcol.sections._builtup import Battens, Lacing

    left, right = 0.2, 0.8
    lines = [[(left, 0.0), (left, 1.0)], [(right, 0.0), (right, 1.0)]]
    if isinstance(tie, Lacing):
        n = 3
        step = 1.0 / n
        if tie.kind == "double":
            for i in range(n):
                y0, y1 = i * step, (i + 1) * step
                lines += [[(left, y0), (right, y1)], [(right, y0), (left, y1)]]
        else:
            # single: a zig-zag, a diagonal for every half pitch; posts add the horizontals
            pts = [(left if i % 2 == 0 else right, i * step / 2) for i in range(2 * n + 1)]
            lines.append(pts)
            if tie.kind == "posts":
                lines += [[(left, y), (right, y)] for _, y in pts]
        return lines, f"{tie.kind} lacing, pitch {tie.pitch:.0f} mm"
    if isinstance(tie, Battens):
        n = 3
        depth = min(tie.depth / tie.spacing, 0.8) / n
        for i in range(n + 1):
            yc = i / n
            y0, y1 = max(yc - depth / 2, 0.0), min(yc + depth / 2, 1.0)
            lines.append([(left, y0), (right, y0), (right, y1), (left, y1), (left, y0)])
        return lines, f"battens every {tie.spacing:.0f} mm"
    return [], ""


def _face_ties(arrangement: str, tie: Any, box: tuple[float, float, float, float]
               ) -> list[list[tuple[float, float]]]:
    """Thin rectangles for the lacing or battens on the open faces of the cross-section."""
    from fieldcol.sections._builtup import Battens, Lacing

    if not isinstance(tie, (Lacing, Battens)):
        return []
    x0, y0, x1, y1 = box
    t = max(tie.thickness, 0.01 * max(x1 - x0, y1 - y0))
    rect = lambda a, b, c, d: [(a, b), (c, b), (c, d), (a, d)]  # noqa: E731
    out = [rect(x0, y1, x1, y1 + t), rect(x0, y0 - t, x1, y0)]       # top and bottom faces
    if arrangement == "angles-box":
        out += [rect(x1, y0, x1 + t, y1), rect(x0 - t, y0, x0, y1)]  # and the sides
    return out


def entries(arrangement: str, tie: str, connection: str = "welded", toes: str = "out"
            ) -> list[Entry]:
    """The entries of an arrangement with its ties; a riveted or bolted one also has the
    optional fasteners at the ties' ends and the holes across a flange. Two channels' clear
    gap says where it is measured for the way their toes point (``out`` or ``in``).

    Example:
        >>> [e.key for e in entries("channels", "stitch")]
        ['channel', 'gap', 'pitch']
        >>> [e.key for e in entries("angles-box", "battens", "riveted")][-2:]
        ['battens.fasteners.count', 'battens.fasteners.diameter']
        >>> entries("channels", "battens", toes="in")[1].hint
        'between the toe tips'
    """
    if arrangement not in _BASE:
        raise InputError("arrangement", arrangement, "not an arrangement of the card",
                         ", ".join(a for a, _ in ARRANGEMENTS))
    if tie not in (t for t, _ in TIES[arrangement]):
        raise InputError("ties", tie, f"not a way to tie {arrangement}",
                         ", ".join(t for t, _ in TIES[arrangement]))
    base = list(_BASE[arrangement])
    if arrangement == "channels" and toes == "in":
        # one hint for the toes chosen: both ways in one line ran to four lines at 390 px
        # and were cut off
        base = [replace(e, hint="between the toe tips") if e.key == "gap" else e for e in base]
    return base + list(_TIE.get(tie, [])) + _optional(arrangement, tie, connection)


def _count(text: str, label: str) -> int:
    if not text.isdigit() or not 1 <= int(text) <= 12:
        raise InputError(label, text, "must be a whole number from 1 to 12", "e.g. 2")
    return int(text)


def _group(key: str) -> str:
    return key.rpartition(".")[0]


def built_record(arrangement: str, tie: str, typed: dict[str, str], system: str,
                 toes: str = "out", connection: str = "riveted") -> dict[str, Any]:
    """The record's ``built`` object from what was typed (lengths kept with their unit).

    Raises:
        InputError: a missing or unreadable entry, its field the entry's label.

    Example:
        >>> built_record("channels", "stitch", {"channel": "C12X20.7", "gap": "1/2",
        ...              "pitch": "24"}, "us")["gap"]
        '1/2 in'
    """
    out: dict[str, Any] = {"arrangement": arrangement, "connection": connection}
    if arrangement == "channels":
        out["toes"] = toes
    every = entries(arrangement, tie, connection)
    given = {_group(e.key) for e in every if e.optional and (typed.get(e.key) or "").strip()}
    for e in every:
        text = (typed.get(e.key) or "").strip()
        if e.optional and _group(e.key) not in given:
            continue
        if e.kind == "part":
            if not text:
                raise InputError(e.label.lower(), "", "this is required", e.hint)
            value: Any = text
        elif e.kind == "count":
            value = _count(text, e.label.lower())
        else:
            value = typed_length(text, system, e.label.lower())
        *heads, last = e.key.split(".")
        node = out
        for head in heads:
            node = node.setdefault(head, {})
        node[last] = value
    return out


def _label_of(fld: str, arrangement: str, tie: str, connection: str) -> str | None:
    """The entry key a record path names (``section.built.battens.depth`` -> ``battens.depth``)."""
    path = fld.removeprefix("section.built.")
    keys = {e.key for e in entries(arrangement, tie, connection)}
    while path:
        if path in keys:
            return path
        path = path.rpartition(".")[0]
    return None


def built_preview(arrangement: str, tie: str, typed: dict[str, str], system: str,
                  toes: str = "out", connection: str = "riveted") -> BuiltPreview:
    """Properties and a sketch of what was typed, or the error that stops it.

    Example:
        >>> p = built_preview("channels", "stitch", {"channel": "C12X20.7", "gap": "6",
        ...                   "pitch": "24"}, "us")
        >>> p.error, len(p.polygons), p.lines[0].label
        (None, 2, 'Area')
    """
    from fieldcol.builtrecord import built_holes, parse_built

    prev = BuiltPreview(measure=MEASURE[arrangement])
    try:
        spec = built_record(arrangement, tie, typed, system, toes, connection)
        b = parse_built(spec)
        built_holes(spec, b)   # holes wider than the flange are refused before saving
    except InputError as e:
        every = entries(arrangement, tie, connection)
        prev.error_key = _label_of(e.field, arrangement, tie, connection) or next(
            (x.key for x in every if x.label.lower() == e.field), None)
        # said as the entry is labelled, not as the record's path
        name = next((x.label for x in every if x.key == prev.error_key), e.field)
        prev.error = f"{name}: {e.reason}" + (f" ({e.hint})" if e.hint else "")
        return prev
    s = b.section
    us = system == "us"

    def q(v: float, power: int, unit_mm: str) -> str:
        if us:
            return f"{float(v) / 25.4**power:,.4g} in{'' if power == 1 else '^' + str(power)}"
        return f"{float(v):,.4g} {unit_mm}"

    prev.lines = [Line("Area", q(s.A, 2, "mm^2")), Line("I strong", q(s.Ix, 4, "mm^4")),
                  Line("I weak", q(s.Iy, 4, "mm^4")), Line("r strong", q(s.rx, 1, "mm")),
                  Line("r weak", q(s.ry, 1, "mm"))]
    for ax in b.open_axes:
        prev.lines.append(Line(f"Chords apart ({ax.axis} axis)",
                               f"h0 {q(ax.h0, 1, 'mm')}, a/ri {ax.a / ax.ri:.0f}"))
    pts = [o.xy for o in b.outlines]
    xs = [p[:, 0] for p in pts]
    ys = [p[:, 1] for p in pts]
    x0, x1 = min(x.min() for x in xs), max(x.max() for x in xs)
    y0, y1 = min(y.min() for y in ys), max(y.max() for y in ys)
    tie = b.open_axes[0].tie if b.open_axes else None
    faces = _face_ties(b.arrangement, tie, (float(x0), float(y0), float(x1), float(y1)))
    for f in faces:
        x0, x1 = min(x0, *(x for x, _ in f)), max(x1, *(x for x, _ in f))
        y0, y1 = min(y0, *(y for _, y in f)), max(y1, *(y for _, y in f))
    size = max(x1 - x0, y1 - y0)
    cx, cy = (x0 + x1) / 2, (y0 + y1) / 2

    def unit(poly: Any) -> list[tuple[float, float]]:
        return [(0.5 + (float(x) - cx) / size, 0.5 - (float(y) - cy) / size) for x, y in poly]

    prev.polygons = [unit(p) for p in pts]
    prev.ties = [unit(f) for f in faces]
    if b.open_axes:
        prev.elevation, prev.elevation_label = _elevation(tie, b.open_axes[0].h0)
    return prev


def built_typed(section: Any) -> tuple[str, str, dict[str, str], str, str]:
    """(arrangement, tie, typed entries, toes, connection) of a record's section, to fill the
    card again; a section that is not built up gives the card's starting state.

    Example:
        >>> built_typed({"built": {"arrangement": "channels", "channel": "C12X20.7",
        ...              "gap": "6 in", "pitch": "24 in"}})[:3]
        ('channels', 'stitch', {'channel': 'C12X20.7', 'gap': '6 in', 'pitch': '24 in'})
    """
    b = section.get("built") if isinstance(section, dict) else None
    if not isinstance(b, dict) or b.get("arrangement") not in dict(ARRANGEMENTS):
        return "channels", "battens", {}, "out", "riveted"
    arr = b["arrangement"]
    tie = next((t for t, _ in TIES[arr] if isinstance(b.get(t), dict)),
               "stitch" if arr == "channels" else TIES[arr][0][0])
    connection = str(b.get("connection", "riveted"))
    typed: dict[str, str] = {}
    for e in entries(arr, tie, connection):
        v: Any = b
        for head in e.key.split("."):
            v = v.get(head) if isinstance(v, dict) else None
        if isinstance(v, str) or (isinstance(v, int) and not isinstance(v, bool)):
            typed[e.key] = str(v)
    return arr, tie, typed, str(b.get("toes", "out")), connection


def save_built(store: "Store", column_id: str, arrangement: str, tie: str,
               typed: dict[str, str], toes: str = "out", connection: str = "riveted") -> Change:
    """Save the built-up section to the column's record and check the column again.

    Raises:
        InputError: the entry that stops it (nothing is saved).

    Example: ``save_built(store, cid, "channels", "battens", typed).label`` gives
    ``'built-up section'``.
    """
    from fieldcol.builtrecord import built_holes, parse_built
    from fieldcol.ui.section import _save_record

    system = store.get_site(store.get_column(column_id).site_id).unit_system
    spec = built_record(arrangement, tie, typed, system, toes, connection)
    built_holes(spec, parse_built(spec))   # refuse before anything is written
    return _save_record(store, column_id, {"built": spec}, "built-up section")
