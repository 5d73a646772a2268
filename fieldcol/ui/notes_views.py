"""Flet controls for a column's findings, photos, history and retrofit options.

They render ``fieldcol.ui.notes`` view-models. As in ``views``: touch targets of at least
48 px, a severity or status is a word + icon (colour only on top), and each control a test or a
screen reader needs carries a ``Semantics`` identifier (``finding-<n>``,
``photo-<n>``, ``add-finding``, ``finding-text``, ``severity-<word>``, ``retrofit-<n>`` ...).
"""

from __future__ import annotations

from typing import Callable

import flet as ft

from fieldcol.ui import notes as n
from fieldcol.ui.views import (
    ACCENT, INK, LINE, MUTED, TAP, TONES, Handler, _card, caution_box, status_chip, text_line,
)

ICONS = {"info_outline": ft.Icons.INFO_OUTLINE, "low_priority": ft.Icons.LOW_PRIORITY,
         "report_outlined": ft.Icons.REPORT_OUTLINED, "warning": ft.Icons.WARNING,
         "dangerous": ft.Icons.DANGEROUS, "radio_button_unchecked": ft.Icons.RADIO_BUTTON_UNCHECKED,
         "task_alt": ft.Icons.TASK_ALT, "add_link": ft.Icons.ADD_LINK,
         "link_off": ft.Icons.LINK_OFF,
         "cable": ft.Icons.CABLE, "swap_vert": ft.Icons.SWAP_VERT, "edit_note": ft.Icons.EDIT_NOTE}
# severity tones: the word and icon say it, the tint only helps
SEVERITY_TONES = {"info": "none", "low": "none", "medium": "none", "high": "over", "urgent": "over"}


def _tag(word: str, icon: str, tone: str) -> ft.Control:
    fg, bg, border = TONES[tone]
    return ft.Container(
        content=ft.Row([ft.Icon(ICONS.get(icon, ft.Icons.INFO_OUTLINE), color=fg, size=18),
                        text_line(word, size=16, bold=True, color=fg)], spacing=4, tight=True),
        bgcolor=bg, border=ft.Border.all(1, border), border_radius=6,
        padding=ft.Padding.symmetric(horizontal=8, vertical=3))


# -- photos --------------------------------------------------------------------------------
def thumbnails(photos: list[n.PhotoThumb], open_photo: Callable[[n.PhotoThumb], Handler],
               prefix: str) -> ft.Control:
    """Tappable photo thumbnails, each with the time the camera recorded.

    Args:
        photos: ``PhotoThumb`` view-models.
        open_photo: gives the click handler that shows a photo larger.
        prefix: identifier prefix (``photo-<prefix>-<i>``).

    Returns:
        A wrapping row of 120 px thumbnails.

    Example: ``thumbnails(line.photos, lambda p: handler, "f0")``.
    """
    items: list[ft.Control] = []
    for i, p in enumerate(photos):
        image: ft.Control = ft.Image(src=p.thumb, width=120, height=120, fit=ft.BoxFit.COVER,
                                     border_radius=6) if p.thumb else \
            ft.Container(text_line("photo file missing", size=16, color=MUTED), width=120,
                         height=120, alignment=ft.Alignment.CENTER)
        box = ft.Container(
            content=ft.Column([image, text_line(p.taken, size=16, color=MUTED)], spacing=2,
                              tight=True, width=120),
            on_click=open_photo(p), ink=True, padding=4, border=ft.Border.all(1, LINE),
            border_radius=8)
        items.append(ft.Semantics(identifier=f"photo-{prefix}-{i}", button=True,
                                  label=f"photo {p.name}, {p.taken}: tap to see it larger",
                                  content=box))
    return ft.Row(items, wrap=True, spacing=8, run_spacing=8)


def photo_dialog(p: n.PhotoThumb, data: bytes, close: Handler) -> ft.AlertDialog:
    """A dialog showing one photo large, with its time, name and size.

    Args:
        p: the photo's ``PhotoThumb``.
        data: the photo's bytes (``notes.photo_bytes``).
        close: closes the dialog.

    Returns:
        An ``AlertDialog`` for ``page.show_dialog``.

    Example: ``page.show_dialog(photo_dialog(p, data, handler))``.
    """
    return ft.AlertDialog(
        title=text_line(p.name, size=16, bold=True),
        content=ft.Semantics(identifier="photo-large", label=f"photo {p.name}",
                             content=ft.Column([
                                 ft.Image(src=data, fit=ft.BoxFit.CONTAIN, width=340,
                                          height=420),
                                 text_line(f"{p.taken} · {p.size}", size=16, color=MUTED)],
                                 tight=True, spacing=6)),
        actions=[ft.Semantics(identifier="photo-close", content=ft.FilledButton(
            "Close", on_click=close, height=TAP))],
        inset_padding=ft.Padding.all(12), content_padding=ft.Padding.all(12))


# -- findings ------------------------------------------------------------------------------
def finding_card(i: int, f: n.FindingLine, open_photo: Callable[[n.PhotoThumb], Handler],
                 toggle: Handler) -> ft.Control:
    """One finding: its words, severity and status (word + icon), date, photos, and the
    button that closes or reopens it.

    Args:
        i: its place in the list (identifier ``finding-<i>``).
        f: a ``FindingLine``.
        open_photo: gives the handler that shows a photo larger.
        toggle: closes an open finding or reopens a closed one.

    Returns:
        A card.

    Example: ``finding_card(0, findings[0], lambda p: h, h2)``.
    """
    closed = f.status == "closed"
    head = ft.Row([_tag(f.severity_word, f.severity_icon, SEVERITY_TONES.get(f.severity, "none")),
                   _tag(f.status_word, f.status_icon, "ok" if closed else "none"),
                   text_line(f.category, size=16, color=MUTED)], wrap=True, spacing=8)
    # not selectable: selectable text would make the card read as a text box
    body: list[ft.Control] = [head, text_line(f.text, color=MUTED if closed else INK),
                              text_line(f"noted {f.date}", size=16, color=MUTED)]
    if f.photos:
        body.append(thumbnails(f.photos, open_photo, f"f{i}"))
    body.append(ft.Semantics(identifier=f"finding-{i}-toggle", content=ft.OutlinedButton(
        "Reopen" if closed else "Close finding",
        icon=ft.Icons.UNDO if closed else ft.Icons.TASK_ALT, on_click=toggle, height=TAP)))
    return ft.Semantics(identifier=f"finding-{i}", label=f.label, content=ft.Container(
        content=ft.Column(body, spacing=6), border=ft.Border.all(1, LINE), border_radius=10,
        padding=12, bgcolor="#F7F8FA" if closed else ft.Colors.WHITE))


def severity_choice(current: str, choose: Callable[[str], Handler]) -> ft.Control:
    """The five severities as 48 px buttons; the chosen one is ticked and bold.

    Args:
        current: the severity chosen (``""`` for none yet).
        choose: gives the click handler for a severity.

    Returns:
        A wrapping row (identifiers ``severity-<name>``).

    Example: ``severity_choice("medium", lambda s: handler)``.
    """
    items: list[ft.Control] = []
    for s in n.SEVERITIES:
        on = s == current
        word, icon = n.SEVERITY_WORDS[s]
        box = ft.Container(
            content=ft.Row([ft.Icon(ft.Icons.CHECK if on else ICONS[icon], size=18,
                                    color=INK if on else MUTED),
                            text_line(word, size=16, bold=on, color=INK)], spacing=4, tight=True),
            # no alignment: an aligned Container fills the row; the Row centres it in TAP px
            on_click=choose(s), ink=True, height=TAP,
            padding=ft.Padding.symmetric(horizontal=12), border_radius=8,
            bgcolor="#E3ECF9" if on else ft.Colors.WHITE,
            border=ft.Border.all(2.5 if on else 1, ACCENT if on else LINE))
        items.append(ft.Semantics(identifier=f"severity-{s}", button=True, selected=on,
                                  label=f"severity {word}{' (chosen)' if on else ''}",
                                  content=box))
    return ft.Row(items, wrap=True, spacing=6, run_spacing=6)


def findings_body(findings: list[n.FindingLine], form: ft.Control,
                  open_photo: Callable[[n.PhotoThumb], Handler],
                  toggle: Callable[[n.FindingLine], Handler]) -> list[ft.Control]:
    """The findings tab: the add form, then each finding (open first).

    Args:
        findings: ``notes.column_findings(...)``.
        form: the add-finding card (built by the app: it holds live entries).
        open_photo: gives the handler that shows a photo larger.
        toggle: gives the handler that closes or reopens a finding.

    Returns:
        The controls of the tab.

    Example: ``findings_body(lines, form, lambda p: h, lambda f: h2)``.
    """
    opened = sum(f.status == "open" for f in findings)
    out: list[ft.Control] = [form, text_line(
        f"{len(findings)} finding{'s' if len(findings) != 1 else ''} on this column, "
        f"{opened} open" if findings else "No findings on this column yet.",
        size=16, bold=True)]
    out += [finding_card(i, f, open_photo, toggle(f)) for i, f in enumerate(findings)]
    return out


# -- history -------------------------------------------------------------------------------
def history_body(h: n.History, open_photo: Callable[[n.PhotoThumb], Handler]) -> list[ft.Control]:
    """The history tab: restraint changes, then every reading (corrections marked).

    Args:
        h: ``notes.column_history(...)``.
        open_photo: gives the handler that shows a photo larger.

    Returns:
        Two cards.

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
    return [_card(changes, title="Restraint changes"),
            _card(readings, title="Measurements (every reading kept)")]


# -- retrofit options ----------------------------------------------------------------------
def retrofit_body(options: list[n.RetrofitLine] | None,
                  error: str | None = None) -> list[ft.Control]:
    """The retrofit tab: each saved option with its before -> after check, and the caution.

    Args:
        options: ``notes.retrofit_options(...)``, or ``None`` while they are being checked.
        error: why the options could not be checked (the column as it stands), if so.

    Returns:
        The controls of the tab.

    Example: ``retrofit_body(options)``.
    """
    if options is None:
        return [ft.Semantics(identifier="retrofit-wait", live_region=True, content=ft.Row(
            [ft.ProgressRing(width=22, height=22), text_line("Checking the options...")]))]
    out: list[ft.Control] = [caution_box()]
    if error:
        out.append(ft.Semantics(identifier="retrofit-error", content=text_line(
            error, color=TONES["over"][0])))
    elif not options:
        out.append(text_line("No retrofit options saved for this column.", color=MUTED))
    for i, o in enumerate(options):
        body: list[ft.Control] = [
            text_line(o.description, bold=True),
            text_line(f"{o.status} · saved {o.saved}", size=16, color=MUTED)]
        if o.error:
            body.append(text_line(o.line, color=TONES["over"][0]))
        else:
            body += [
                ft.Row([status_chip(o.before), ft.Icon(ft.Icons.ARROW_FORWARD, color=INK),
                        status_chip(o.after)], wrap=True, spacing=6),
                ft.Semantics(identifier=f"retrofit-{i}-line", content=ft.Column([
                    text_line(f"Design strength {o.before_strength} -> {o.after_strength} "
                              f"({o.gain})"),
                    text_line(f"Utilization {o.before.label} -> {o.after.label} for demand "
                              f"{o.demand}")], spacing=2)),
                text_line(f"Governing: {o.governing_before} -> {o.governing_after}", size=16,
                          color=MUTED)]
            for w in o.warnings:
                body.append(ft.Row([ft.Icon(ft.Icons.REPORT_PROBLEM_OUTLINED, color="#7A5B00",
                                            size=20),
                                    ft.Text(w, size=16, color=INK, expand=True)],
                                   vertical_alignment=ft.CrossAxisAlignment.START))
        out.append(ft.Semantics(identifier=f"retrofit-{i}", content=_card(body)))
    return out
