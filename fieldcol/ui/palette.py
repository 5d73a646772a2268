"""The app's two palettes (light for sunlight, dark for a dark plant room), as Flet colour
schemes, and the text / background pairs whose contrast a test computes.

The controls never name a hex colour: they use the colour scheme's role names (``onsurface``,
``errorcontainer`` ...), which the client resolves in the theme shown, so the same controls
read right in both themes. ``views`` gives the roles our words (``INK``, ``MUTED``, ``TONES``);
this module gives each role its colour per theme.

Public API::

    LIGHT, DARK: Palette                 # role -> "#RRGGBB"
    scheme(p: Palette) -> ft.ColorScheme
    theme(p: Palette) -> ft.Theme
    TEXT_PAIRS: list[(fg_role, bg_role, what)]     # text on a background: >= 4.5:1
    EDGE_PAIRS: list[(fg_role, bg_role, what)]     # borders, icons, lines: >= 3:1
    contrast(fg, bg) -> float            # WCAG 2.x contrast ratio of two "#RRGGBB"
"""

from __future__ import annotations

from dataclasses import dataclass, fields

import flet as ft


@dataclass(frozen=True)
class Palette:
    """One colour per role (the names are Flet's ``ColorScheme`` fields)."""
    primary: str                    # app bar, filled buttons, the chosen tab's line
    on_primary: str
    primary_container: str          # a chosen tab or choice, the selected row
    on_primary_container: str
    secondary: str                  # the edge of a "not checked" chip
    on_secondary: str
    secondary_container: str        # "not checked" / "no demand" chip
    on_secondary_container: str
    tertiary: str                   # the edge of an OK chip
    on_tertiary: str
    tertiary_container: str         # OK chip
    on_tertiary_container: str
    error: str                      # OVER, refusals, "Not saved"
    on_error: str
    error_container: str
    on_error_container: str
    surface: str                    # the page
    on_surface: str                 # body text
    on_surface_variant: str         # secondary text (never below 16 px)
    outline: str                    # borders of cards, entries, rows
    outline_variant: str            # chart grid lines (decoration only)
    surface_container_lowest: str   # cards
    surface_container_high: str     # the save bar
    tertiary_fixed: str             # the caution box
    on_tertiary_fixed: str
    on_tertiary_fixed_variant: str  # the caution's edge and icon, a brace that does not count


LIGHT = Palette(
    primary="#1C4E9C", on_primary="#FFFFFF",
    primary_container="#E3ECF9", on_primary_container="#0B2A5B",
    secondary="#5F6872", on_secondary="#FFFFFF",
    secondary_container="#EEF0F2", on_secondary_container="#2E343B",
    tertiary="#0B5A1E", on_tertiary="#FFFFFF",
    tertiary_container="#E6F4EA", on_tertiary_container="#0B5A1E",
    error="#9C1111", on_error="#FFFFFF",
    error_container="#FDECEC", on_error_container="#7A0C0C",
    surface="#F4F6F8", on_surface="#111418", on_surface_variant="#3C434C",
    outline="#6E7781", outline_variant="#C9CED4",
    surface_container_lowest="#FFFFFF", surface_container_high="#E8EEF7",
    tertiary_fixed="#FFF6D6", on_tertiary_fixed="#2B2100", on_tertiary_fixed_variant="#7A5B00",
)

DARK = Palette(
    primary="#9CC0FF", on_primary="#0A1D3D",
    primary_container="#1F3A66", on_primary_container="#DCE8FF",
    secondary="#9AA5B1", on_secondary="#151A20",
    secondary_container="#262D35", on_secondary_container="#D5DBE1",
    tertiary="#7FD49A", on_tertiary="#06210F",
    tertiary_container="#0F2E19", on_tertiary_container="#A6E8B8",
    error="#FF9C94", on_error="#3B0A0A",
    error_container="#3B0F0F", on_error_container="#FFD2CD",
    surface="#0F1318", on_surface="#E8ECF0", on_surface_variant="#BAC2CA",
    outline="#7D8894", outline_variant="#39424C",
    surface_container_lowest="#171C22", surface_container_high="#1F2731",
    tertiary_fixed="#352A04", on_tertiary_fixed="#FFE9AD", on_tertiary_fixed_variant="#D9B54A",
)

#: text on a background, as the app draws it: each pair must reach 4.5:1 (WCAG 1.4.3)
TEXT_PAIRS: list[tuple[str, str, str]] = [
    ("on_surface", "surface", "body text on the page"),
    ("on_surface", "surface_container_lowest", "body text on a card"),
    ("on_surface_variant", "surface", "secondary text on the page"),
    ("on_surface_variant", "surface_container_lowest", "secondary text on a card"),
    ("on_surface", "surface_container_high", "the save bar's words"),
    ("on_primary", "primary", "app bar title, filled button"),
    ("primary", "surface_container_lowest", "outlined button on a card"),
    ("primary", "surface", "outlined button on the page"),
    ("on_surface", "primary_container", "a chosen tab or choice"),
    ("on_primary_container", "primary_container", "words on a chosen item"),
    ("on_tertiary_container", "tertiary_container", "OK chip"),
    ("error", "error_container", "OVER chip, 'Not saved' bar"),
    ("on_error_container", "error_container", "words on an error tint"),
    ("error", "surface_container_lowest", "a refusal under an entry"),
    ("error", "surface", "a refusal on the page"),
    ("on_secondary_container", "secondary_container", "'not checked' chip"),
    ("on_tertiary_fixed", "tertiary_fixed", "the caution"),
    ("on_error", "error", "words on an error fill"),
]

#: borders, icons and drawn lines that carry meaning: 3:1 (WCAG 1.4.11 non-text contrast)
EDGE_PAIRS: list[tuple[str, str, str]] = [
    ("outline", "surface_container_lowest", "card and entry borders"),
    ("outline", "surface", "borders on the page"),
    ("primary", "surface_container_lowest", "the chosen tab's line, the sketch's steel"),
    ("tertiary", "tertiary_container", "OK chip edge"),
    ("secondary", "secondary_container", "'not checked' chip edge"),
    ("on_tertiary_fixed_variant", "tertiary_fixed", "the caution's edge and icon"),
    ("on_tertiary_fixed_variant", "surface_container_lowest", "a brace that does not count"),
    ("error", "surface_container_lowest", "the buckled shape in the sketch"),
]


def _channel(c: int) -> float:
    s = c / 255
    return s / 12.92 if s <= 0.04045 else ((s + 0.055) / 1.055) ** 2.4


def luminance(color: str) -> float:
    """WCAG 2.x relative luminance of ``#RRGGBB`` (sRGB, 0 black .. 1 white).

    Example:
        >>> round(luminance("#FFFFFF"), 3), luminance("#000000")
        (1.0, 0.0)
    """
    h = color.lstrip("#")
    if len(h) != 6:
        raise ValueError(f"colour {color!r}: give #RRGGBB")
    r, g, b = (int(h[i:i + 2], 16) for i in (0, 2, 4))
    return 0.2126 * _channel(r) + 0.7152 * _channel(g) + 0.0722 * _channel(b)


def contrast(fg: str, bg: str) -> float:
    """The WCAG 2.x contrast ratio of two colours, (L1 + 0.05) / (L2 + 0.05), 1 to 21.

    Example:
        >>> round(contrast("#000000", "#FFFFFF"), 1)
        21.0
    """
    a, b = sorted((luminance(fg), luminance(bg)), reverse=True)
    return (a + 0.05) / (b + 0.05)


def scheme(p: Palette) -> ft.ColorScheme:
    """The Flet colour scheme of a palette (every role set: nothing left to a seed).

    Example: ``scheme(DARK).surface`` gives ``'#0F1318'``.
    """
    return ft.ColorScheme(**{f.name: getattr(p, f.name) for f in fields(p)})


def theme(p: Palette) -> ft.Theme:
    """A Flet theme with the palette's colour scheme, the page's background, and no text
    style under 16 px.

    Example: ``page.dark_theme = theme(DARK)``.
    """
    # nothing under 16 px on a phone: Flutter's default text, button labels, helper lines and
    # captions are 11-14 px otherwise
    sixteen = ft.TextStyle(size=16)
    # (no page_transitions here: setting them made the first screen ~0.8 s slower in the
    # browser and did not make opening a column measurably quicker)
    return ft.Theme(color_scheme=scheme(p), scaffold_bgcolor=p.surface,
                    card_bgcolor=p.surface_container_lowest,
                    text_theme=ft.TextTheme(body_medium=sixteen, body_small=sixteen,
                                            label_large=sixteen, label_medium=sixteen,
                                            label_small=sixteen, title_small=sixteen))


def apply(page: ft.Page, mode: str) -> None:
    """Both themes on a page, and which one shows (``light`` or ``dark``).

    Example: ``apply(page, store.setting("theme"))``.
    """
    page.theme = theme(LIGHT)
    page.dark_theme = theme(DARK)
    page.theme_mode = ft.ThemeMode.DARK if mode == "dark" else ft.ThemeMode.LIGHT
