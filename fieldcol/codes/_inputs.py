"""Checking and broadcasting the inputs shared by every column check."""

from __future__ import annotations

import math
import weakref
from typing import Any

import numpy as np

from fieldcol.errors import InputError
from fieldcol.sections._section import KINDS, Section

from ._result import CodeResult

# Properties a check divides by or takes roots of: they must be positive.
_POSITIVE = ("d", "bf", "tf", "tw", "A", "Ix", "Iy", "rx", "ry", "J",
             "lam_flange", "lam_web", "ct_flange", "ct_web")
# Properties that may be zero (no fillet; closed sections carry Cw = 0).
_NON_NEGATIVE = ("r", "Cw")


def _numeric(field: str, value: Any) -> np.ndarray:
    raw = np.asarray(value)
    # bools and strings would be coerced by float(); refuse them instead
    if raw.dtype.kind not in "iuf":
        raise InputError(field, value, "is not a number",
                         "give a number (or an array of numbers) in N, mm, MPa")
    return raw.astype(float)


def _first_bad(a: np.ndarray, bad: np.ndarray) -> tuple[object, str]:
    idx = tuple(int(i[0]) for i in np.nonzero(bad)) if a.ndim else ()
    where = f" (column {idx[0] if len(idx) == 1 else idx})" if idx else ""
    return a[idx].item() if idx else a.item(), where


def positive(field: str, value: Any, hint: str = "give a positive number") -> np.ndarray:
    """``value`` as a float array, refusing NaN, infinities, zero and negatives.

    Args:
        field: the field name the error names, e.g. ``"Fy"``.
        value: a number or array of numbers.
        hint: what would be accepted.
    Returns:
        the values as float64 (0-d for a scalar).

    Example:
        >>> float(positive("Fy", 250))
        250.0
    """
    if type(value) is float or type(value) is np.float64:
        # one column's value: the same 0-d float array, without the array checks' overhead
        if 0.0 < value < math.inf:
            return np.array(value, dtype=float)
    a = _numeric(field, value)
    bad = ~np.isfinite(a) | (a <= 0)
    if bad.any():
        v, where = _first_bad(a, bad)
        raise InputError(field, repr(v), "must be a positive, finite number" + where, hint)
    return a


def non_negative(field: str, value: Any, hint: str = "give zero or a positive number") -> np.ndarray:
    """Like ``positive`` but zero is allowed.

    Example:
        >>> float(non_negative("section.Cw", 0.0))
        0.0
    """
    a = _numeric(field, value)
    bad = ~np.isfinite(a) | (a < 0)
    if bad.any():
        v, where = _first_bad(a, bad)
        raise InputError(field, repr(v), "must be zero or a positive, finite number" + where, hint)
    return a


def flag(field: str, value: Any) -> np.ndarray:
    """A bool or bool array, refusing anything else (no truthiness guessing).

    Example:
        >>> bool(flag("high_strength", False))
        False
    """
    a = np.asarray(value)
    if a.dtype.kind != "b":
        raise InputError(field, value, "must be True or False (or an array of them)",
                         "True for the S460 column of EN 1993-1-1 Table 6.2")
    return a


def prepare(section: Section, **values: Any) -> tuple[dict[str, np.ndarray], dict[str, np.ndarray], tuple]:
    """Check a section and the material and length inputs, and broadcast them to one batch shape.

    Args:
        section: the cross-section(s), a ``Section``.
        **values: named positive inputs (``Fy=...``, ``Lc_weak=...``).
    Returns:
        (section properties by name, inputs by name, batch shape), all float arrays of that shape.

    Example:
        >>> from fieldcol.sections._section import Section
        >>> s = Section("round", *[np.array(x) for x in (100., 100., 5., 5., 0., 1492., 1.7e6, 1.7e6,
        ...     3.4e4, 3.4e4, 4.6e4, 4.6e4, 33.8, 33.8, 3.4e6, 0., 95., 20., 20., 20., 20.)])
        >>> sec, val, shape = prepare(s, Fy=[250, 300])
        >>> shape, val["Fy"].tolist()
        ((2,), [250.0, 300.0])
    """
    if not isinstance(section, Section):
        raise InputError("section", repr(type(section).__name__), "is not a Section",
                         "build one with fieldcol.sections")
    if section.kind not in KINDS:
        raise InputError("section.kind", section.kind, "unknown section kind", f"one of {', '.join(KINDS)}")
    sec = _section_arrays(section)
    vals = {name: positive(name, v) for name, v in values.items()}
    if all(a.shape == () for a in vals.values()):
        one = _one_column(sec)
        if one is not None:  # one column of a catalogue section: its batch of one kept
            return one, {k: v.reshape((1,)) for k, v in vals.items()}, ()
    shape: tuple = ()
    shapes = {a.shape for group in (sec, vals) for a in group.values()}
    if len(shapes) == 1:
        shape = shapes.pop()
    else:
        for prefix, group in (("section.", sec), ("", vals)):
            for name, a in group.items():
                try:
                    shape = np.broadcast_shapes(shape, a.shape)
                except ValueError:
                    raise InputError(prefix + name, f"array of shape {a.shape}",
                                     f"does not match the batch of shape {shape}",
                                     "give one value per column, or a single value for all") from None
    # One column is computed as a batch of one: numpy scalars take libm paths (e.g. for **) that
    # may differ in the last bit from the array loops, and a batch must equal single checks.
    inner = shape or (1,)
    sec = {k: _as_batch(v, shape, inner) for k, v in sec.items()}
    vals = {k: _as_batch(v, shape, inner) for k, v in vals.items()}
    return sec, vals, shape


def _one_column(sec: dict[str, np.ndarray]) -> dict[str, np.ndarray] | None:
    """The batch of one of a shared (read-only) section's checked arrays of one column, made
    once; None for any other (its arrays may change, or hold several columns)."""
    kept = _ONE.get(id(sec))
    if kept is not None and kept[0] is sec:
        return kept[1]
    if not all(a.shape == () and not a.flags.writeable for a in sec.values()):
        return None
    if len(_ONE) >= 4096:
        _ONE.clear()
    one = {k: a.reshape((1,)) for k, a in sec.items()}
    _ONE[id(sec)] = (sec, one)  # (the dict held, so its id is not taken by another)
    return one


#: id of a shared section's checked arrays -> (them, their batch of one)
_ONE: dict[int, tuple[dict[str, np.ndarray], dict[str, np.ndarray]]] = {}


def _as_batch(a: np.ndarray, shape: tuple, inner: tuple) -> np.ndarray:
    if a.shape == inner:
        return a
    if a.shape == shape:
        return a.reshape(inner)
    return np.broadcast_to(a, shape).reshape(inner)


def _section_arrays(section: Section) -> dict[str, np.ndarray]:
    """The section's properties checked (positive, or zero where allowed) as float arrays.

    A catalogue section is made once and its arrays are read-only, so its checked arrays are
    kept on it (checked once, not on every column that names it); a section whose arrays may
    still change is checked every time."""
    kept = _CHECKED.get(id(section))
    if kept is not None and kept[0]() is section:
        return kept[1]
    sec = {name: positive(f"section.{name}", getattr(section, name)) for name in _POSITIVE}
    sec.update({name: non_negative(f"section.{name}", getattr(section, name)) for name in _NON_NEGATIVE})
    sec["rolled"] = flag("section.rolled", section.rolled)
    fixed = all(isinstance(v, np.ndarray) and not v.flags.writeable
                for v in vars(section).values() if isinstance(v, np.ndarray))
    if fixed:
        for a in sec.values():
            a.flags.writeable = False  # shared from now on: nobody may change it in place
        if len(_CHECKED) >= 4096:
            _CHECKED.clear()
        _CHECKED[id(section)] = (weakref.ref(section), sec)
    return sec


#: id of a section -> (the section, weakly, and its checked arrays)
_CHECKED: dict[int, tuple[weakref.ref, dict[str, np.ndarray]]] = {}


def reshaped(result: CodeResult, shape: tuple) -> CodeResult:
    """The result with every per-column array given the batch ``shape`` (undoing the batch of one).

    Example:
        >>> from fieldcol.trace import Trace
        >>> r = CodeResult("elastic", "none", np.ones(1), np.ones(1), np.array(["yield"]), {}, Trace(), [])
        >>> reshaped(r, ()).nominal.shape
        ()
    """
    if shape:
        return result
    def one(v: Any) -> Any:
        return v.reshape(shape) if isinstance(v, np.ndarray) and v.shape == (1,) else v
    result.nominal, result.design, result.governing = (one(result.nominal), one(result.design),
                                                       one(result.governing))
    for m in result.modes.values():
        m.Lc, m.slenderness, m.Pe, m.Fcr, m.Pn = (one(m.Lc), one(m.slenderness), one(m.Pe), one(m.Fcr),
                                                  one(m.Pn))
    for w in result.warnings:
        w.mask = one(w.mask)
    for st in result.trace.steps:
        d = st.__dict__
        v = d["value"]
        if type(v) is np.ndarray and v.shape == (1,):
            # the steps were made by this check alone (nobody else holds them): set the value
            # in place rather than make each frozen step again
            d["value"] = v.reshape(shape)
    return result
