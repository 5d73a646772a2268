"""Flet controls for a column's history (``fieldcol.ui.notes`` view-models): restraint changes
with their photos (markup drawn over them), then every reading.

As in ``views``: touch targets of at least 48 px, a state is a word + icon (colour only on
top), and each control a test needs carries a ``Semantics`` identifier (``change-<n>``,
``reading-<n>``, ``photo-r<n>-<j>``). Findings, photos and retrofit options have their own
modules (``tab_findings``, ``photo_views``, ``tab_retrofit``).
"""

from __future__ import annotations

from typing import Callable

import flet as ft

from fieldcol.ui import notes as n
from fieldcol.ui.photo_views import thumbnails
from fieldcol.ui.views import INK, MUTED, Handler, _card, caution_box, text_line

ICONS = {"add_link": ft.Icons.ADD_LINK, "link_off": ft.Icons.LINK_OFF, "cable": ft.Icons.CABLE,
         "swap_vert": ft.Icons.SWAP_VERT, "edit_note": ft.Icons.EDIT_NOTE}


def history_body(h: n.History, open_photo: Callable[[n.PhotoThumb], Handler]) -> list[ft.Control]:
    """The history tab: restraint changes, then every reading (corrections marked).

    Args:
        h: ``notes.column_history(...)``.
        open_photo: gives the handler that shows a photo larger.

    Returns:
        The cards: restraint changes, readings, then each change of the checked result.

    Example: ``history_body(history, lambda p: handler)``.
    """
    changes: list[ft.Control] = []
    for i, c in enumerate(h.changes):
        parts: list[ft.Control] = [
            ft.Row([ft.Icon(ICONS.get(c.icon, ft.Icons.EDIT_NOTE), color=INK, size=20),
                    text_line(f"{c.date} · {c.kind_word} · {c.axis}", bold=True)],
                   spacing=6, wrap=True),
            text_line(c.description),
            text_line(c.seen_by, size=16, color=MUTED)]
        if c.details:
            parts.append(text_line(c.details, size=16, color=MUTED))
        if c.photos:
            parts.append(thumbnails(c.photos, open_photo, f"r{i}"))
        changes.append(ft.Semantics(identifier=f"change-{i}", content=ft.Container(
            ft.Column(parts, spacing=3), padding=ft.Padding.symmetric(vertical=6))))
    if not changes:
        changes.append(text_line("No restraint changes logged.", color=MUTED))
    readings: list[ft.Control] = []
    for i, r in enumerate(h.readings):
        corrected = r.state == "corrected"
        mark = {"corrected": (ft.Icons.DO_NOT_DISTURB_ON_OUTLINED, "CORRECTED (kept, not used)"),
                "in use": (ft.Icons.CHECK_CIRCLE_OUTLINE, "in use"),
                "earlier": (ft.Icons.HISTORY, "earlier reading")}[r.state]
        value = f"typed {r.typed}" + ("" if r.value == r.typed else f" = {r.value}")
        parts = [
            text_line(r.quantity, size=16, color=MUTED),
            ft.Row([text_line(value, bold=True,
                              color=MUTED if corrected else INK),
                    ft.Row([ft.Icon(mark[0], size=18, color=INK),
                            text_line(mark[1], size=16, bold=corrected)], spacing=3, tight=True)],
                   wrap=True, spacing=10),
            text_line(f"{r.who} · {r.when}" + (f" · {r.gauge}" if r.gauge else ""), size=16,
                      color=MUTED)]
        if r.corrects:
            parts.append(text_line(r.corrects, size=16))
        if r.note:
            parts.append(text_line(f"note: {r.note}", size=16, color=MUTED))
        readings.append(ft.Semantics(identifier=f"reading-{i}", content=ft.Container(
            ft.Column(parts, spacing=2), padding=ft.Padding.symmetric(vertical=6))))
    if not readings:
        readings.append(text_line("No readings taken yet.", color=MUTED))
    cards = [_card(changes, title="Restraint changes"),
             _card(readings, title="Measurements (every reading kept)")]
    if h.results:  # after the readings, which are what a visit looks at most
        cards.append(_card(_result_lines(h.results[:RESULTS_ON_TAB]),
                           title="Result over time (newest first)"))
        cards.append(caution_box())   # results are shown here too
    return cards


#: changes of result the tab lists (the report lists ``notes.RESULTS_SHOWN``)
RESULTS_ON_TAB = 8


def _result_lines(results: list[n.ResultLine]) -> list[ft.Control]:
    out: list[ft.Control] = []
    for i, r in enumerate(results):
        parts = [text_line(f"{r.label} · {r.governs}", bold=True)]
        if r.strength:
            parts.append(text_line(f"design strength {r.strength}", size=16))
        parts.append(text_line(" · ".join(t for t in (r.when, r.who) if t), size=16,
                               color=MUTED))
        if r.changed:
            parts.append(text_line(r.changed, size=16))
        out.append(ft.Semantics(identifier=f"result-{i}", content=ft.Container(
            ft.Column(parts, spacing=2), padding=ft.Padding.symmetric(vertical=6))))
    return out
