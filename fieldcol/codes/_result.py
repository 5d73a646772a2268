"""Records returned by the column checks: one per mode, one per code check."""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from fieldcol.trace import Trace

MODES = ("flexural-strong", "flexural-weak", "torsional", "yield")


@dataclass
class ModeResult:
    """The strength of a batch of columns in one failure mode.

    Args:
        mode: one of ``MODES``.
        Lc: effective length (mm) the mode uses; ``None`` for ``"yield"``.
        slenderness: AISC and elastic: Lc/r (torsional: the equivalent pi sqrt(E/Fe));
            EN 1993-1-1: the non-dimensional slenderness lambda-bar. ``None`` for ``"yield"``.
        Pe: elastic critical load (N), Ncr for EN; ``None`` for ``"yield"``.
        Fcr: critical stress (MPa) as the code defines it (AISC Fcr; EN chi fy Aeff/A;
            elastic min(Pe/A, Fy)).
        Pn: nominal strength of this mode (N), before any resistance or partial factor.
        applies: False for a mode reported but not applied (torsional buckling of a section
            closed for torsion: hollow, or built up and closed by its ties); ``choose`` sets it.

    Example:
        >>> m = ModeResult("yield", None, None, None, np.array(250.0), np.array(1e6))
        >>> float(m.Pn)
        1000000.0
    """

    mode: str
    Lc: np.ndarray | None
    slenderness: np.ndarray | None
    Pe: np.ndarray | None
    Fcr: np.ndarray
    Pn: np.ndarray
    applies: bool = True


@dataclass
class Warning:  # noqa: A001 - the API name; it never replaces the builtin outside this package
    """A condition the engineer must see, and the columns of the batch it applies to.

    Args:
        code: short stable key, e.g. ``"slenderness-over-200"``, ``"class-4"``.
        message: one plain sentence.
        mask: bool per column, True where the warning applies.

    Example:
        >>> Warning("class-4", "effective area used", np.array([True, False])).mask.sum()
        np.int64(1)
    """

    code: str
    message: str
    mask: np.ndarray


@dataclass
class CodeResult:
    """The axial strength of a batch of columns under one code.

    Args:
        code: ``"elastic"``, ``"aisc360-22"`` or ``"en1993-1-1"``.
        basis: ``"lrfd"``, ``"asd"``, ``"en"`` or ``"none"`` (elastic: no factor).
        nominal: lowest nominal strength over the modes (N); NaN where the code gives none.
        design: the design or allowable strength (N): phi Pn, Pn/Omega, Nb,Rd, or for the
            elastic check the nominal value itself (no factor).
        governing: name of the governing mode per column (str array; ``""`` where nominal is NaN).
        modes: the ``ModeResult`` of every mode, keyed by mode name.
        trace: every step of the calculation.
        warnings: conditions that apply to some columns (only those that apply to at least one).

    Example:
        >>> one = np.array(1.0)
        >>> r = CodeResult("elastic", "none", one, one, np.array("yield"), {}, Trace(), [])
        >>> str(r.governing)
        'yield'
    """

    code: str
    basis: str
    nominal: np.ndarray
    design: np.ndarray
    governing: np.ndarray
    modes: dict[str, ModeResult]
    trace: Trace
    warnings: list[Warning] = field(default_factory=list)

    def warning(self, code: str) -> Warning | None:
        """The warning with this ``code``, or None.

        Example:
            >>> one = np.array(1.0)
            >>> r = CodeResult("elastic", "none", one, one, np.array("yield"), {}, Trace(), [])
            >>> r.warning("x") is None
            True
        """
        return next((w for w in self.warnings if w.code == code), None)
