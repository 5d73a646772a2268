"""Markup on a photo: arrows, circles and short labels that point at a defect.

The photo file is never touched; the shapes are kept beside it as JSON, in coordinates
normalised to the upright photo (EXIF orientation applied): ``x`` from 0 at the left edge to 1
at the right, ``y`` from 0 at the top to 1 at the bottom. A circle's radius is a fraction of the
photo's shorter side, so it stays round at any size the photo is drawn. Shapes::

    {"kind": "arrow", "from": [0.2, 0.2], "to": [0.5, 0.6]}    # the head is at "to"
    {"kind": "circle", "at": [0.5, 0.6], "r": 0.08}
    {"kind": "label", "at": [0.5, 0.6], "text": "crack at weld"}
"""

from __future__ import annotations

import math
from typing import Any

from fieldcol.errors import InputError

SHAPE_KINDS = ("arrow", "circle", "label")
MAX_SHAPES = 40
MAX_LABEL = 40      # characters: a label points, the finding's text explains
# how markup is drawn everywhere (app and report): bright lines over a dark edge
INK_HEX, EDGE_HEX = "#FFD21F", "#111418"
INK_RGB, EDGE_RGB = (255, 210, 31), (17, 20, 24)
_KEYS = {"arrow": {"from", "to"}, "circle": {"at", "r"}, "label": {"at", "text"}}


def _point(value: Any, field: str) -> list[float]:
    if (not isinstance(value, (list, tuple)) or len(value) != 2
            or any(isinstance(c, bool) or not isinstance(c, (int, float)) for c in value)):
        raise InputError(field, repr(value)[:60], "a point is two numbers [x, y]",
                         "from 0 to 1 across and down the photo, e.g. [0.4, 0.7]")
    x, y = (float(c) for c in value)
    if not (math.isfinite(x) and math.isfinite(y) and 0 <= x <= 1 and 0 <= y <= 1):
        raise InputError(field, repr(value)[:60], "the point is outside the photo",
                         "x and y from 0 to 1")
    return [round(x, 4), round(y, 4)]


def check_markup(shapes: Any, field: str = "markup") -> list[dict[str, Any]]:
    """The markup as it will be kept: every shape checked, points rounded to 4 decimals.

    Args:
        shapes: a list of shapes (see the module docstring).
        field: the name errors give the list, e.g. ``markup``; a shape is ``markup[2]``.

    Returns:
        A new list of clean shapes.

    Raises:
        InputError: naming the shape and its field, e.g. ``markup[0].text``.

    Example:
        >>> check_markup([{"kind": "circle", "at": [0.5, 0.25], "r": 0.1}])
        [{'kind': 'circle', 'at': [0.5, 0.25], 'r': 0.1}]
        >>> check_markup([{"kind": "label", "at": [0.5, 0.5], "text": " "}])
        Traceback (most recent call last):
        fieldcol.errors.InputError: markup[0].text: cannot use ' ': a label needs a word or two ...
    """
    if not isinstance(shapes, list):
        raise InputError(field, repr(shapes)[:60], "markup is a list of shapes", "[] for none")
    if len(shapes) > MAX_SHAPES:
        raise InputError(field, f"{len(shapes)} shapes", f"at most {MAX_SHAPES} shapes on a photo",
                         "a second photo can carry more")
    out = []
    for i, s in enumerate(shapes):
        f = f"{field}[{i}]"
        if not isinstance(s, dict):
            raise InputError(f, repr(s)[:60], "a shape is an object", '{"kind": "arrow", ...}')
        kind = s.get("kind")
        if kind not in SHAPE_KINDS:
            raise InputError(f"{f}.kind", str(kind), "not a kind of shape", ", ".join(SHAPE_KINDS))
        extra = sorted(set(s) - _KEYS[kind] - {"kind"})
        if extra:
            raise InputError(f"{f}.{extra[0]}", repr(s[extra[0]])[:60],
                             f"not a field of {'an' if kind == 'arrow' else 'a'} {kind}",
                             ", ".join(sorted(_KEYS[kind])))
        if kind == "arrow":
            a, b = _point(s.get("from"), f"{f}.from"), _point(s.get("to"), f"{f}.to")
            if math.dist(a, b) < 0.01:
                raise InputError(f"{f}.to", repr(s.get("to")), "the arrow has no length",
                                 "drag from where the arrow starts to the defect")
            out.append({"kind": "arrow", "from": a, "to": b})
        elif kind == "circle":
            r = s.get("r")
            if isinstance(r, bool) or not isinstance(r, (int, float)) or not (
                    math.isfinite(r) and 0.005 <= r <= 1):
                raise InputError(f"{f}.r", repr(r), "the radius is a fraction of the photo",
                                 "from 0.005 to 1 of its shorter side")
            out.append({"kind": "circle", "at": _point(s.get("at"), f"{f}.at"),
                        "r": round(float(r), 4)})
        else:
            text = s.get("text")
            if not isinstance(text, str) or not text.strip():
                raise InputError(f"{f}.text", text if isinstance(text, str) else repr(text),
                                 "a label needs a word or two", "e.g. crack, 3 mm pit")
            if len(text.strip()) > MAX_LABEL:
                raise InputError(f"{f}.text", text[:60], f"a label is at most {MAX_LABEL} "
                                 "characters", "say more in the finding's text")
            out.append({"kind": "label", "at": _point(s.get("at"), f"{f}.at"),
                        "text": " ".join(text.split())})
    return out


def arrow_head(tail: tuple[float, float], head: tuple[float, float],
               size: float) -> tuple[tuple[float, float], tuple[float, float]]:
    """The two back corners of an arrow head at ``head`` (drawing units, e.g. px or mm).

    Args:
        tail, head: the arrow's ends.
        size: the length of the head's sides.

    Returns:
        Two points; with ``head`` they make the head's triangle.

    Example:
        >>> [tuple(round(c, 2) for c in p) for p in arrow_head((0, 0), (10, 0), 2)]
        [(8.27, -1.0), (8.27, 1.0)]
    """
    ang = math.atan2(head[1] - tail[1], head[0] - tail[0])
    spread = math.radians(30)
    return tuple((head[0] - size * math.cos(ang + s), head[1] - size * math.sin(ang + s))
                 for s in (spread, -spread))  # type: ignore[return-value]


__all__ = ["INK_HEX", "EDGE_HEX", "INK_RGB", "EDGE_RGB", "SHAPE_KINDS", "MAX_SHAPES", "MAX_LABEL", "check_markup", "arrow_head"]
