"""The Section record: dimensions and derived properties of one cross-section (or a batch).

Internal units throughout: mm, mm^2, mm^3, mm^4, mm^6. Every numeric field is a float64
numpy array; a single section holds 0-d arrays and a batch holds arrays of one shape.
Axis letters follow AISC: ``x`` is the strong axis, ``y`` the weak axis (EN calls them y and z;
the engine speaks of ``strong`` and ``weak``).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

KINDS = ("i", "rect", "round")


@dataclass(frozen=True)
class Section:
    """A cross-section with the properties the column checks use.

    kind:
        ``"i"``: doubly symmetric I or H (rolled W/HP/S/M/IPE/HE with root fillet ``r``, or welded /
        built-up with ``r = 0`` and ``rolled = False``).
        ``"rect"``: rectangular or square hollow, ``d`` = outside depth (strong axis), ``bf`` = outside
        width, ``tw = tf = t`` the wall (design) thickness, ``r`` the outside corner radius.
        ``"round"``: circular hollow or pipe, ``d = bf`` = outside diameter, ``tw = tf = t``.
    Dimensions: d, bf, tf, tw, r (mm).
    Properties: A, Ix, Iy, Sx, Sy, Zx, Zy, rx, ry, J, Cw, ho.
    Plate slenderness as the codes define it (dimensionless):
        lam_flange: AISC flange ratio (I: bf/2tf; rect: b/t of the width walls with b = bf - 3t;
                    round: D/t)
        lam_web:    AISC web ratio (I: h/tw with h = d - 2(tf + r) rolled, d - 2tf welded;
                    rect: h/t with h = d - 3t; round: D/t)
        ct_flange:  EN 1993-1-1 Table 5.2 c/t of the flange (I outstand: (bf - tw - 2r)/2 / tf;
                    rect: (bf - 3t)/t; round: D/t)
        ct_web:     EN c/t of the web (I: (d - 2tf - 2r)/tw; rect: (d - 3t)/t; round: D/t)
    name: catalogue designation when it came from the catalogue, else None.
    rolled: True for hot-rolled I shapes and hot-finished hollow sections, False for welded /
        built-up I shapes and cold-formed hollow sections (the codes treat them differently).
    notes: how the properties were obtained (e.g. "S shape: mean flange thickness used"),
        carried into the trace.
    """

    kind: str
    d: np.ndarray
    bf: np.ndarray
    tf: np.ndarray
    tw: np.ndarray
    r: np.ndarray
    A: np.ndarray
    Ix: np.ndarray
    Iy: np.ndarray
    Sx: np.ndarray
    Sy: np.ndarray
    Zx: np.ndarray
    Zy: np.ndarray
    rx: np.ndarray
    ry: np.ndarray
    J: np.ndarray
    Cw: np.ndarray
    ho: np.ndarray
    lam_flange: np.ndarray
    lam_web: np.ndarray
    ct_flange: np.ndarray
    ct_web: np.ndarray
    name: str | None = None
    rolled: bool = True
    notes: tuple[str, ...] = field(default_factory=tuple)
    tf_as_built: np.ndarray | None = None    # flange thickness before loss (None: tf is as built)
    tmax_as_built: np.ndarray | None = None  # thickest plate before loss (None: tmax is as built)

    @property
    def tmax(self) -> np.ndarray:
        """Thickest plate (mm) as it is now."""
        return np.maximum(self.tf, self.tw)

    @property
    def tf_nominal(self) -> np.ndarray:
        """Flange thickness as built (mm): it picks the EN 1993-1-1 Table 6.2 row. Corrosion
        thins the plate but does not change the product it was rolled as."""
        return self.tf if self.tf_as_built is None else self.tf_as_built

    @property
    def tmax_nominal(self) -> np.ndarray:
        """Thickest plate as built (mm): fy by thickness (EN 1993-1-1 Table 3.1, EN 10025) is a
        property of the product as rolled, which losing steel does not raise."""
        return self.tmax if self.tmax_as_built is None else self.tmax_as_built

    def with_name(self, name: str | None) -> "Section":
        return replace(self, name=name)
