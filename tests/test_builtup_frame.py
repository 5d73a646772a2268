"""Laced and battened columns against an independent plane-frame model.

No published worked example of a laced or a battened column could be read in full for these
tests: the one found (the laced column of Appendix A of "Single-Storey Steel Buildings, Part 6:
Detailed design of built-up columns", Steel Buildings in Europe, ArcelorMittal / Peiner Träger /
Corus, technical content CTICM and SCI) was available only as its opening pages, without the
appendix. So the built-up rules are checked here by an independent method instead: each column
is modelled as the plane frame it is, member by member, and analysed by finite elements written
in this file (numpy only, nothing from fieldcol):

* the chords and battens as beams (cubic Euler-Bernoulli elements with the consistent geometric
  stiffness), the lacing bars as pin-ended bars, rigid tie plates at the ends, the column pinned
  at both ends through them; two planes of lacing or battens as one bar or beam of twice the
  area or second moment (the frame is symmetric about its own plane);
* a linear buckling analysis (static axial forces under a unit load, then the least root of
  det(K + lambda Kg) = 0) and a linear second-order analysis of the frame built on a sine bow.

This is the classical matrix method of frame stability (common practice); it knows nothing of
the smeared model of EN 1993-1-1 6.4 (Sv, Ieff, Engesser's 1/Pcr = 1/Pe + 1/Sv), so it can say
whether fieldcol's values are what the frame does. The chord properties (Ach, Ich, h0) are the
ones fieldcol computes from the catalogue channel's outline (checked against catalogues
elsewhere): what is checked here is the stability model, not the section properties.

Tolerances follow from what the smeared model leaves out, measured with this frame (numbers in
each test): the panels are discrete and the end panels are stiffened by the end tie plates, so
the frame's buckling load is a little above the smeared one and comes down to it as the panels
get more numerous; the EN chord and lacing forces neglect the chords' own bending stiffness (for
laced members Ieff = 0.5 h0^2 Ach), so they lie above the frame's.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from fieldcol.codes.builtup import check_builtup, chord_force, shear_stiffness
from fieldcol.sections._builtup import Battens, Lacing, OpenAxis, angles_box, channels
from fieldcol.sections._parts import catalogue_part

E = 210000.0          # MPa (EN 1993-1-1 3.2.6)
G = 81000.0


# --- the independent frame model -------------------------------------------------------------

def _k_local(E: float, A: float, I: float, L: float) -> np.ndarray:
    """Elastic stiffness of a plane beam (I = 0: a pin-ended bar) in its own axes
    (u along, v across, theta at each end)."""
    a, b, c, d = E * A / L, 12 * E * I / L**3, 6 * E * I / L**2, E * I / L
    return np.array([[a, 0, 0, -a, 0, 0], [0, b, c, 0, -b, c], [0, c, 4 * d, 0, -c, 2 * d],
                     [-a, 0, 0, a, 0, 0], [0, -b, -c, 0, b, -c], [0, c, 2 * d, 0, -c, 4 * d]])


def _kg_local(N: float, L: float, beam: bool) -> np.ndarray:
    """Geometric stiffness for an axial force N (tension positive): the consistent matrix of a
    cubic beam, or the string term of a pin-ended bar."""
    if not beam:
        g = np.zeros((6, 6))
        g[1, 1] = g[4, 4] = N / L
        g[1, 4] = g[4, 1] = -N / L
        return g
    f = N / (30 * L)
    return f * np.array([[0, 0, 0, 0, 0, 0], [0, 36, 3 * L, 0, -36, 3 * L],
                         [0, 3 * L, 4 * L * L, 0, -3 * L, -L * L], [0, 0, 0, 0, 0, 0],
                         [0, -36, -3 * L, 0, 36, -3 * L], [0, 3 * L, -L * L, 0, -3 * L, 4 * L * L]])


class Frame:
    """A plane frame of one steel (modulus E, MPa): nodes (x across the column, y along it,
    mm), members (i, j, A, I, beam), supports (node, dof), loads {node: (Fx, Fy)} (N)."""

    def __init__(self, E: float) -> None:
        self.E = E
        self.xy: list[tuple[float, float]] = []
        self.members: list[tuple[int, int, float, float, bool]] = []
        self.fixed: list[tuple[int, int]] = []
        self.loads: dict[int, tuple[float, float]] = {}

    def node(self, x: float, y: float) -> int:
        self.xy.append((x, y))
        return len(self.xy) - 1

    def member(self, i: int, j: int, A: float, I: float, beam: bool = True) -> int:
        self.members.append((i, j, A, I, beam))
        return len(self.members) - 1

    def _geometry(self, m: tuple) -> tuple[np.ndarray, np.ndarray, float]:
        i, j = m[0], m[1]
        (x1, y1), (x2, y2) = self.xy[i], self.xy[j]
        L = math.hypot(x2 - x1, y2 - y1)
        c, s = (x2 - x1) / L, (y2 - y1) / L
        R = np.array([[c, s, 0], [-s, c, 0], [0, 0, 1.0]])
        T = np.zeros((6, 6))
        T[:3, :3] = T[3:, 3:] = R
        return np.r_[3 * i:3 * i + 3, 3 * j:3 * j + 3], T, L

    def _free(self) -> np.ndarray:
        return np.setdiff1d(np.arange(3 * len(self.xy)), [3 * n + d for n, d in self.fixed])

    def stiffness(self) -> np.ndarray:
        n = 3 * len(self.xy)
        K = np.zeros((n, n))
        for m in self.members:
            idx, T, L = self._geometry(m)
            K[np.ix_(idx, idx)] += T.T @ _k_local(self.E, m[2], m[3] if m[4] else 0.0, L) @ T
        # a node joined by bars only has no stiffness in rotation: hold it (it carries nothing)
        K[np.diag_indices(n)] += np.where(np.diag(K) == 0, 1.0, 0.0)
        return K

    def geometric(self, u: np.ndarray) -> np.ndarray:
        n = 3 * len(self.xy)
        Kg = np.zeros((n, n))
        for m, N in zip(self.members, self.axial(u)):
            idx, T, L = self._geometry(m)
            Kg[np.ix_(idx, idx)] += T.T @ _kg_local(N, L, m[4]) @ T
        return Kg

    def axial(self, u: np.ndarray) -> list[float]:
        """Axial force of every member (tension positive) for the displacements u."""
        out = []
        for m in self.members:
            idx, T, L = self._geometry(m)
            ul = T @ u[idx]
            out.append(self.E * m[2] / L * (ul[3] - ul[0]))
        return out

    def force_vector(self, scale: float = 1.0) -> np.ndarray:
        F = np.zeros(3 * len(self.xy))
        for node, (fx, fy) in self.loads.items():
            F[3 * node] += scale * fx
            F[3 * node + 1] += scale * fy
        return F

    def solve(self, K: np.ndarray, F: np.ndarray) -> np.ndarray:
        free = self._free()
        u = np.zeros(len(F))
        u[free] = np.linalg.solve(K[np.ix_(free, free)], F[free])
        return u

    def buckling_load(self) -> float:
        """The least load factor of the loads at which the frame buckles (linear buckling):
        the least root of K x = lambda (-Kg) x, by inverse iteration with the Rayleigh quotient
        (the next mode of a column is well apart from the first, so it converges in a few tens
        of steps; a full eigen-solution gives the same to 1e-9 but costs more)."""
        K = self.stiffness()
        Kg = self.geometric(self.solve(K, self.force_vector()))
        free = self._free()
        Kf, Gf = K[np.ix_(free, free)], -Kg[np.ix_(free, free)]
        Ki = np.linalg.inv(Kf)
        x = np.random.default_rng(1).standard_normal(len(free))
        lam = np.inf
        for _ in range(500):
            x = Ki @ (Gf @ x)
            x /= np.linalg.norm(x)
            before, lam = lam, float(x @ Kf @ x) / float(x @ Gf @ x)
            if abs(lam - before) <= 1e-11 * abs(lam):
                return lam
        raise AssertionError("the buckling analysis did not converge")

    def second_order(self, factor: float) -> list[np.ndarray]:
        """Each member's end forces in its own axes (N1, V1, M1, N2, V2, M2; N and N mm; the
        axial force, tension positive, is the fourth) under factor x the loads, equilibrium on
        the displaced frame (linear second-order analysis: (K + factor Kg) u = factor F)."""
        K = self.stiffness()
        u1 = self.solve(K, self.force_vector())
        u = self.solve(K + factor * self.geometric(u1), self.force_vector(factor))
        out = []
        for m, N in zip(self.members, self.axial(u1)):
            idx, T, L = self._geometry(m)
            k = _k_local(self.E, m[2], m[3] if m[4] else 0.0, L) + _kg_local(factor * N, L, m[4])
            out.append(k @ T @ u[idx])
        return out


def _pitch(ax: OpenAxis) -> float:
    return ax.tie.pitch if isinstance(ax.tie, Lacing) else ax.a


def _ties(fr: Frame, ax: OpenAxis, A: list[int], B: list[int], sub: int, panels: int,
          ends: bool) -> list[int]:
    """Lacing bars, battens or stitch ties between the chord nodes A and B (``sub`` chord
    elements per half panel); returns their member numbers."""
    tie, bars = ax.tie, []
    if tie is None or isinstance(tie, Battens):
        A_b = tie.planes * tie.depth * tie.thickness if tie else 1e3 * ax.Ach
        I_b = tie.planes * tie.I if tie else 1e3 * ax.Ich
        for p in range(0 if ends else 1, panels + (1 if ends else 0)):
            bars.append(fr.member(A[2 * sub * p], B[2 * sub * p], A_b, I_b))
        return bars
    Ad = tie.planes * tie.area
    for p in range(panels):
        k0, k1, k2 = 2 * sub * p, 2 * sub * p + sub, 2 * sub * (p + 1)
        if tie.kind == "single":       # zig-zag: one diagonal per half pitch
            bars += [fr.member(A[k0], B[k1], Ad, 0.0, False), fr.member(B[k1], A[k2], Ad, 0.0, False)]
        elif tie.kind == "double":     # crossed, not joined at the crossing
            bars += [fr.member(A[k0], B[k2], Ad, 0.0, False), fr.member(B[k0], A[k2], Ad, 0.0, False)]
        else:                          # diagonal and post, the post of the diagonal's bar
            bars.append(fr.member(A[k0], B[k2], Ad, 0.0, False))
            if ends or p < panels - 1:
                bars.append(fr.member(A[k2], B[k2], Ad, 0.0, False))
    return bars


def column_frame(ax: OpenAxis, panels: int, bow: float = 0.0, E: float = E
                 ) -> tuple[Frame, list[int], list[int], list[int]]:
    """A pin-ended column of ``panels`` panels: the chords h0 apart, rigid tie plates at both
    ends, supported at their middles, a unit load at the top; every node moved across by
    bow sin(pi y / L). Returns (frame, chord A members, chord B members, lacing bars or
    battens)."""
    a = _pitch(ax)
    L = panels * a
    sub = 2 if not isinstance(ax.tie, Lacing) else 1     # chord elements per half panel
    m = 2 * sub * panels
    fr = Frame(E)
    shift = lambda y: bow * math.sin(math.pi * y / L)   # noqa: E731
    A = [fr.node(-ax.h0 / 2 + shift(k * L / m), k * L / m) for k in range(m + 1)]
    B = [fr.node(ax.h0 / 2 + shift(k * L / m), k * L / m) for k in range(m + 1)]
    chord_a = [fr.member(p, q, ax.Ach, ax.Ich) for p, q in zip(A[:-1], A[1:])]
    chord_b = [fr.member(p, q, ax.Ach, ax.Ich) for p, q in zip(B[:-1], B[1:])]
    mids = []
    for k in (0, m):                                     # rigid end tie plates
        mid = fr.node(0.0, k * L / m)
        mids.append(mid)
        fr.member(A[k], mid, 1e3 * ax.Ach, 1e5 * ax.Ich)
        fr.member(mid, B[k], 1e3 * ax.Ach, 1e5 * ax.Ich)
    bars = _ties(fr, ax, A, B, sub, panels, ends=False)
    fr.fixed = [(mids[0], 0), (mids[0], 1), (mids[1], 0)]
    fr.loads = {mids[1]: (0.0, -1.0)}
    return fr, chord_a, chord_b, bars


def panel_shear_stiffness(ax: OpenAxis, panels: int = 12) -> float:
    """Sv of the frame itself: a cantilever of ``panels`` panels, fixed at its foot, the chords
    made axially rigid (so the whole member does not bend), a shear V at its head; Sv = V a /
    (sideways shift over one pitch a, mid-height, where the end effects have died out)."""
    a, sub = _pitch(ax), 2
    m = 2 * sub * panels
    fr = Frame(E)
    A = [fr.node(-ax.h0 / 2, k * a / (2 * sub)) for k in range(m + 1)]
    B = [fr.node(ax.h0 / 2, k * a / (2 * sub)) for k in range(m + 1)]
    for ch in (A, B):
        for p, q in zip(ch[:-1], ch[1:]):
            fr.member(p, q, 1e6 * ax.Ach, ax.Ich)
    _ties(fr, ax, A, B, sub, panels, ends=True)
    fr.fixed = [(n, d) for n in (A[0], B[0]) for d in range(3)]
    V = 1000.0
    fr.loads = {A[m]: (V / 2, 0.0), B[m]: (V / 2, 0.0)}
    u = fr.solve(fr.stiffness(), fr.force_vector())
    i, j = 2 * sub * (panels // 2), 2 * sub * (panels // 2 + 1)
    shift = (u[3 * A[j]] - u[3 * A[i]] + u[3 * B[j]] - u[3 * B[i]]) / 2
    return V * a / shift


# --- the columns (our own; catalogue channels) ------------------------------------------------

UPN200 = catalogue_part("UPN 200", "section.built.channel", "channel")

TIES = {
    "battens": Battens(600, 100, 8),                 # 24 E Ich / ... below the cap
    "light battens": Battens(600, 60, 6),
    "stiff battens": Battens(600, 150, 8),           # the cap 2 pi^2 E Ich / a^2 governs
    "single lacing": Lacing("single", 40, 8, 500),
    "single lacing, one plane": Lacing("single", 50, 10, 600, planes=1),
    "crossed lacing": Lacing("double", 40, 6, 400),
    "lacing with posts": Lacing("posts", 40, 8, 300),
}


L3X3 = catalogue_part("L3X3X3/8", "section.built.angle", "angle")

#: four angles at the corners of 450 x 350 mm, laced or battened on all four faces: both axes open
BOXES = {
    "box, single lacing": Lacing("single", 40, 8, 500),
    "box, light battens": Battens(600, 80, 6),
}


def built(name: str):
    if name in BOXES:
        return angles_box(L3X3, 450, 350, BOXES[name])
    return channels(UPN200, 150, tie=TIES[name])


def lengths(ax: OpenAxis, L: float) -> tuple[float, float]:
    """(Lc strong, Lc weak): L about the open axis, the solid axis kept out of the way."""
    return (L, 3 * L) if ax.axis == "strong" else (3 * L, L)


def elastic_pcr(b, L: float) -> float:
    """fieldcol's elastic buckling load about the open axis (Engesser)."""
    ax = b.open_axes[0]
    res = check_builtup("elastic", b, 1e6, E, G, *lengths(ax, L), L)
    return float(res.modes[f"flexural-{ax.axis}"].Pe)


# --- the checks --------------------------------------------------------------------------------

@pytest.mark.parametrize("name, axis", [(n, 0) for n in TIES if n != "stiff battens"]
                         + [(n, i) for n in BOXES for i in (0, 1)])
def test_shear_stiffness_is_that_of_the_frame_panel(name, axis):
    # Sv of EN 1993-1-1 Fig. 6.9 (lacing) and (6.73) below its cap (battens) against the
    # frame's own shear stiffness. Both rest on the same idealisation (bars pinned, battens
    # rigidly joined at the chord centrelines), so they agree closely: measured within 0.02 %,
    # what is left being the chords' finite axial stiffness (1e6 times real: the member's own
    # bending is not quite nil) and the decay of the foot's restraint at mid-height.
    # Tolerance 0.1 %.
    ax = built(name).open_axes[axis]
    Sv = shear_stiffness(ax, E)
    if isinstance(ax.tie, Battens):
        assert Sv < 2 * math.pi**2 * E * ax.Ich / ax.a**2      # the cap does not govern here
    assert panel_shear_stiffness(ax) == pytest.approx(Sv, rel=1e-3)


def test_a_wrong_shear_stiffness_would_be_seen():
    # The check above can fail: a plausible slip in the zig-zag's geometry, the diagonal taken
    # over the whole pitch a instead of half of it, gives an Sv 4.9 times too small here, far
    # outside the 0.1 % above.
    ax = built("single lacing").open_axes[0]
    t = ax.tie
    d = math.hypot(ax.h0, ax.a)
    wrong = t.planes * E * t.area * ax.a * ax.h0**2 / (2 * d**3)
    assert panel_shear_stiffness(ax) != pytest.approx(wrong, rel=0.1)


@pytest.mark.parametrize("name", ["battens", "light battens", "stiff battens", "single lacing",
                                  "crossed lacing", "lacing with posts", *BOXES])
def test_buckling_load_is_that_of_the_frame(name):
    # Engesser's 1/Pcr = 1/Pe + 1/Sv with Pe = pi^2 E I / L^2 of the whole section (fieldcol's
    # elastic check) against the frame's linear buckling load. The smeared model has no panels
    # and no end tie plates (which stiffen the end panels): the frame comes out stiffer, by
    # an excess that falls as the square of the number of panels, fieldcol being its limit
    # (measured, frame / fieldcol - 1: 20 panels +0.3 to +5.6 %, the most with light battens,
    # where shear governs and the end panels count most; 40 panels +0.07 to +1.3 %, each a
    # fifth to a quarter of its 20-panel value). So: never below by more than 0.5 % (the
    # safe side), at most 6 % at 20 panels, and at 40 panels at most 0.3 x the 20-panel excess
    # + 0.1 %. With stiff battens the cap 2 pi^2 E Ich / a^2 (EN 1993-1-1 6.4.3.1) is the Sv
    # used, and the frame agrees with it.
    b = built(name)
    ax = b.open_axes[0]
    excess = []
    for panels in (20, 40):
        fr, *_ = column_frame(ax, panels)
        excess.append(fr.buckling_load() / elastic_pcr(b, panels * _pitch(ax)) - 1)
    assert -0.005 <= excess[0] <= 0.06 and -0.005 <= excess[1]
    assert excess[1] <= 0.3 * excess[0] + 0.001


def test_the_en_critical_load_of_a_laced_column_is_on_the_safe_side():
    # EN 1993-1-1 6.4.2.1 takes Ieff = 0.5 h0^2 Ach for a laced member, leaving out the chords'
    # own 2 Ich: its effective critical load 1/(1/Ncr + 1/Sv) lies below the frame's (measured
    # 1196 kN against 1259 kN), by about the chords' share of I (4.8 % here) and the frame's
    # own 20-panel excess over the smeared model (0.3 % for this column, the test above;
    # allowed 2.5 %).
    b = built("single lacing")
    ax = b.open_axes[0]
    L = 20 * _pitch(ax)
    res = check_builtup("en1993-1-1", b, 355.0, E, G, *lengths(ax, L), L)
    Neff = float(res.modes[f"flexural-{ax.axis}"].Pe)
    fr, *_ = column_frame(ax, 20)
    share = 2 * ax.Ich / (0.5 * ax.h0**2 * ax.Ach + 2 * ax.Ich)
    assert Neff < fr.buckling_load() <= Neff * (1 + share) * 1.025


@pytest.mark.parametrize("name", ["battens", "stiff battens", "single lacing",
                                  "crossed lacing", "lacing with posts"])
def test_chord_force_at_mid_length_is_that_of_the_bowed_frame(name):
    # EN 1993-1-1 6.4.1 (6.69)-(6.71): N_ch,Ed = 0.5 N + M_Ed h0 Ach / (2 Ieff),
    # M_Ed = N e0 / (1 - N/Ncr - N/Sv), e0 = L/500, against the chord's axial force at
    # mid-length in the frame built on a sine bow of L/500 and analysed to second order at
    # N = half the elastic buckling load. The smeared model leaves the chords' own bending
    # out of the moment they share (and for lacing out of Ieff): the frame's chord force is
    # lower, by 2.3 to 3.2 % (measured). fieldcol must be above the frame and within 5 %.
    b = built(name)
    ax = b.open_axes[0]
    L = 20 * _pitch(ax)
    N = 0.5 * elastic_pcr(b, L)
    Nch, _, _ = chord_force(ax, N, L, E)
    fr, chord_a, chord_b, _ = column_frame(ax, 20, bow=L / 500)
    forces = fr.second_order(N)
    half = len(chord_a) // 2
    frame_Nch = -min(forces[m][3] for m in chord_a[half - 1:half + 1] + chord_b[half - 1:half + 1])
    assert 0.95 * Nch <= frame_Nch <= Nch


def ties_at_the_en_capacity(name: str, panels: int = 20):
    """The EN check of the column of ``panels`` panels (S355) and its frame at the check's
    capacity N_b,Rd, where fieldcol reports the forces in the ties. Returns (axis, the check's
    trace values by symbol, the bow's share of every member's end forces in the frame at that
    N, the ties' member numbers, the ratio of the two amplifications).

    The bow's share is the bowed frame's forces less the straight frame's (what the shear does;
    the straight frame's own tie forces come from the chords shortening, which 6.4 does not
    count). The amplifications: EN's 1 / (1 - N/Ncr - N/Sv) with Ieff against the frame's
    1 / (1 - N/Pcr,frame); near the capacity EN's is the larger (Ieff leaves out the chords'
    own stiffness, or all but mu of it), and their ratio is taken out before the forces are
    compared (it is the same for every tie force)."""
    b = built(name)
    ax = b.open_axes[0]
    L = panels * _pitch(ax)
    res = check_builtup("en1993-1-1", b, 355.0, E, G, *lengths(ax, L), L)
    steps = {s.symbol: float(s.value) for s in res.trace.steps if s.unit in ("N", "N*mm")}
    o = ax.axis
    N = steps[f"Nb,Rd,{o}"]
    bowed, _, _, ties = column_frame(ax, panels, bow=L / 500)
    straight, *_ = column_frame(ax, panels)
    share = [f - g for f, g in zip(bowed.second_order(N), straight.second_order(N))]
    ratio = (1 - N / straight.buckling_load()) / (1 - N / steps[f"Ncr,{o}"] - N / steps[f"Sv,{o}"])
    return ax, steps, share, ties, ratio


@pytest.mark.parametrize("name", ["single lacing", "crossed lacing", "lacing with posts"])
def test_lacing_bar_force_is_that_of_the_bowed_frame(name):
    # EN 1993-1-1 6.4.2.2 / 6.4.1 (7): the bars carry V_Ed = pi M_Ed / L, a bar
    # N_d = V_Ed d / (n s h0) (s = 2 for crossed bars sharing the shear), reported by fieldcol
    # at its capacity N_b,Rd; against the bow's share of the bars' forces in the frame at that
    # N (the frame's bar stands for the n planes). The frame's bars carry less: measured 78 to
    # 89 % of fieldcol's, which must never be below the frame's (the safe side). With the
    # amplifications' ratio (1.06 to 1.22 here) taken out, 90 to 95 %: the rest is the shear
    # the chords carry by their own bending and the end panels seeing the shear a little inside
    # the ends. Within 15 % then.
    ax, steps, share, bars, ratio = ties_at_the_en_capacity(name)
    Nd = steps[f"N_d,Ed,{ax.axis}"]
    frame_Nd = max(abs(share[m][3]) for m in bars) / ax.tie.planes
    assert frame_Nd <= Nd
    assert frame_Nd * ratio == pytest.approx(Nd, rel=0.15)


@pytest.mark.parametrize("name", ["battens", "stiff battens"])
def test_batten_shear_and_moment_are_those_of_the_bowed_frame(name):
    # EN 1993-1-1 6.4.3.1 (2), Fig. 6.11: a batten carries V_b = V_Ed a / (n h0) and, at the
    # chord, M_b = V_Ed a / (2 n), reported by fieldcol at its capacity N_b,Rd; against the
    # bow's share of the battens' end forces in the frame at that N (the frame's batten stands
    # for the n planes). The frame's battens carry less: measured 74 to 75 % of fieldcol's,
    # which must never be below the frame's (the safe side). With the amplifications' ratio
    # (1.22 here: mu below 1 at this slenderness) taken out, 90 to 92 %, as for the lacing.
    # Within 15 % then; and the frame's own M_b / V_b is h0 / 2, as EN's pair has it (the
    # batten's point of contraflexure at its middle), within 1 %.
    ax, steps, share, battens, ratio = ties_at_the_en_capacity(name)
    Vb, Mb = steps[f"V_b,Ed,{ax.axis}"], steps[f"M_b,Ed,{ax.axis}"]
    n = ax.tie.planes
    frame_V = max(abs(share[m][1]) for m in battens) / n
    frame_M = max(max(abs(share[m][2]), abs(share[m][5])) for m in battens) / n
    assert frame_V <= Vb and frame_M <= Mb
    assert frame_V * ratio == pytest.approx(Vb, rel=0.15)
    assert frame_M * ratio == pytest.approx(Mb, rel=0.15)
    assert frame_M / frame_V == pytest.approx(ax.h0 / 2, rel=0.01)


def test_aisc_modified_slenderness_with_rigid_ties_is_the_frames():
    # AISC 360-22 E6.1 (snug-tight, rivets taken so): (Lc/r)m = sqrt((Lc/r)o^2 + (a/ri)^2).
    # Two channels 150 mm apart held by stitch ties (rigid) at a = 600 mm: the frame's
    # buckling load gives an equivalent slenderness pi sqrt(E A / Pcr), which must be fieldcol's
    # (Lc/r)m; that formula is Engesser's with Sv = 2 pi^2 E Ich / a^2 (the chord's Euler load
    # over a), so it matches the frame as the battens above do: within 1 % at 20 panels
    # (measured: the frame's slenderness 0.7 % below fieldcol's, on the safe side).
    ch = catalogue_part("C8X11.5", "section.built.channel", "channel")
    b = channels(ch, 150, pitch=600, connection="riveted")
    ax = b.open_axes[0]
    assert ax.tie is None and not ax.back_to_back
    L = 20 * 600.0
    res = check_builtup("aisc360-22", b, 250.0, 200000.0, 77200.0, *lengths(ax, L), L)
    m = float(next(s for s in res.trace.steps if s.symbol == f"(Lc/r)m,{ax.axis}").value)
    fr, *_ = column_frame(ax, 20, E=200000.0)        # AISC's modulus
    Pcr = fr.buckling_load()
    slender = math.pi * math.sqrt(200000.0 * float(b.section.A) / Pcr)
    assert slender == pytest.approx(m, rel=0.01)
