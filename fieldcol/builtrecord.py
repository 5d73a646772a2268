"""Read a built-up section from a column record: ``"section": {"built": {...}}``.

Kept apart from ``fieldcol.record`` so that a built-up section is one call there. Every
value carries its unit; every error names its path (``section.built.lacing.pitch``).
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

from fieldcol.errors import InputError
from fieldcol.recordkeys import check_keys
from fieldcol.sections._builtup import (ARRANGEMENTS, CONNECTIONS, LACING_KINDS, Battens, BuiltUp,
                                        Lacing, TieFasteners, angles_box, angles_star, angles_web,
                                        channels)
from fieldcol.sections._parts import Part, catalogue_part, measured


def _len(spec: Mapping[str, Any], key: str, fld: str, required: bool = True) -> float | None:
    v = spec.get(key)
    if v in (None, ""):
        if required:
            raise InputError(f"{fld}.{key}", "", "required", "give it with its unit, e.g. 3/8 in")
        return None
    from fieldcol.record import parse_length  # the record's reader: a bare number is refused

    return parse_length(v, f"{fld}.{key}", allow_zero=key in ("gap", "r1", "r2"))


def _obj(value: Any, fld: str, table: str) -> Mapping[str, Any]:
    if not isinstance(value, Mapping):
        raise InputError(fld, value, "must be an object", None)
    check_keys(value, table, fld)
    return value


def _choice(value: Any, allowed: tuple[str, ...], fld: str, default: str) -> str:
    if value is None:
        return default
    if isinstance(value, str) and value.strip().lower() in allowed:
        return value.strip().lower()
    raise InputError(fld, value, "not one of the choices", "use " + ", ".join(allowed))


def _part(value: Any, kind: str, fld: str) -> Part:
    """A catalogue designation or a measured object."""
    if isinstance(value, str):
        return catalogue_part(value, fld, kind)
    spec = _obj(value, fld, f"measured {kind}")
    dims = {k: _len(spec, k, fld, required=False) for k in spec if k != "slope"}
    dims = {k: v for k, v in dims.items() if v is not None}
    if "slope" in spec:
        s = spec["slope"]
        if isinstance(s, bool) or not isinstance(s, (int, float)) or not 0 <= s < 0.5:
            raise InputError(f"{fld}.slope", s, "must be a rise over run from 0 to 0.5",
                             "1/6 = 0.1667 for AISC C shapes")
        dims["slope"] = float(s)
    return measured(kind, fld, **dims)


def _planes(spec: Mapping[str, Any], fld: str) -> int:
    n = spec.get("planes", 2)
    if isinstance(n, bool) or n not in (1, 2):
        raise InputError(f"{fld}.planes", n, "must be 1 or 2", "lacing on both faces: 2")
    return int(n)


def _fasteners(spec: Any, fld: str, connection: str) -> TieFasteners | None:
    """The rivets or bolts at each end of a lacing bar or batten (``fasteners``), or None."""
    if spec is None:
        return None
    f = _obj(spec, fld, "tie fasteners")
    if connection == "welded":
        raise InputError(fld, "welded", "a welded built-up section has no end rivets or bolts",
                         "give the connection: riveted or bolted")
    n = f.get("count")
    if isinstance(n, bool) or not isinstance(n, int) or not 1 <= n <= 12:
        raise InputError(f"{fld}.count", n, "must be a whole number from 1 to 12",
                         "the rivets or bolts at one end of one bar or batten, e.g. 1")
    kind = "rivet" if connection == "riveted" else "bolt"
    grade = f.get("grade")
    if grade is not None:
        if kind == "rivet":
            raise InputError(f"{fld}.grade", grade, "rivets have no bolt grade",
                             "give Fu of the rivet steel, if documented or tested")
        if not isinstance(grade, str) or not grade.strip():
            raise InputError(f"{fld}.grade", grade, "must be a bolt grade (text)",
                             "A307, A325-N, A325-X, A490-N, A490-X; EN: 4.6, 5.6, 8.8, 10.9")
        grade = grade.strip().upper()
    Fu = None
    if f.get("Fu") not in (None, ""):
        from fieldcol.record import parse_quantity
        Fu = parse_quantity(f["Fu"], "stress", f"{fld}.Fu")
        if not 250 <= Fu <= 1600:
            raise InputError(f"{fld}.Fu", f["Fu"], "outside the range of fastener steels "
                             "(250 to 1600 MPa)", "e.g. 52 ksi for old rivet steel")
    return TieFasteners(n, _len(f, "diameter", fld), kind, grade, Fu,
                        _len(f, "pitch", fld, required=False), _len(f, "edge", fld, required=False),
                        fld)


def _tie(spec: Mapping[str, Any], fld: str, connection: str = "riveted") -> Lacing | Battens | None:
    if spec.get("lacing") is not None and spec.get("battens") is not None:
        raise InputError(f"{fld}.battens", "lacing and battens",
                         "give the lacing or the battens, not both", None)
    if spec.get("lacing") is not None:
        f = f"{fld}.lacing"
        lac = _obj(spec["lacing"], f, "lacing")
        return Lacing(_choice(lac.get("kind"), LACING_KINDS, f"{f}.kind", "single"),
                      _len(lac, "width", f), _len(lac, "thickness", f), _len(lac, "pitch", f),
                      _planes(lac, f), _fasteners(lac.get("fasteners"), f"{f}.fasteners", connection))
    if spec.get("battens") is not None:
        f = f"{fld}.battens"
        bat = _obj(spec["battens"], f, "battens")
        return Battens(_len(bat, "spacing", f), _len(bat, "depth", f), _len(bat, "thickness", f),
                       _planes(bat, f), _fasteners(bat.get("fasteners"), f"{f}.fasteners", connection))
    return None


def _plates(spec: Mapping[str, Any], key: str, fld: str) -> tuple[float, float] | None:
    if spec.get(key) is None:
        return None
    p = _obj(spec[key], f"{fld}.{key}", "plate")
    return _len(p, "width", f"{fld}.{key}"), _len(p, "thickness", f"{fld}.{key}")


# the keys each arrangement reads: any other is refused, never silently left out
_COMMON = ("arrangement", "connection")
USED = {"angles-web": _COMMON + ("angle", "web", "flange_plates", "long_leg", "pitch", "holes"),
        "channels": _COMMON + ("channel", "gap", "toes", "lacing", "battens", "plates", "pitch",
                               "holes"),
        "angles-box": _COMMON + ("angle", "depth", "width", "lacing", "battens"),
        "angles-star": _COMMON + ("angle", "gap", "pitch")}


def parse_holes(spec: Any, fld: str) -> tuple[float, int]:
    """(hole diameter mm, holes across one flange) of a ``holes`` object
    ``{"diameter": "15/16 in", "per_flange": 2}``.

    Example:
        >>> d, n = parse_holes({"diameter": "15/16 in", "per_flange": 2}, "section.built.holes")
        >>> round(d, 2), n
        (23.81, 2)
    """
    h = _obj(spec, fld, "fastener holes")
    n = h.get("per_flange")
    if isinstance(n, bool) or not isinstance(n, int) or not 1 <= n <= 12:
        raise InputError(f"{fld}.per_flange", n, "must be a whole number of holes from 1 to 12",
                         "the holes across one flange at one height, e.g. 2")
    return _len(h, "diameter", fld), n


def built_holes(spec: Any, built: BuiltUp, fld: str = "section.built") -> Any:
    """The fastener holes in the tension flange of a riveted or bolted built-up section
    (``section.built.holes``) as a ``codes.netflange.FlangeHoles``, or None.

    Example:
        >>> spec = {"arrangement": "angles-web", "angle": "L4X4X1/2", "connection": "riveted",
        ...         "web": {"depth": "14 in", "thickness": "3/8 in"},
        ...         "holes": {"diameter": "15/16 in", "per_flange": 2}}
        >>> built_holes(spec, parse_built(spec)).count
        2
    """
    if not isinstance(spec, Mapping) or spec.get("holes") is None:
        return None
    from fieldcol.codes.netflange import HOLE_ALLOWANCE, FlangeHoles
    from fieldcol.sections._builtup import tension_flange

    d, n = parse_holes(spec["holes"], f"{fld}.holes")
    if built.connection == "welded":
        raise InputError(f"{fld}.holes", "welded", "a welded section has no fastener holes",
                         "give the connection: riveted or bolted")
    Afg, t, width, axis, where = tension_flange(built)
    if n * (d + HOLE_ALLOWANCE) >= width:
        raise InputError(f"{fld}.holes.per_flange", n, f"{n} holes of {d:.1f} mm take the whole "
                         f"width of the {where} ({width:.0f} mm)", "count the holes across one flange")
    return FlangeHoles(d, n, t, Afg, axis, where)


def parse_built(spec: Any, fld: str = "section.built") -> BuiltUp:
    """A built-up section from its record object.

    Example:
        >>> b = parse_built({"arrangement": "channels", "channel": "C12X20.7", "gap": "6 in",
        ...                  "toes": "out", "connection": "riveted",
        ...                  "battens": {"spacing": "24 in", "depth": "8 in",
        ...                              "thickness": "3/8 in"}})
        >>> b.arrangement, b.open_axes[0].axis
        ('channels', 'weak')
    """
    spec = _obj(spec, fld, "built-up section")
    arr = _choice(spec.get("arrangement"), ARRANGEMENTS, f"{fld}.arrangement", "")
    if not arr:
        raise InputError(f"{fld}.arrangement", "", "required", "one of " + ", ".join(ARRANGEMENTS))
    conn = _choice(spec.get("connection"), CONNECTIONS, f"{fld}.connection", "riveted")
    for key in spec:
        if key not in USED[arr] and spec.get(key) is not None:
            raise InputError(f"{fld}.{key}", key, f"not used by {arr}",
                             f"{arr} takes " + ", ".join(USED[arr]))
    if arr == "angles-star":
        return angles_star(_part(spec.get("angle"), "angle", f"{fld}.angle"),
                           _len(spec, "gap", fld), _len(spec, "pitch", fld), connection=conn,
                           field=fld)
    if arr == "angles-web":
        if spec.get("web") is None:  # named itself, not its depth: the object is what is missing
            raise InputError(f"{fld}.web", "", "required",
                             '{"depth": "14 in", "thickness": "3/8 in"}')
        web = _obj(spec["web"], f"{fld}.web", "web plate")
        return angles_web(_part(spec.get("angle"), "angle", f"{fld}.angle"),
                          _len(web, "depth", f"{fld}.web"), _len(web, "thickness", f"{fld}.web"),
                          flange_plates=_plates(spec, "flange_plates", fld), connection=conn,
                          long_leg=_choice(spec.get("long_leg"), ("flange", "web"),
                                           f"{fld}.long_leg", "flange"),
                          pitch=_len(spec, "pitch", fld, required=False), field=fld)
    tie = _tie(spec, fld, conn)
    if arr == "channels":
        return channels(_part(spec.get("channel"), "channel", f"{fld}.channel"),
                        _len(spec, "gap", fld),
                        toes=_choice(spec.get("toes"), ("out", "in"), f"{fld}.toes", "out"),
                        tie=tie, plates=_plates(spec, "plates", fld),
                        pitch=_len(spec, "pitch", fld, required=False), connection=conn,
                        field=fld)
    if tie is None:
        raise InputError(f"{fld}.lacing", "", "four angles need lacing or battens",
                         'e.g. "battens": {"spacing": "24 in", ...}')
    return angles_box(_part(spec.get("angle"), "angle", f"{fld}.angle"),
                      _len(spec, "depth", fld), _len(spec, "width", fld), tie, connection=conn,
                      field=fld)
