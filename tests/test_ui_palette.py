"""The light and dark palettes: every pair of text and background the app draws reaches
WCAG 2.2 contrast 4.5:1 (success criterion 1.4.3, Contrast (Minimum)); borders, icons and
drawn lines that carry meaning reach 3:1 (1.4.11, Non-text Contrast).

Outside reference: the WCAG 2.2 definitions of relative luminance (sRGB, 0.2126 R + 0.7152 G
+ 0.0722 B after linearising) and contrast ratio ((L1 + 0.05) / (L2 + 0.05)); black on white is
21:1 by that definition; #767676 on white is about 4.54:1, the lightest grey that passes AA on
white (a commonly quoted value, from memory).
"""

from __future__ import annotations

from dataclasses import fields

import flet as ft
import pytest

from fieldcol.ui import palette as pal
from fieldcol.ui import views as v

THEMES = {"light": pal.LIGHT, "dark": pal.DARK}


def test_the_contrast_formula_against_wcag_values():
    assert pal.contrast("#000000", "#FFFFFF") == pytest.approx(21.0)
    assert pal.contrast("#FFFFFF", "#FFFFFF") == pytest.approx(1.0)
    assert pal.contrast("#767676", "#FFFFFF") == pytest.approx(4.54, abs=0.01)
    assert pal.contrast("#FFFFFF", "#767676") == pal.contrast("#767676", "#FFFFFF")


@pytest.mark.parametrize("name", THEMES)
def test_text_on_its_backgrounds_reads(name):
    p = THEMES[name]
    low = [(what, fg, bg, round(pal.contrast(getattr(p, fg), getattr(p, bg)), 2))
           for fg, bg, what in pal.TEXT_PAIRS
           if pal.contrast(getattr(p, fg), getattr(p, bg)) < 4.5]
    assert not low, low


@pytest.mark.parametrize("name", THEMES)
def test_edges_and_marks_stand_out(name):
    p = THEMES[name]
    low = [(what, round(pal.contrast(getattr(p, fg), getattr(p, bg)), 2))
           for fg, bg, what in pal.EDGE_PAIRS
           if pal.contrast(getattr(p, fg), getattr(p, bg)) < 3.0]
    assert not low, low


def test_the_dark_theme_is_dark_and_the_light_light():
    assert pal.luminance(pal.DARK.surface) < 0.02 < 0.8 < pal.luminance(pal.LIGHT.surface)


def test_the_views_use_only_roles_both_palettes_colour():
    roles = {f.name.replace("_", "") for f in fields(pal.Palette)}
    used = {v.INK, v.MUTED, v.LINE, v.ACCENT, v.ON_ACCENT, v.BG, v.CARD, v.BAR_BG, v.CHOSEN_BG,
            v.GRID, v.CAUTION_BG, v.CAUTION_INK, v.CAUTION_EDGE,
            *(c for tone in v.TONES.values() for c in tone)}
    assert {str(c.value if isinstance(c, ft.Colors) else c) for c in used} <= roles
    # a Flet colour scheme takes every role of both palettes
    for p in THEMES.values():
        s = pal.scheme(p)
        assert all(getattr(s, f.name) == getattr(p, f.name) for f in fields(p))
