"""Controls shared by the Section and Condition tabs: choice rows, entries with their unit,
the lines of a reading.

Thumb first: every choice is a 52 px tall tap target with its word (and a tick when chosen,
so the choice never rests on colour alone); entries are 17 px with the unit shown inside them.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.ui import views as v

from fieldcol.ui.views import INK, LINE, MUTED, TONES, Handler, caution_box, status_chip, text_line

if TYPE_CHECKING:
    from fieldcol.ui.model import ColumnDetail
    from fieldcol.ui.readings import Change

ACCENT, CHOSEN_BG, CARD, ON_ACCENT = v.ACCENT, v.CHOSEN_BG, v.CARD, v.ON_ACCENT
ERROR = TONES["over"][0]


def choice_row(options: list[tuple[str, str]], current: str,
               pick: Callable[[str], Handler], prefix: str, *,
               said: str = "") -> ft.Control:
    """A row of tap targets, one per option; the chosen one is ticked, bold and tinted.

    Args:
        options: (value, word) pairs.
        current: the value chosen now.
        pick: gives the click handler for a value.
        prefix: identifier prefix (``<prefix>-<value>``).
        said: what a screen reader says before each word (``"bow about the"``).

    Returns:
        A wrapping row of 52 px tall buttons.

    Example: ``choice_row([("weak", "Weak axis"), ("strong", "Strong axis")], "weak", pick,
    "bow-axis")``.
    """
    items: list[ft.Control] = []
    for value, word in options:
        on = value == current
        box = ft.Container(
            content=ft.Row([ft.Icon(ft.Icons.CHECK_CIRCLE if on else ft.Icons.CIRCLE_OUTLINED,
                                    color=ACCENT if on else MUTED, size=20),
                            text_line(word, size=17, bold=on, color=INK)],
                           spacing=5, tight=True),
            on_click=pick(value), ink=True, height=52,
            padding=ft.Padding.symmetric(horizontal=10, vertical=4), border_radius=26,
            bgcolor=CHOSEN_BG if on else CARD,
            border=ft.Border.all(2.5 if on else 1, ACCENT if on else LINE))
        items.append(ft.Semantics(identifier=f"{prefix}-{value}", button=True, selected=on,
                                  label=f"{said} {word}".strip() + (" (chosen)" if on else ""),
                                  content=box))
    return ft.Row(items, wrap=True, spacing=8, run_spacing=8)


def unit_entry(label: str, value: str, unit: str | None, *, hint: str = "",
               on_change: Handler | None = None, on_submit: Handler | None = None,
               autofocus: bool = False, data: Any = None,
               keyboard: ft.KeyboardType = ft.KeyboardType.TEXT) -> ft.TextField:
    """A text entry in the app's type scale, its unit shown at its end (a bare number typed is
    read in that unit), room for an error of several lines below it.

    Args:
        label: what to type (``"Bow"``).
        value: the text to start from.
        unit: ``in`` or ``mm`` (``None``: no unit shown).
        hint: a helper line below (16 px).
        on_change, on_submit: handlers; autofocus: takes the keyboard when shown.
        data: kept on the control (e.g. the dimension key).
        keyboard: the keyboard offered on a phone.

    Returns:
        An ``ft.TextField``.

    Example: ``unit_entry("Bow", "", "in", hint="bare numbers are in inches")``.
    """
    return ft.TextField(
        label=label, value=value, suffix=text_line(unit, size=17, color=MUTED) if unit else None,
        helper=hint or None, text_size=18, color=INK, border_color=LINE, border_width=1.5,
        focused_border_color=ACCENT, focused_border_width=2.5,
        label_style=ft.TextStyle(size=17, color=MUTED),
        helper_style=ft.TextStyle(size=16, color=MUTED), helper_max_lines=3,
        error_style=ft.TextStyle(size=16, color=ERROR), error_max_lines=5,
        on_change=on_change, on_submit=on_submit, autofocus=autofocus, data=data,
        keyboard_type=keyboard, content_padding=ft.Padding.symmetric(horizontal=12, vertical=14))


def big_button(text: str, icon: Any, on_click: Handler, identifier: str, *,
               filled: bool = True) -> ft.Control:
    """A full-width 56 px button for the one action a card is for.

    Example: ``big_button("Save reading", ft.Icons.SAVE, save, "save-reading")``.
    """
    cls = ft.FilledButton if filled else ft.OutlinedButton
    fg = ON_ACCENT if filled else ACCENT
    button = cls(content=text_line(text, size=18, bold=True, color=fg),
                 icon=ft.Icon(icon, color=fg), on_click=on_click, height=56,
                 style=ft.ButtonStyle(shape=ft.RoundedRectangleBorder(radius=10),
                                      bgcolor=ACCENT if filled else CARD,
                                      side=None if filled else ft.BorderSide(2, ACCENT)))
    return ft.Semantics(identifier=identifier, button=True, label=text, content=button)


def small_button(text: str, icon: Any, on_click: Handler, identifier: str,
                 label: str = "") -> ft.Control:
    """A 48 px outlined button for a secondary action (``Correct``, ``Cancel``).

    Example: ``small_button("Correct", ft.Icons.EDIT, handler, "correct-0")``.
    """
    return ft.Semantics(identifier=identifier, button=True, label=label or text,
                        content=ft.OutlinedButton(
                            content=text_line(text, size=16, bold=True, color=ACCENT),
                            icon=icon, on_click=on_click, height=48))


def card(controls: list[ft.Control], title: str | None = None, *,
         identifier: str | None = None) -> ft.Control:
    """A white card with an optional 19 px title.

    Example: ``card([text_line("W14X90")], "Section now")``.
    """
    head = [text_line(title, size=19, bold=True)] if title else []
    box = ft.Container(content=ft.Column(head + controls, spacing=10,
                                         horizontal_alignment=ft.CrossAxisAlignment.STRETCH),
                       border=ft.Border.all(1, LINE), border_radius=10, padding=12,
                       bgcolor=CARD)
    return ft.Semantics(identifier=identifier, content=box) if identifier else box


def value_line(label: str, value: str) -> ft.Control:
    """A label (16 px, muted) above its value (18 px).

    Example: ``value_line("Depth", "14 in")``.
    """
    return ft.Column([text_line(label, size=16, color=MUTED),
                      text_line(value, size=18, selectable=True)], spacing=0, tight=True)


def saved_words(change: "Change") -> str:
    """The save bar's words for a saved change, with the check that followed it.

    Example: ``saved_words(change)`` gives ``"Saved bow 1 1/8 in about the weak axis; checked
    again: 1.18 OVER"``.
    """
    return checked_words(change.label, change.status, change.note)


def checked_words(label: str, status: str, note: str = "") -> str:
    """The save bar's words for a change saved with the column's check that followed it.

    Example: ``checked_words("top end, weak axis: fixed", "0.55 OK")`` gives ``"Saved top
    end, weak axis: fixed; checked again: 0.55 OK"``.
    """
    if status:
        return f"Saved {label}; checked again: {status}" + (f" ({note})" if note else "")
    return f"Saved {label} (not checked: the record is not complete yet)"


def status_line(detail: "ColumnDetail | None") -> ft.Control:
    """The column's check as it stands, at the top of a tab that changes it: status chip,
    what governs, and the caution (a result is shown).

    Example: ``status_line(app.detail)``.
    """
    from fieldcol.ui import model as m

    chk = detail.check if detail is not None else None
    status = chk.status if chk is not None else m.status_of(None, False)
    words = [status_chip(status)]
    said = status.label
    if chk is not None and chk.governing:
        words.append(text_line(f"governs: {chk.governing}", size=16, color=MUTED))
        said += f", governs: {chk.governing}"
    row = ft.Semantics(identifier="tab-status", label=said,
                       content=ft.Row(words, wrap=True, spacing=10, run_spacing=4))
    return ft.Column([row, caution_box()], spacing=8)
