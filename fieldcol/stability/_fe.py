"""Elastic flexural buckling of one column axis by finite elements (numpy only).

Cubic (Hermite) beam elements with two degrees of freedom per node (w, theta), the elastic
stiffness and the consistent geometric stiffness. The problem is solved in dimensionless form
(z/L, EI = 1, L = 1; springs k L^3/EI and r L/EI) so that the matrices stay well scaled whatever
the units; rigid supports remove their degree of freedom rather than adding a penalty.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Sequence

import numpy as np
from numpy.typing import ArrayLike

from fieldcol.errors import InputError
from fieldcol.trace import Trace

from ._ends import SAME, Brace, End, check_braces, check_length, check_spacing, end, sub


_SOFT = 1e-8  # dimensionless spring below which a support is no support at all


@lru_cache(maxsize=1)
def _start() -> np.ndarray:
    """A fixed start for inverse iteration, with no symmetry that could hide the mode (made on
    first use: numpy.random costs ~15 ms to import, on every command's start otherwise)."""
    v = np.random.default_rng(20261201).uniform(0.5, 1.5, 2004)
    v.flags.writeable = False
    return v


@dataclass(frozen=True)
class Buckling:
    """Result of an elastic buckling analysis (one column, or a batch as arrays).

    Fields:
        Pcr: lowest elastic buckling load, N (float, or array of shape (N,) for a batch).
        K: effective length factor sqrt(pi^2 EI / (Pcr L^2)) relative to the full length.
        z: node positions, mm from the bottom (shape (nodes,), or (N, nodes)).
        shape: lateral deflection of the mode at the nodes, scaled so max |w| = 1 (the largest
            deflection is +1).
        n_el: number of elements used (more than asked when braces need their own nodes).
    """

    Pcr: float | np.ndarray
    K: float | np.ndarray
    z: np.ndarray
    shape: np.ndarray
    n_el: int

    def at(self, i: int) -> "Buckling":
        """The result of column ``i`` of a batch.

        Example:
            >>> round(buckling_batch([3000.0, 4000.0], 1e12, "pinned", "pinned").at(1).K, 6)
            1.0
        """
        return Buckling(float(np.asarray(self.Pcr)[i]), float(np.asarray(self.K)[i]),
                        self.z[i], self.shape[i], self.n_el)


@lru_cache(maxsize=256)
def _mesh(fracs: tuple[float, ...], n_el: int):
    """Nodes (z/L), dimensionless elastic and geometric stiffness, node index of each fraction."""
    cuts = [0.0]
    for f in sorted({*fracs, 1.0}):
        if f - cuts[-1] > SAME:
            cuts.append(f)
    cuts[-1] = 1.0
    parts = []
    for a, b in zip(cuts[:-1], cuts[1:]):
        # At least 4 elements between supports keep a half wave within 0.05 %; very short
        # lengths (which never govern) get fewer so that no element is shorter than L/1000.
        n = max(4, int(round(n_el * (b - a))))
        n = min(n, max(1, int((b - a) * 1000)))
        parts.append(np.linspace(a, b, n + 1)[:-1])
    xi = np.concatenate(parts + [np.array([1.0])])
    ne = xi.size - 1
    h = np.diff(xi)
    nd = 2 * xi.size
    one = np.ones_like(h)
    # Element matrices (EI = 1 and P = 1), dof order w_i, theta_i, w_j, theta_j.
    ke = np.array([[12 * one, 6 * h, -12 * one, 6 * h],
                   [6 * h, 4 * h**2, -6 * h, 2 * h**2],
                   [-12 * one, -6 * h, 12 * one, -6 * h],
                   [6 * h, 2 * h**2, -6 * h, 4 * h**2]]) / h**3
    kg = np.array([[36 * one, 3 * h, -36 * one, 3 * h],
                   [3 * h, 4 * h**2, -3 * h, -h**2],
                   [-36 * one, -3 * h, 36 * one, -3 * h],
                   [3 * h, -h**2, -3 * h, 4 * h**2]]) / (30 * h)
    dofs = 2 * np.arange(ne)[:, None] + np.arange(4)[None, :]  # (ne, 4)
    rows = np.broadcast_to(dofs[:, :, None], (ne, 4, 4))
    cols = np.broadcast_to(dofs[:, None, :], (ne, 4, 4))
    K0 = np.zeros((nd, nd))
    Kg0 = np.zeros((nd, nd))
    np.add.at(K0, (rows, cols), ke.transpose(2, 0, 1))
    np.add.at(Kg0, (rows, cols), kg.transpose(2, 0, 1))
    node_of = tuple(int(np.argmin(np.abs(xi - f))) for f in fracs)
    for a in (xi, K0, Kg0):
        a.setflags(write=False)
    return xi, K0, Kg0, node_of


def _as_ends(e: End | str | Sequence[End | str], n: int, field: str) -> tuple[np.ndarray, np.ndarray]:
    """Translation and rotation springs, shape (n,), of one end or one end per column."""
    if isinstance(e, (End, str)):
        one = end(e, field)
        return np.full(n, one.translation), np.full(n, one.rotation)
    if len(e) != n:
        raise InputError(field, f"{len(e)} ends", f"needs one end per column ({n})",
                         "give one End for all, or one per column")
    ends = [end(x, f"{field}[{i}]") for i, x in enumerate(e)]
    return (np.array([x.translation for x in ends]), np.array([x.rotation for x in ends]))


def _positive(x: ArrayLike, field: str, what: str) -> np.ndarray:
    try:
        a = np.asarray(x, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, x, "not a number", what) from None
    bad = ~(np.isfinite(a) & (a > 0))
    if bad.any():
        i = tuple(int(j) for j in np.argwhere(bad)[0])
        raise InputError(field + (str(list(i)) if i else ""), float(a[i]),
                         "must be finite and > 0", what)
    return a


def _stable(S: np.ndarray) -> np.ndarray:
    """Whether the supports (springs at the dofs, shape (N, nd)) stop every rigid-body motion.

    A beam moves as a rigid body by w = a + b z; a translational support at z_i forbids
    a + b z_i = 0 only, a rotational one b = 0. Two distinct translational supports, or one
    translational and one rotational, leave no rigid-body motion: the stiffness is then
    positive definite, and otherwise singular.
    """
    nt = np.count_nonzero(S[:, 0::2] > 0, axis=1)
    nr = np.count_nonzero(S[:, 1::2] > 0, axis=1)
    return (nt >= 2) | ((nt >= 1) & (nr >= 1))


def _mechanism_error(S_row: np.ndarray, xi: np.ndarray, field: str) -> InputError:
    held = np.flatnonzero(S_row[0::2] > 0)
    if held.size == 0:
        return InputError(field, "no point held against sway",
                          "mechanism: nothing holds the column against sway",
                          "hold an end against sway or add a brace")
    return InputError(field, f"held against sway only at z/L = {xi[held[0]]:g}",
                      "mechanism: the column can rotate freely about its only support",
                      "hold a second point against sway or an end against rotation")


def _solve(Kf: np.ndarray, Kgf: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Lowest positive eigenvalue P of Kf phi = P Kgf phi (Kf stacked and positive definite)."""
    C = np.linalg.cholesky(Kf)
    Ci = np.linalg.inv(C)
    A = Ci @ Kgf @ np.swapaxes(Ci, -1, -2)
    A = 0.5 * (A + np.swapaxes(A, -1, -2))
    # Largest mu = 1/P gives the lowest buckling load; Kg is semi-definite so mu_max > 0.
    mu = np.linalg.eigvalsh(A)[..., -1]
    # Its vector by inverse iteration with a shift just past mu: a full eigh of a stack costs
    # some twenty times more than the eigenvalues alone.
    n = A.shape[-1]
    start = _start()
    y = np.broadcast_to(start[:n] if n <= start.size else np.ones(n), A.shape[:-1]).copy()
    shifted = A - (mu * (1 + 1e-9))[..., None, None] * np.eye(n)
    for _ in range(2):
        y = np.linalg.solve(shifted, y[..., None])[..., 0]
        y /= np.linalg.norm(y, axis=-1, keepdims=True)
    phi = np.swapaxes(Ci, -1, -2) @ y[..., None]
    return 1.0 / mu, phi[..., 0]


def buckling_batch(L: ArrayLike, EI: ArrayLike, bottom: End | str | Sequence[End | str],
                   top: End | str | Sequence[End | str], brace_fractions: Sequence[float] = (),
                   brace_stiffness: ArrayLike = math.inf, n_el: int = 20,
                   field: str = "columns") -> Buckling:
    """Elastic buckling of many columns of one layout, solved together.

    Columns share the brace positions as fractions of their length; lengths, EI, end springs
    (one ``End`` per column allowed) and brace stiffnesses may differ. Columns whose supports are
    all rigid or absent share one dimensionless solution (Pcr scales as EI/L^2); columns with
    finite springs are solved as a stack.

    Args:
        L: lengths, mm (shape (N,) or scalar).
        EI: flexural rigidity, N*mm^2 (broadcast against L).
        bottom, top: an end for all columns, or one per column.
        brace_fractions: brace positions as z/L, each in [0, 1] (0 or 1 holds that end); equal
            fractions act together, fractions closer than 1e-4 are refused.
        brace_stiffness: N/mm, broadcast to (N, braces); ``math.inf`` for rigid.
        n_el: elements along the column (each length between braces gets at least 4).
        field: the restraints field named in errors (``field[i]`` for column i).

    Returns:
        ``Buckling`` with arrays: Pcr (N,), K (N,), z (N, nodes), shape (N, nodes).

    Example:
        >>> r = buckling_batch([3000.0, 6000.0], 2.0e12, "fixed", "free")
        >>> r.K.round(4).tolist()
        [2.0, 2.0]
    """
    L = _positive(L, sub(field, "L"), "a length in mm")
    EI = _positive(EI, sub(field, "EI"), "EI in N*mm^2")
    L, EI = np.broadcast_arrays(np.atleast_1d(L), np.atleast_1d(EI))
    if L.ndim != 1:
        raise InputError(sub(field, "L"), L.shape, "a batch is one-dimensional", "shape (N,)")
    N = L.size
    if isinstance(n_el, bool) or not isinstance(n_el, (int, np.integer)) or not 2 <= n_el <= 500:
        raise InputError(sub(field, "n_el"), n_el, "elements must be a whole number 2..500",
                         "20 is plenty for K to 0.05 %")
    fracs = []
    for i, f in enumerate(brace_fractions):
        if isinstance(f, bool) or not isinstance(f, (int, float, np.floating, np.integer)) \
                or not (0.0 <= f <= 1.0):
            raise InputError(sub(field, f"braces[{i}].at"), f, "brace fraction outside 0..1",
                             "z/L from the bottom")
        fracs.append(float(f))
    check_spacing(fracs, None, field)
    nb = len(fracs)
    try:
        kb = np.broadcast_to(np.asarray(brace_stiffness, dtype=float), (N, nb)) if nb \
            else np.zeros((N, 0))
    except (TypeError, ValueError):
        raise InputError(sub(field, "braces"), brace_stiffness,
                         "brace stiffness does not match the braces", "shape (N, braces)") from None
    if nb and bool(np.any(np.isnan(kb) | (kb <= 0))):
        i, j = (int(x) for x in np.argwhere(np.isnan(kb) | (kb <= 0))[0])
        raise InputError(sub(field, f"braces[{j}].stiffness"), float(kb[i, j]),
                         "a brace with no stiffness holds nothing",
                         "remove the brace, or give its stiffness in N/mm")
    bt, br = _as_ends(bottom, N, sub(field, "bottom"))
    tt, tr = _as_ends(top, N, sub(field, "top"))

    xi, K0, Kg0, node_of = _mesh(tuple(fracs), int(n_el))
    nn = xi.size
    nd = 2 * nn
    S = np.zeros((N, nd))  # support springs in N/mm and N*mm/rad; inf + x stays inf
    S[:, 0] += bt
    S[:, 1] += br
    S[:, nd - 2] += tt
    S[:, nd - 1] += tr
    for j, node in enumerate(node_of):
        S[:, 2 * node] += kb[:, j]
    ok = _stable(S)
    if not ok.all():
        i = int(np.flatnonzero(~ok)[0])
        raise _mechanism_error(S[i], xi, field if N == 1 else f"{field}[{i}]")
    # Dimensionless springs: k L^3 / EI for translation, r L / EI for rotation.
    scale = np.empty((N, nd))
    scale[:, 0::2] = (L**3 / EI)[:, None]
    scale[:, 1::2] = (L / EI)[:, None]
    with np.errstate(invalid="ignore"):
        Sd = np.where(S == 0, 0.0, S * scale)
    # A spring below _SOFT of the column's own stiffness is lost in rounding; if the column
    # leans on such springs alone, its load would be numerical noise, so say so instead.
    firm = _stable(np.where(Sd >= _SOFT, Sd, 0.0))
    if not firm.all():
        i = int(np.flatnonzero(~firm)[0])
        raise InputError(field if N == 1 else f"{field}[{i}]", "springs",
                         "the springs are too soft to hold the column "
                         f"(below {_SOFT:g} of EI/L^3 or EI/L)",
                         "treat a very soft support as free, and hold the column elsewhere")
    rigid = np.isinf(Sd)
    finite = (Sd > 0) & ~rigid
    key = np.concatenate([rigid, finite.any(axis=1, keepdims=True)], axis=1)
    patterns, group = np.unique(key, axis=0, return_inverse=True)
    group = np.ravel(group)
    Pt = np.empty(N)
    full = np.zeros((N, nd))
    for gi, pat in enumerate(patterns):  # one pass per support layout, not per column
        idx = np.flatnonzero(group == gi)
        free = ~pat[:nd]
        Kf = K0[np.ix_(free, free)]
        Kgf = Kg0[np.ix_(free, free)]
        if pat[nd]:
            Kf = Kf + Sd[idx][:, free][:, :, None] * np.eye(free.sum())
        else:
            Kf = Kf[None]
        try:
            p, phi = _solve(Kf, Kgf)
        except np.linalg.LinAlgError:
            bad = int(idx[0])
            raise InputError(field if N == 1 else f"{field}[{bad}]", "springs",
                             "the springs are too soft to hold the column",
                             "treat a very soft support as free") from None
        Pt[idx] = p
        sel = np.ix_(idx, np.flatnonzero(free))
        full[sel] = phi if pat[nd] else np.broadcast_to(phi, (idx.size, phi.shape[-1]))
    w = full[:, 0::2]
    big = np.take_along_axis(w, np.argmax(np.abs(w), axis=1)[:, None], axis=1)
    shape = w / big
    Pcr = Pt * EI / L**2
    K = np.pi / np.sqrt(Pt)
    return Buckling(Pcr, K, xi[None, :] * L[:, None], shape, nn - 1)


def buckling_analysis(L: float, EI: float, bottom: End | str, top: End | str,
                      braces: Sequence[Brace] = (), n_el: int = 20, field: str = "column",
                      trace: Trace | None = None) -> Buckling:
    """Elastic buckling load and mode of one column axis by finite elements.

    Springs at the ends and braces enter the stiffness; rigid ones remove their degree of
    freedom. Nodes sit exactly at the brace points.

    Args:
        L: length, mm.
        EI: flexural rigidity about the axis, N*mm^2.
        bottom, top: the ends (``End`` or a name).
        braces: brace points (``at`` in mm, 0..L; ``stiffness`` N/mm, inf = rigid); two at one
            point act together (their stiffnesses add); points closer than 1e-4 L but not at
            the same point are refused (enter them as one).
        n_el: elements along the column (20 gives K to better than 0.05 %); every length
            between braces gets at least 4, so the count used may be larger.
        field: the restraints field named in errors.
        trace: if given, Pcr and K are appended to it.

    Returns:
        ``Buckling(Pcr, K, z, shape, n_el)`` with floats for Pcr and K.

    Raises:
        InputError: bad input, or supports that leave the column a mechanism.

    Example:
        >>> round(buckling_analysis(4000.0, 1.0e12, "fixed", "pinned").K, 3)
        0.699
    """
    L = check_length(L, sub(field, "L"))
    braces = check_braces(braces, L, field)
    r = buckling_batch(L, EI, bottom, top, [b.at / L for b in braces],
                       [[b.stiffness for b in braces]] if braces else math.inf, n_el, field)
    out = r.at(0)
    if trace is not None:
        trace.add("Pcr", "elastic buckling load", "lowest eigenvalue of K phi = P Kg phi",
                  out.Pcr, "N", "elastic stability (finite elements)")
        trace.add("K", "effective length factor", "pi sqrt(EI / Pcr) / L", out.K, "", "")
    return out
