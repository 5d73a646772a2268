"""Outlines of plates, angles, channels and tees as polygons, and their section properties.

A part is a simple polygon (counter-clockwise, mm); round corners are arcs of many short chords
(``ARC_STEPS`` per quarter circle: the area a chord cuts off is below 1e-4 of a fillet's own,
so the properties are exact to far better than the 0.5 % the tests ask). Properties of a polygon
follow from Green's theorem (closed-form sums over the edges); a section of several parts in
contact adds them (the parallel-axis theorem is implicit: every sum is about one origin).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

ARC_STEPS = 24


@dataclass(frozen=True)
class Outline:
    """One part as a polygon: ``xy`` an (n, 2) array of corners, counter-clockwise, mm."""

    xy: np.ndarray
    name: str = ""

    def moved(self, dx: float = 0.0, dy: float = 0.0) -> "Outline":
        """The outline shifted by (dx, dy) mm.

        Example:
            >>> float(plate(10, 2).moved(5, 0).box()[0])
            0.0
        """
        return Outline(self.xy + np.array([dx, dy]), self.name)

    def turned(self, quarter_turns: int) -> "Outline":
        """Rotated counter-clockwise about the origin by 90 degrees per turn (still CCW)."""
        k = quarter_turns % 4
        x, y = self.xy[:, 0], self.xy[:, 1]
        for _ in range(k):
            x, y = -y, x
        return Outline(np.column_stack([x, y]), self.name)

    def mirrored(self) -> "Outline":
        """Mirrored in the y axis (x -> -x), with the corner order reversed to stay CCW."""
        xy = self.xy[::-1].copy()
        xy[:, 0] *= -1
        return Outline(xy, self.name)

    def box(self) -> np.ndarray:
        """(xmin, ymin, xmax, ymax) of the outline.

        Example:
            >>> plate(10, 2).box().tolist()
            [-5.0, -1.0, 5.0, 1.0]
        """
        return np.array([*self.xy.min(axis=0), *self.xy.max(axis=0)])

    def placed(self, x: float, y: float, at: str = "min") -> "Outline":
        """Shifted so that its bounding box's lower-left corner (``at="min"``) or centre
        (``"mid"``) lies at (x, y)."""
        b = self.box()
        ref = b[:2] if at == "min" else (b[:2] + b[2:]) / 2
        return self.moved(x - ref[0], y - ref[1])


def properties(parts: list[Outline] | Outline) -> dict[str, float]:
    """Area, centroid and second moments (about the centroid) of one or more outlines.

    Args:
        parts: outlines in contact (not overlapping).
    Returns:
        ``A``, ``cx``, ``cy``, ``Ix``, ``Iy``, ``Ixy`` (mm^2, mm, mm^4), and the principal
        ``Imax``, ``Imin``.

    Example:
        >>> p = properties(plate(100, 10))
        >>> round(p["A"]), round(p["Ix"]), round(p["Iy"])
        (1000, 8333, 833333)
    """
    if isinstance(parts, Outline):
        parts = [parts]
    A = Sx = Sy = Ixx = Iyy = Ixy = 0.0
    for p in parts:
        x, y = p.xy[:, 0], p.xy[:, 1]
        x1, y1 = np.roll(x, -1), np.roll(y, -1)
        c = x * y1 - x1 * y
        A += c.sum() / 2
        Sx += ((x + x1) * c).sum() / 6
        Sy += ((y + y1) * c).sum() / 6
        Ixx += ((y * y + y * y1 + y1 * y1) * c).sum() / 12
        Iyy += ((x * x + x * x1 + x1 * x1) * c).sum() / 12
        Ixy += ((x * y1 + 2 * x * y + 2 * x1 * y1 + x1 * y) * c).sum() / 24
    cx, cy = Sx / A, Sy / A
    Ix, Iy, Pxy = Ixx - A * cy**2, Iyy - A * cx**2, Ixy - A * cx * cy
    mid, rad = (Ix + Iy) / 2, float(np.hypot((Ix - Iy) / 2, Pxy))
    return {"A": A, "cx": cx, "cy": cy, "Ix": Ix, "Iy": Iy, "Ixy": Pxy,
            "Imax": mid + rad, "Imin": mid - rad}


def _rounded(corners: list[tuple[float, float, float]], name: str) -> Outline:
    """A polygon from its corners (x, y, radius), each corner with a radius > 0 replaced by a
    circular arc tangent to both edges (a convex toe or a concave root alike)."""
    pts: list[tuple[float, float]] = []
    n = len(corners)
    for i, (x, y, r) in enumerate(corners):
        if r <= 0:
            pts.append((x, y))
            continue
        p = np.array([x, y])
        u1 = np.array(corners[i - 1][:2]) - p
        u2 = np.array(corners[(i + 1) % n][:2]) - p
        u1, u2 = u1 / np.linalg.norm(u1), u2 / np.linalg.norm(u2)
        theta = np.arccos(np.clip(u1 @ u2, -1.0, 1.0))     # the corner's angle
        t1, t2 = p + u1 * r / np.tan(theta / 2), p + u2 * r / np.tan(theta / 2)
        bis = (u1 + u2) / np.linalg.norm(u1 + u2)
        c = p + bis * r / np.sin(theta / 2)
        a1 = np.arctan2(*(t1 - c)[::-1])
        a2 = np.arctan2(*(t2 - c)[::-1])
        sweep = (a2 - a1 + np.pi) % (2 * np.pi) - np.pi       # the short way round
        k = max(2, int(np.ceil(abs(sweep) / (np.pi / 2) * ARC_STEPS)))
        for a in np.linspace(a1, a1 + sweep, k + 1):
            pts.append((c[0] + r * np.cos(a), c[1] + r * np.sin(a)))
    return _clean(pts, name)


def _clean(points: list[tuple[float, float]], name: str) -> Outline:
    xy = np.array(points, dtype=float)
    keep = np.ones(len(xy), dtype=bool)
    keep[1:] = np.any(np.abs(np.diff(xy, axis=0)) > 1e-9, axis=1)
    xy = xy[keep]
    if np.allclose(xy[0], xy[-1]):
        xy = xy[:-1]
    return Outline(xy, name)


def plate(b: float, t: float, name: str = "plate") -> Outline:
    """A flat plate ``b`` wide (x) and ``t`` thick (y), centred on the origin."""
    return _clean([(-b / 2, -t / 2), (b / 2, -t / 2), (b / 2, t / 2), (-b / 2, t / 2)], name)


def angle(d: float, b: float, t: float, r1: float = 0.0, r2: float = 0.0,
          name: str = "angle") -> Outline:
    """An angle with its heel at the origin, leg ``b`` along +x and leg ``d`` along +y.

    Args:
        d, b: leg lengths (mm); t: thickness; r1: root fillet radius; r2: toe radius.

    Example:
        >>> a = properties(angle(100, 100, 10))
        >>> round(a["A"]), round(float(a["cx"]), 2)
        (1900, 28.68)
    """
    return _rounded([(0.0, 0.0, 0.0), (b, 0.0, 0.0), (b, t, r2), (t, t, r1), (t, d, r2),
                     (0.0, d, 0.0)], name)


def channel(d: float, bf: float, tf: float, tw: float, r1: float = 0.0, r2: float = 0.0,
            name: str = "channel", slope: float = 0.0) -> Outline:
    """A channel with its web's back on x = 0, flanges along +x, depth ``d`` from y = 0.

    ``tf`` is the flange thickness halfway between the web face and the toe; with a
    ``slope`` (rise over run of the inner flange face: 1/6 for AISC C and MC shapes, 8 % for
    UPN, from memory) the flange is thicker at the root and thinner at the toe by
    slope x (bf - tw) / 2.

    Example:
        >>> round(properties(channel(200, 75, 10, 8))["A"])
        2940
    """
    half = slope * (bf - tw) / 2
    t_root, t_toe = tf + half, tf - half
    return _rounded([(0.0, 0.0, 0.0), (bf, 0.0, 0.0), (bf, t_toe, r2), (tw, t_root, r1),
                     (tw, d - t_root, r1), (bf, d - t_toe, r2), (bf, d, 0.0), (0.0, d, 0.0)],
                    name)


def tee(d: float, bf: float, tf: float, tw: float, r1: float = 0.0, name: str = "tee") -> Outline:
    """A tee: flange ``bf`` x ``tf`` on top (y from d - tf to d), stem ``tw`` centred on x = 0
    down to y = 0, root fillets ``r1``.

    Example:
        >>> round(properties(tee(100, 100, 10, 10))["A"])
        1900
    """
    h = d - tf
    return _rounded([(-tw / 2, 0.0, 0.0), (tw / 2, 0.0, 0.0), (tw / 2, h, r1), (bf / 2, h, 0.0),
                     (bf / 2, d, 0.0), (-bf / 2, d, 0.0), (-bf / 2, h, 0.0), (-tw / 2, h, r1)],
                    name)
