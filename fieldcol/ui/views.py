"""Flet controls of the field app: they render the view-models of ``fieldcol.ui.model``.

Phone first (390 px): one column, touch targets of at least 48 px, a light theme with strong
contrast; a status is always number + word + icon, colour only on top. Each control a test or a
screen reader needs carries a ``Semantics`` identifier (``site-...``, ``column-...``,
``status``, ``caution``, ``field-length`` ...).
"""

from __future__ import annotations

from typing import Awaitable, Callable

import flet as ft

from fieldcol import CAUTION
from fieldcol.ui import model as m

TAP = 48          # smallest touch target, px (usable with gloves)
WIDE = 768        # from this width up: list and detail side by side
# colours are the theme's role names (fieldcol.ui.palette gives each its colour per theme), so
# one control reads right in the light and the dark theme
C = ft.Colors
INK = C.ON_SURFACE              # body text
MUTED = C.ON_SURFACE_VARIANT    # secondary text (16 px and up)
LINE = C.OUTLINE                # borders
ACCENT = C.PRIMARY              # app bar, the chosen tab
ON_ACCENT = C.ON_PRIMARY        # words and icons on the app bar
BG = C.SURFACE                  # page background
CARD = C.SURFACE_CONTAINER_LOWEST  # cards, rows, the tab row
BAR_BG = C.SURFACE_CONTAINER_HIGH  # the save bar
CHOSEN_BG = C.PRIMARY_CONTAINER    # a chosen tab or choice, the selected row
GRID = C.OUTLINE_VARIANT           # chart grid lines
CAUTION_BG, CAUTION_INK, CAUTION_EDGE = (C.TERTIARY_FIXED, C.ON_TERTIARY_FIXED,
                                         C.ON_TERTIARY_FIXED_VARIANT)
TONES = {  # (text, background, border) per tone: contrast tested in tests/test_ui_palette.py
    "ok": (C.ON_TERTIARY_CONTAINER, C.TERTIARY_CONTAINER, C.TERTIARY),
    "over": (C.ERROR, C.ERROR_CONTAINER, C.ERROR),
    "none": (C.ON_SECONDARY_CONTAINER, C.SECONDARY_CONTAINER, C.SECONDARY),
}
ICONS = {"check_circle": ft.Icons.CHECK_CIRCLE, "warning": ft.Icons.WARNING,
         "help_outline": ft.Icons.HELP_OUTLINE, "block": ft.Icons.BLOCK,
         "remove_circle_outline": ft.Icons.REMOVE_CIRCLE_OUTLINE}

Handler = Callable[..., Awaitable[None] | None]


def text_line(value: str, *, size: int = 16, bold: bool = False, color: str = INK,
              selectable: bool = False) -> ft.Text:
    """A text in the app's type scale: 16 px body, near black unless told.

    Args:
        value: the words.
        size, bold, color: the look; selectable: can be copied.

    Returns:
        An ``ft.Text``.

    Example: ``text_line("24 columns", bold=True)``.
    """
    return ft.Text(value, size=size, color=color, selectable=selectable,
                   weight=ft.FontWeight.BOLD if bold else ft.FontWeight.NORMAL)


def status_chip(status: m.Status, *, big: bool = False,
                identifier: str | None = None) -> ft.Control:
    """The status as icon + number + word on a tinted chip.

    Args:
        status: a ``Status`` view-model.
        big: the large form used at the top of the column screen.
        identifier: a ``Semantics`` identifier for tests and screen readers.

    Returns:
        A control; its text reads e.g. ``"1.11 OVER"``.

    Example: ``status_chip(m.status_of(1.12, True))`` shows a warning icon and "1.12 OVER".
    """
    fg, bg, border = TONES[status.tone]
    chip = ft.Container(
        content=ft.Row([ft.Icon(ICONS[status.icon], color=fg, size=28 if big else 22),
                        text_line(status.label, size=22 if big else 17, bold=True, color=fg)],
                       spacing=6, tight=True),
        bgcolor=bg, border=ft.Border.all(1.5, border), border_radius=8,
        padding=ft.Padding.symmetric(horizontal=10, vertical=6 if big else 4))
    return ft.Semantics(identifier=identifier, label=status.label, content=chip) \
        if identifier else chip


def caution_box() -> ft.Control:
    """The caution, shown wherever results are shown.

    Returns:
        A bordered box holding ``fieldcol.CAUTION`` (identifier ``caution``).

    Example: ``caution_box()`` in every results screen.
    """
    return ft.Semantics(identifier="caution", content=ft.Container(
        content=ft.Row([ft.Icon(ft.Icons.INFO_OUTLINE, color=CAUTION_EDGE, size=22),
                        ft.Text(CAUTION, size=16, color=CAUTION_INK, expand=True)],
                       vertical_alignment=ft.CrossAxisAlignment.START),
        bgcolor=CAUTION_BG, border=ft.Border.all(1, CAUTION_EDGE), border_radius=8,
        padding=10))


def _card(controls: list[ft.Control], *, title: str | None = None) -> ft.Container:
    head = [text_line(title, size=18, bold=True)] if title else []
    return ft.Container(content=ft.Column(head + controls, spacing=8,
                                          horizontal_alignment=ft.CrossAxisAlignment.STRETCH),
                        border=ft.Border.all(1, LINE), border_radius=10, padding=12,
                        bgcolor=CARD)


def _line(line: m.Line) -> ft.Control:
    return ft.Column([text_line(line.label, size=16, color=MUTED),
                      text_line(line.value, selectable=True)],
                     spacing=0)


def _tap_row(content: ft.Control, on_click: Handler, identifier: str, label: str) -> ft.Control:
    box = ft.Container(content=content, on_click=on_click, ink=True, padding=12,
                       border=ft.Border.all(1, LINE), border_radius=10, bgcolor=CARD)
    # padding 12 around at least one 19 px line keeps the target above TAP px
    return ft.Semantics(identifier=identifier, label=label, button=True, content=box)


def tab_row(tabs: list[tuple[str, str, ft.IconData]], current: str, counts: dict[str, int],
            choose: Callable[[str], Handler], *, wrap: bool = False) -> ft.Control:
    """The column screen's tabs, four to a row (two rows for seven tabs): every tab in sight at
    390 px and beside the list on a tablet, none hidden off the screen's edge.

    The tab shown is bold, underlined, tinted and marked selected; its label says "(shown)".

    Args:
        tabs: ``(name, label, icon)`` in order.
        current: the name of the tab shown.
        counts: a number to show beside a tab's label (e.g. ``{"findings": 2}``).
        choose: gives the click handler for a tab name.
        wrap: kept for callers; the tabs always wrap.

    Returns:
        Rows of 60 px high buttons, a quarter of the width each (identifiers ``tab-<name>``).

    Example: ``tab_row([("check", "Check", ft.Icons.FACT_CHECK)], "check", {}, handler)``.
    """
    items: list[ft.Control] = []
    for name, word, icon in tabs:
        on = name == current
        label = word + (f" {counts[name]}" if counts.get(name) else "")
        said = word + (f", {counts[name]} {'open' if name == 'findings' else 'saved'}"
                       if counts.get(name) else "")
        box = ft.Container(
            content=ft.Column([ft.Icon(icon, color=ACCENT if on else MUTED, size=22),
                               ft.Text(label, size=16, color=INK if on else MUTED,
                                       weight=ft.FontWeight.BOLD if on else ft.FontWeight.NORMAL,
                                       max_lines=1, no_wrap=True)],
                              spacing=2, tight=True,
                              horizontal_alignment=ft.CrossAxisAlignment.CENTER),
            on_click=choose(name), ink=True, height=60,
            alignment=ft.Alignment.CENTER, bgcolor=CHOSEN_BG if on else CARD,
            border=ft.Border.only(bottom=ft.BorderSide(4 if on else 1, ACCENT if on else LINE)))
        items.append(ft.Semantics(identifier=f"tab-{name}", button=True, selected=on,
                                  label=f"{said}{' (shown)' if on else ''}", content=box,
                                  col={"xs": 3}))
    row = ft.ResponsiveRow(items, spacing=0, run_spacing=0, columns=12)
    return ft.Container(row, border_radius=8,
                        border=ft.Border.all(1, LINE), bgcolor=CARD)


def column_foot(duplicate: Handler) -> ft.Control:
    """The column screen's foot, above the save bar: "Next like this" (a copy of the shown
    column under the next free tag), the step repeated most on a survey, at the bottom right
    where a thumb holding the phone reaches; Delete stays alone at the top.

    Args:
        duplicate: the click handler that makes and opens the copy.

    Returns:
        A strip with one filled button (identifier ``duplicate-column``, 48 px high).

    Example: ``column_foot(app._duplicate)``.
    """
    button = ft.FilledTonalButton("Next like this", icon=ft.Icons.CONTENT_COPY,
                                  on_click=duplicate, height=TAP,
                                  tooltip="A copy of this column under the next tag "
                                          "(section, length, restraints, material)")
    return ft.Container(
        ft.Row([ft.Semantics(identifier="duplicate-column", button=True,
                             label="Next like this: a copy of this column under the next tag",
                             content=button)],
               alignment=ft.MainAxisAlignment.END),
        padding=ft.Padding.symmetric(horizontal=12, vertical=4), bgcolor=BG,
        border=ft.Border.only(top=ft.BorderSide(1, LINE)))


def choice_chip(identifier: str, word: str, chosen: bool, on_click: Handler) -> ft.Control:
    """One choice of a row of choices (a filter): 48 px high, the chosen one filled, ticked and
    said "(chosen)" (never colour alone).

    Example: ``choice_chip("filter-status-over", "Over capacity", True, handler)``.
    """
    # narrow side padding: four status choices fit a 390 px phone in two lines at most
    style = ft.ButtonStyle(padding=ft.Padding.symmetric(horizontal=14))
    button = ft.FilledButton(word, icon=ft.Icons.CHECK, on_click=on_click, height=TAP,
                             style=style) \
        if chosen else ft.OutlinedButton(word, on_click=on_click, height=TAP, style=style)
    return ft.Semantics(identifier=identifier, button=True, selected=chosen,
                        label=f"{word}{' (chosen)' if chosen else ''}", content=button)


# -- sites ---------------------------------------------------------------------------------
def sites_body(cards: list[m.SiteCard], open_site: Callable[[str], Handler]) -> list[ft.Control]:
    """The sites screen: one tappable card per site.

    Args:
        cards: ``model.site_cards(store)``.
        open_site: gives the click handler for a site id.

    Returns:
        The controls of the screen body.

    Example: ``sites_body(cards, lambda sid: handler)``.
    """
    items: list[ft.Control] = []
    for c in cards:
        over = m.Status(f"{c.over} over capacity", "warning" if c.over else "check_circle",
                        "over" if c.over else "ok", None)
        body = ft.Column([
            text_line(c.name, size=20, bold=True),
            text_line(c.address or "no address", color=MUTED),
            text_line(f"{c.code} · {c.unit_system}", size=16, color=MUTED),
            ft.Row([text_line(f"{c.columns} columns", bold=True), status_chip(over)],
                   wrap=True, spacing=10),
        ] + ([text_line(f"{c.not_checked} not checked", color=MUTED)] if c.not_checked else []),
            spacing=4)
        card = _tap_row(body, open_site(c.id), f"site-{c.name}", f"{c.name}: {c.summary}")
        card.col = {"xs": 12, "md": 6}  # two cards a row on a tablet
        items.append(card)
    if not cards:
        items.append(text_line("No sites yet. Start the app with --demo to see an example site.",
                           color=MUTED))
    return [text_line("Sites", size=24, bold=True), ft.ResponsiveRow(items, spacing=12,
                                                                  run_spacing=12),
            caution_box()]


# -- columns of a site ---------------------------------------------------------------------
def column_row(line: m.ColumnLine, on_click: Handler, *, selected: bool = False) -> ft.Control:
    """One column of the list: tag, level, section, length, and its status chip.

    Args:
        line: a ``ColumnLine``.
        on_click: opens the column.
        selected: drawn highlighted (the column shown beside the list on a tablet).

    Returns:
        A tappable row (identifier ``column-<tag>``).

    Example: ``column_row(page.rows[0], handler)``.
    """
    body = ft.Row([
        ft.Column([text_line(line.tag, size=19, bold=True),
                   text_line(" · ".join(x for x in (line.level, line.section, line.length) if x),
                         size=16, color=MUTED)],
                  spacing=2, expand=True),
        status_chip(line.status),
    ], vertical_alignment=ft.CrossAxisAlignment.CENTER)
    row = _tap_row(body, on_click, f"column-{line.tag}",
                   f"{line.tag}: {line.status.label}, {line.section}, {line.length}")
    mark_selected(row, selected)
    return row


def mark_selected(row: ft.Control, selected: bool) -> None:
    """Highlight a ``column_row`` (or take the highlight off) in place: a row kept from the
    last drawing changes two properties, so only those travel to the device.

    Args:
        row: a control made by ``column_row``.
        selected: drawn highlighted.

    Example: ``mark_selected(row, True)``.
    """
    box = row.content
    if selected and box.bgcolor != CHOSEN_BG:
        box.bgcolor, box.border = CHOSEN_BG, ft.Border.all(2, ACCENT)
    elif not selected and box.bgcolor != CARD:
        box.bgcolor, box.border = CARD, ft.Border.all(1, LINE)


# -- one column ----------------------------------------------------------------------------
def check_body(detail: m.ColumnDetail) -> list[ft.Control]:
    """The headline of the latest check: status, utilization, what governs, when.

    Drawn while the full reading (``check_model.latest_summary``) is not there yet; the modes,
    warnings and trace are drawn from that one reading only.

    Args:
        detail: ``model.column_detail(...)``.

    Returns:
        One card (a "not checked" note when the column has no check yet).

    Example: ``check_body(detail)``.
    """
    chk = detail.check
    if chk is None:
        # "Tap Check again" with an entry still empty only led to a refusal: say what is missing
        empty = m.still_empty(detail)
        then = (f"{' and '.join(empty)} {'is' if len(empty) == 1 else 'are'} still empty: type "
                f"{'it' if len(empty) == 1 else 'them'} below, and the column is checked."
                if empty else "Tap 'Check again' to check this column.")
        return [_card([ft.Row([status_chip(m.status_of(None, False), big=True,
                                           identifier="status")]),
                       text_line(then, color=MUTED)],
                      title="Latest check")]
    fg = TONES[chk.status.tone][0]
    return [_card([
        ft.Row([status_chip(chk.status, big=True, identifier="status")]),
        text_line(f"Utilization {chk.utilization} = demand {chk.demand} / design strength "
                  f"{chk.design_strength}", size=16, color=INK),
        ft.Semantics(identifier="governing", content=text_line(
            f"Governing: {chk.governing}", bold=True, color=fg)),
        text_line(f"{chk.code} · checked {chk.checked_at}", size=16, color=MUTED),
    ], title="Latest check")]


def record_body(detail: m.ColumnDetail) -> list[ft.Control]:
    """The column's identity, record summary and restraints in words.

    Args:
        detail: ``model.column_detail(...)``.

    Returns:
        Two cards.

    Example: ``record_body(detail)``.
    """
    return [_card([_line(x) for x in detail.identity], title="Column"),
            _card([_line(x) for x in detail.record + detail.restraints], title="Record")]


def edit_field(f: m.EditField, on_save: Handler) -> ft.TextField:
    """A text entry of the edit area: saved on Enter and when it loses focus.

    Args:
        f: an ``EditField`` (label, value as saved, hint).
        on_save: called with the event when the entry should be saved.

    Returns:
        The ``TextField`` (wrap it in ``Semantics(identifier="field-<name>")``).

    Example: ``edit_field(detail.fields[0], handler)``.
    """
    return ft.TextField(label=f.label, value=f.value, helper=f.hint, on_submit=on_save,
                        on_blur=on_save, text_size=18, color=INK, border_color=LINE,
                        content_padding=ft.Padding.symmetric(horizontal=12, vertical=14),
                        error_max_lines=5, helper_max_lines=2, data=f.name,
                        error_style=ft.TextStyle(size=16, color=TONES["over"][0]),
                        helper_style=ft.TextStyle(size=16, color=MUTED))
