"""The demo site: an invented mid-century print works under conversion, fully recorded.

Everything here is invented for demonstration: the building, its address, the people, the
readings and the loads. Each row has a fixed id (uuid5 of a demo name), so building the demo
twice adds nothing the second time; the checks come from ``fieldcol.assess.assess``.
"""

from __future__ import annotations

import hashlib
import io
import json
import math
import uuid
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from fieldcol.errors import InputError

if TYPE_CHECKING:
    from fieldcol.store import Store

SITE_NAME = "Kestrel Lane Print Works"
_NS = uuid.uuid5(uuid.NAMESPACE_URL, "fieldcol:demo:kestrel-lane")
_V1, _V2 = "2026-02-10", "2026-03-03"
_PINNED = {"bottom": "pinned", "top": "pinned"}


def _id(*parts: str) -> str:
    return str(uuid.uuid5(_NS, "/".join(parts)))


def _rec(section: Any, material: Any, length: str, axial: str, *, weak_braces: list | None = None,
         strong: dict | None = None, twist_braces: list | None = None) -> dict[str, Any]:
    weak = dict(_PINNED)
    if weak_braces:
        weak["braces"] = weak_braces
    restraints: dict[str, Any] = {"strong": strong or dict(_PINNED), "weak": weak}
    if twist_braces:
        restraints["twist"] = {"braces": twist_braces}
    return {"section": section, "material": material, "length": length,
            "restraints": restraints, "k_basis": "recommended", "code": "aisc360-22",
            "demand": {"axial": axial, "basis": "lrfd"}}


# tag -> (level, grid, location, record without tag); loads are invented for the demo
COLUMNS: dict[str, tuple[str, str, str, dict[str, Any]]] = {
    # press hall, 1958 frame, original A7 steel
    "A/1-G": ("Ground", "A/1", "press hall, west wall", _rec("W10X49", "A7", "16 ft", "120 kip")),
    "A/2-G": ("Ground", "A/2", "press hall, west wall",
              _rec({"name": "W10X49"}, "A7", "16 ft", "230 kip")),
    "A/3-G": ("Ground", "A/3", "press hall, west wall", _rec("W10X49", "A7", "16 ft", "200 kip")),
    "A/4-G": ("Ground", "A/4", "press hall, north-west corner",
              _rec("W10X49", "A7", "16 ft", "150 kip")),
    "B/1-G": ("Ground", "B/1", "press hall", _rec("W12X65", "A7", "16 ft", "300 kip")),
    "B/2-G": ("Ground", "B/2", "press hall", _rec("W12X65", "A7", "16 ft", "310 kip")),
    "B/3-G": ("Ground", "B/3", "press hall",
              _rec({"name": "W12X65"}, "A7", "16 ft", "420 kip")),
    "B/4-G": ("Ground", "B/4", "press hall", _rec("W12X65", "A7", "16 ft", "350 kip")),
    "C/1-G": ("Ground", "C/1", "paper store, crane rail side",
              _rec({"shape": "i", "d": "16 in", "bf": "12 in", "tf": "3/4 in", "tw": "1/2 in",
                    "welded": True}, "A7", "18 ft", "480 kip")),
    "C/2-G": ("Ground", "C/2", "double-height press bay",
              _rec("W14X90", "A7", "24 ft", "600 kip",
                   weak_braces=[{"at": "12 ft", "added": "2019 strut to north wall"}],
                   twist_braces=[{"at": "12 ft"}])),
    "C/3-G": ("Ground", "C/3", "double-height press bay",
              _rec("W14X90", "A7", "24 ft", "650 kip",
                   weak_braces=[{"at": "12 ft", "stiffness": "0.6 kip/in",
                                 "added": "2008 strap to timber partition"}])),
    "C/4-G": ("Ground", "C/4", "double-height press bay",
              _rec("W14X90", "A7", "24 ft", "520 kip",
                   weak_braces=[{"at": "12 ft", "cable": {"area": "0.6 in^2", "length": "18 ft",
                                                          "angle": "40 deg"},
                                 "added": "wire rope found 2026"}])),
    # 1974 extension, A36
    "D/1-G": ("Ground", "D/1", "1974 extension", _rec("HP10X42", "A36", "20 ft", "200 kip")),
    "D/2-G": ("Ground", "D/2", "1974 extension, by the old wash-down drain",
              _rec({"name": "HP10X42"}, "A36", "20 ft", "230 kip")),
    "D/3-G": ("Ground", "D/3", "1974 extension", _rec("HP12X53", "A36", "20 ft", "320 kip")),
    "D/4-G": ("Ground", "D/4", "1974 extension, boiler room", _rec("W8X31", "A36", "20 ft",
                                                                   "180 kip")),
    # 2001 mezzanine, A992 / A500 / A53
    "E/1-M": ("Mezzanine", "E/1", "office mezzanine", _rec("HSS6X6X3/8", "A500 Gr B", "12 ft",
                                                           "150 kip")),
    "E/2-M": ("Mezzanine", "E/2", "office mezzanine", _rec("HSS6X6X3/8", "A500 Gr B", "12 ft",
                                                           "80 kip")),
    "E/3-M": ("Mezzanine", "E/3", "office mezzanine", _rec("HSS6.625X0.280", "A500 Gr B",
                                                           "12 ft", "100 kip")),
    "E/4-M": ("Mezzanine", "E/4", "office mezzanine", _rec("Pipe6STD", "A53 Gr B", "12 ft",
                                                           "90 kip")),
    "F/1-M": ("Mezzanine", "F/1", "mezzanine, stair side", _rec("W8X31", "A992", "12 ft",
                                                                "200 kip")),
    "F/2-M": ("Mezzanine", "F/2", "mezzanine, under the new plant", _rec("W8X31", "A992",
                                                                         "12 ft", "310 kip")),
    "F/3-M": ("Mezzanine", "F/3", "mezzanine, east edge",
              _rec("W10X49", "A992", "14 ft", "330 kip",
                   strong={"bottom": "fixed", "top": "pinned"})),
    "G/1-G": ("Ground", "G/1", "loading dock", _rec("Pipe8STD", "A53 Gr B", "14 ft", "140 kip")),
}

# (tag, quantity, text, gauge, who, when, note, corrects-key)
MEASUREMENTS = [
    ("A/2-G", "section.loss.flange", "0.48 in", "ultrasonic thickness gauge", "R. Amadi",
     f"{_V1}T10:15:00Z", "4 in above slab, worst of 6 readings", None),
    ("B/3-G", "section.loss.flange", "0.52 in", "ultrasonic thickness gauge", "R. Amadi",
     f"{_V1}T10:40:00Z", "through paint", None),
    ("B/3-G", "section.loss.flange", "0.50 in", "ultrasonic thickness gauge", "T. Nguyen",
     f"{_V2}T09:30:00Z", "re-measured after wire brushing", None),
    ("D/2-G", "section.loss.flange", "0.23 in", "ultrasonic thickness gauge", "T. Nguyen",
     f"{_V2}T11:05:00Z", None, None),
    ("D/2-G", "section.loss.flange", "0.33 in", "ultrasonic thickness gauge", "T. Nguyen",
     f"{_V2}T11:05:00Z", "typed 0.23 by mistake; gauge showed 0.33", "D/2-G:0"),
    ("B/2-G", "condition.bow", "1 1/8 in", "string line and rule", "T. Nguyen",
     f"{_V2}T10:10:00Z", "bow about the weak axis, maximum near mid-height", None),
    ("C/2-G", "length", "23'-10\"", "laser distance meter", "R. Amadi", f"{_V1}T14:00:00Z",
     "slab to underside of cap plate", None),
]

# (key, tag, date, kind, axis, description, seen_by, detail)
RESTRAINT_CHANGES = [
    ("C/2-brace", "C/2-G", "2019-05-14", "brace_added", "weak",
     "L3x3x1/4 angle strut to the north wall at mid-height (12 ft)", "R. Amadi",
     {"at": "12 ft", "member": "L3x3x1/4", "source": "dated fabrication tag on the cleat"}),
    ("C/3-strap", "C/3-G", "2008-09-01", "brace_added", "weak",
     "light steel strap to a timber stud partition at 12 ft", "R. Amadi",
     {"at": "12 ft", "member": "1 1/2 x 1/8 in strap", "stiffness": "0.6 kip/in (estimated)"}),
    ("C/4-cable", "C/4-G", _V1, "cable_found", "weak",
     "wire rope from the column at 12 ft to the roof truss, turnbuckle tight", "R. Amadi",
     {"at": "12 ft", "area": "0.6 in^2", "angle": "40 deg"}),
    ("A/4-strut", "A/4-G", _V2, "brace_removed", "weak",
     "strut at 8 ft shown on the 1974 drawings is gone (earlier strip-out)", "T. Nguyen", None),
    ("F/3-base", "F/3-M", _V2, "end_condition_changed", "strong",
     "base plate found grouted with four anchor rods: taken as fixed about the strong axis",
     "T. Nguyen", {"bottom": "fixed"}),
]

# (key, tag or None, text, category, severity, status, photo style, when seen, by whom): each
# finding dated on the visit it was seen on, so the registers read in the order of the survey
FINDINGS = [
    ("A/2-rust", "A/2-G", "Base of column heavily corroded; flange down to 0.48 in "
     "(0.56 in nominal) 4 in above the slab", "corrosion", "high", "open", "rust",
     f"{_V1}T10:20:00Z", "R. Amadi"),
    ("B/3-rust", "B/3-G", "Pack rust between base plate and flange; flange 0.50 in remaining",
     "corrosion", "high", "open", "rust", f"{_V2}T09:35:00Z", "T. Nguyen"),
    ("D/2-rust", "D/2-G", "Flange corroded by the old wash-down drain; 0.33 in remaining",
     "corrosion", "medium", "open", "rust", f"{_V2}T11:10:00Z", "T. Nguyen"),
    ("B/2-bow", "B/2-G", "Column visibly bowed about the weak axis: 1 1/8 in over 16 ft by "
     "string line, beyond the L/1000 straightness tolerance", "bow", "high", "open", "bow",
     f"{_V2}T10:15:00Z", "T. Nguyen"),
    ("C/3-strap", "C/3-G", "Strap brace to timber partition is far too flexible to count as a "
     "brace point", "bracing", "high", "open", "strap", f"{_V1}T13:15:00Z", "R. Amadi"),
    ("C/4-cable", "C/4-G", "Wire rope to roof truss of unknown origin; confirm its anchorage "
     "before relying on it", "bracing", "medium", "open", "cable", f"{_V1}T13:30:00Z",
     "R. Amadi"),
    ("G/1-dent", "G/1-G", "Forklift dent about 3 ft above the slab; pipe wall locally flattened",
     "damage", "medium", "open", "dent", f"{_V2}T14:20:00Z", "R. Amadi"),
    ("roof-leak", None, "Roof leaks over bay C keep the column bases wet", "water", "medium",
     "open", None, f"{_V2}T08:45:00Z", "R. Amadi"),
    ("D-debris", None, "Debris cleared from around the D-line column bases", "housekeeping",
     "info", "closed", None, f"{_V1}T09:20:00Z", "R. Amadi"),
]

RETROFITS = [
    ("C/3-G", "Replace the strap with an L3x3x1/4 strut to the new steel partition frame at "
     "12 ft", {"kind": "combined", "options": [
         {"kind": "remove_brace", "axis": "weak", "at": "12 ft", "twist": False},
         {"kind": "brace", "axis": "weak", "at": "12 ft"}]}),
    ("F/2-M", "Add a weak-axis brace at mid-height from the mezzanine edge beam",
     {"kind": "brace", "axis": "weak", "at": "6 ft"}),
]
# arrows, circles and labels drawn over a demo photo (fractions of the upright picture)
MARKUP = {"G/1-dent": [{"kind": "circle", "at": [0.44, 0.67], "r": 0.09},
                       {"kind": "arrow", "from": [0.82, 0.38], "to": [0.5, 0.62]},
                       {"kind": "label", "at": [0.52, 0.3], "text": "dent, wall flattened"}]}


@dataclass
class DemoSummary:
    """What the demo holds after building it, and what this run added."""
    site_id: str
    columns: int
    checks: int
    added: int
    over: list[str] = field(default_factory=list)
    ok: list[str] = field(default_factory=list)
    warnings: dict[str, list[str]] = field(default_factory=dict)
    skipped: dict[str, str] = field(default_factory=dict)


def demo_photo(style: str, tag: str, when: str) -> bytes:
    """A drawn JPEG of a column detail with EXIF time ``when`` (``YYYY-MM-DDTHH:MM:SS``).

    The picture is made here with Pillow, so the same arguments always give the same bytes.

    Example:
        >>> demo_photo("rust", "A/2-G", "2026-02-10T10:15:00")[:2]
        b'\\xff\\xd8'
    """
    from PIL import Image, ImageDraw

    w, h = 480, 640
    img = Image.new("RGB", (w, h), (196, 198, 194))
    d = ImageDraw.Draw(img)
    d.rectangle([0, h - 90, w, h], fill=(150, 150, 146))  # the slab
    x0, x1 = 200, 280
    if style == "bow":
        for y in range(0, h - 90, 4):
            off = int(28 * math.sin(math.pi * y / (h - 90)))
            d.rectangle([x0 + off, y, x1 + off, y + 4], fill=(70, 74, 80))
    else:
        d.rectangle([x0, 0, x1, h - 90], fill=(70, 74, 80))
        d.rectangle([x0 + 34, 0, x1 - 34, h - 90], fill=(92, 96, 102))
    if style == "rust":
        for i in range(9):
            cx, cy = x0 + 10 + (i * 23) % 70, h - 120 - (i * 37) % 90
            d.ellipse([cx - 14, cy - 9, cx + 14, cy + 9], fill=(150, 72 + i * 4, 30))
        d.rectangle([x0 - 30, h - 98, x1 + 30, h - 88], fill=(120, 62, 28))
    elif style in ("strap", "cable"):
        colour, width = ((120, 120, 120), 3) if style == "strap" else ((40, 40, 40), 2)
        d.line([x1, 260, w, 120 if style == "cable" else 260], fill=colour, width=width)
        if style == "strap":
            d.rectangle([w - 40, 0, w, h - 90], fill=(181, 150, 105))  # timber partition
    elif style == "dent":
        d.ellipse([x0 - 6, h - 240, x0 + 30, h - 180], fill=(196, 198, 194))
    d.rectangle([0, 0, w, 28], fill=(30, 30, 30))
    d.text((8, 8), f"{SITE_NAME}  {tag}  {when[:10]}", fill=(240, 240, 240))
    exif = Image.Exif()
    exif.get_ifd(0x8769)[0x9003] = when[:10].replace("-", ":") + " " + when[11:19]
    exif.get_ifd(0x8769)[0x9011] = "+00:00"
    buf = io.BytesIO()
    img.save(buf, "JPEG", quality=85, exif=exif)
    return buf.getvalue()


def build_demo(store: "Store") -> DemoSummary:
    """Create (or complete) the demo site in ``store``; running it again adds nothing.

    Args:
        store: an open store.

    Returns:
        A ``DemoSummary``: counts, the columns over and within capacity, warnings, and any
        column whose check could not be run (with the reason).

    Example:
        >>> build_demo(store).columns
        24
        >>> build_demo(store).added
        0
    """
    from fieldcol.assess import assess

    added = 0

    have = store.has_row
    site_id = _id("site")
    if not have("sites", site_id):
        store.add_site(SITE_NAME, code="aisc360-22", unit_system="us",
                       address="14 Inkwell Row, Millbrook", owner_ref="KLP-0426",
                       notes="Former newspaper print works: steel frame 1958, press-hall "
                             "extension 1974, office mezzanine 2001. Conversion to studios and "
                             "a cafe; column survey for the change of use. (Invented demo site.)",
                       site_id=site_id)
        added += 1
    visits = {}
    for date, who, notes in ((_V1, "R. Amadi", "dry and cold; press hall unlit, bring torches"),
                             (_V2, "R. Amadi, T. Nguyen", "rain; roof leaks over bay C; "
                              "mezzanine reached by the east stair only")):
        visits[date] = _id("visit", date)
        if not have("visits", visits[date]):
            store.add_visit(site_id, date, who=who, notes=notes, visit_id=visits[date])
            added += 1
    cols = {}
    for tag, (level, grid, location, rec) in COLUMNS.items():
        cols[tag] = _id("column", tag)
        if not have("columns", cols[tag]):
            store.add_column(site_id, {"tag": tag, **rec}, level=level, grid=grid,
                             location=location, column_id=cols[tag])
            added += 1
    meas_ids: dict[str, str] = {}
    counter: dict[str, int] = {}
    for tag, qty, text, gauge, who, when, note, corrects in MEASUREMENTS:
        n = counter.get(tag, 0)
        counter[tag] = n + 1
        key = f"{tag}:{n}"
        meas_ids[key] = _id("measurement", key)
        if not have("measurements", meas_ids[key]):
            store.add_measurement(cols[tag], qty, text, gauge=gauge, taken_by=who, taken_at=when,
                                  visit_id=visits[when[:10]], note=note,
                                  corrects=meas_ids[corrects] if corrects else None,
                                  measurement_id=meas_ids[key])
            added += 1
    for i, (key, tag, date, kind, axis, desc, seen, detail) in enumerate(RESTRAINT_CHANGES):
        rid = _id("restraint", key)
        if not have("restraint_changes", rid):
            store.add_restraint_change(cols[tag], date, kind, desc, axis=axis, seen_by=seen,
                                       detail=detail, change_id=rid)
            added += 1
            if kind in ("brace_added", "cable_found"):
                # photographed on the first visit, one after another round the press bay
                store.add_photo(demo_photo("cable" if kind == "cable_found" else "strap", tag,
                                           f"{_V1}T13:{5 * i:02d}:00"),
                                original_name=f"{tag.replace('/', '-')}-restraint.jpg",
                                restraint_change_id=rid, caption=desc, taken_by=seen)
    for key, tag, text, cat, sev, status, style, when, who in FINDINGS:
        fid = _id("finding", key)
        if not have("findings", fid):
            store.add_finding(site_id, text, category=cat, severity=sev, status=status,
                              column_id=cols[tag] if tag else None, noted_at=when,
                              noted_by=who, visit_id=visits[when[:10]], finding_id=fid)
            added += 1
            if style:
                # the photo taken as the finding was noted
                photo = store.add_photo(demo_photo(style, tag, when[:19]),
                                        original_name=f"{tag.replace('/', '-')}-{style}.jpg",
                                        finding_id=fid, caption=text[:60], taken_by=who)
                if key in MARKUP:
                    store.set_markup(photo.id, MARKUP[key])
    for tag, desc, option in RETROFITS:
        rid = _id("retrofit", tag)
        if not have("retrofits", rid):
            store.add_retrofit_option(cols[tag], option, description=desc, retrofit_id=rid)
            added += 1
    summary = DemoSummary(site_id, len(cols), 0, added)
    for tag, col_id in cols.items():
        rec = store.current_record(col_id)
        digest = hashlib.sha256(json.dumps(rec, sort_keys=True).encode()).hexdigest()[:16]
        cid = _id("check", tag, digest)
        if not have("checks", cid):
            try:
                result = assess(rec).to_dict()
            except InputError as e:
                summary.skipped[tag] = str(e)
                continue
            store.save_check(col_id, result, record=rec, checked_at=f"{_V2}T17:00:00Z",
                             check_id=cid, note="demo check")
            summary.added += 1
        chk = store.get_check(cid)
        summary.checks += 1
        (summary.over if (chk.utilization or 0) > 1 else summary.ok).append(tag)
        warns = [w.get("code", "") for w in chk.result.get("warnings", [])
                 if isinstance(w, dict)]
        if warns:
            summary.warnings[tag] = warns
    return summary
