"""Controls of the Check tab's result: what sits right under the status (capacity about each
axis and in torsion, what governs and why, utilization, warnings), the column-curve chart and
the trace one tap away. They render ``fieldcol.ui.check_model.CheckSummary``."""

from __future__ import annotations

import flet as ft

from fieldcol.ui import model as m
from fieldcol.ui import views as v
from fieldcol.ui._drawing import curve_canvas
from fieldcol.ui.check_model import CheckSummary


def result_cards(s: CheckSummary) -> list[ft.Control]:
    """The status, the result line, each mode's capacity, what governs and why, the warnings.

    Args:
        s: the ``CheckSummary``.

    Returns:
        Controls, status first (identifier ``status``), then ``interaction`` (with bending:
        which interaction equation governs), ``capacity-<mode>``, ``governing``,
        ``warning-<i>``.

    Example: ``result_cards(latest_summary(store, cid))``.
    """
    status = m.Status(s.status_word, s.status_icon, s.status_tone,
                      None if s.utilization == "none" else s.utilization)
    fg = v.TONES[s.status_tone][0]
    head: list[ft.Control] = [
        ft.Row([v.status_chip(status, big=True, identifier="status")], wrap=True),
        ft.Semantics(identifier="result-line", content=v.text_line(s.result_line, size=18,
                                                                   bold=True)),
        *[v.text_line(x, color=v.MUTED) for x in s.extra],
        *([ft.Semantics(identifier="interaction", content=ft.Row(
            [ft.Icon(ft.Icons.FUNCTIONS, color=v.INK, size=22),
             ft.Text(s.interaction, size=16, color=v.INK, expand=True)],
            vertical_alignment=ft.CrossAxisAlignment.START))] if s.interaction else []),
        ft.Semantics(identifier="governing", content=ft.Column([
            v.text_line(s.governs, bold=True, color=fg), v.text_line(s.why)], spacing=2)),
    ]
    rows: list[ft.Control] = []
    for c in s.capacities:
        mark = " · governs" if c.governs else ("  (reported only: closed section)"
                                                 if not c.applies else "")
        detail = " · ".join(x for x in (c.length and f"length {c.length}", c.slenderness) if x)
        rows.append(ft.Semantics(identifier=f"capacity-{c.mode}", content=ft.Container(
            ft.Row([ft.Column([v.text_line(c.name + mark, bold=c.governs),
                               *([v.text_line(detail, color=v.MUTED)] if detail else [])],
                              spacing=0, expand=True),
                    v.text_line(c.strength, size=18, bold=True)],
                   vertical_alignment=ft.CrossAxisAlignment.CENTER),
            padding=ft.Padding.symmetric(vertical=6, horizontal=8), border_radius=6,
            bgcolor=v.TONES[s.status_tone][1] if c.governs else None,
            border=ft.Border.all(2, fg) if c.governs else None)))
    head.append(v._card(rows, title="Capacity of each mode"))
    out = [v._card(head, title=s.title + (f" · {s.basis}" if s.basis else ""))]
    if s.warnings:
        out.append(v._card([ft.Semantics(identifier=f"warning-{i}", content=ft.Row(
            [ft.Icon(ft.Icons.REPORT_PROBLEM_OUTLINED, color=v.CAUTION_EDGE),
             ft.Text(w, size=16, color=v.INK, expand=True)],
            vertical_alignment=ft.CrossAxisAlignment.START))
            for i, w in enumerate(s.warnings)], title=f"Warnings ({len(s.warnings)})"))
    return out


def chart_card(s: CheckSummary, width: float = 340) -> ft.Control | None:
    """The column curve with this column's points, or None when the check has none.

    Example: ``chart_card(summary)``.
    """
    if s.chart is None:
        return None
    c = s.chart
    key = [v.text_line(("Filled dot, " if p.governs else "Open dot, ") + f"{p.label}: {c.x_name} {p.x:.3g}, "
                       f"{p.stress:.3g} {c.stress_unit}" + (" (governs)" if p.governs else ""),
                       bold=p.governs) for p in c.points]
    return ft.Semantics(identifier="column-curve", content=v._card([
        curve_canvas(c, width=width, height=250), *key,
        v.text_line(c.caption, color=v.MUTED)], title="Column curve"))


def trace_tile(s: CheckSummary) -> ft.Control:
    """The full trace, folded: one tap opens it (identifier ``trace``). Its steps are made
    when it opens (three texts a step, often a hundred steps: sent folded, they made the column
    screen slow to open).

    Example: ``trace_tile(summary)``.
    """
    def steps() -> list[ft.Control]:
        return [ft.Container(content=ft.Column([
            v.text_line(f"{t.symbol} = {t.value}", bold=True, selectable=True),
            v.text_line(t.what),
            v.text_line(t.source, color=v.MUTED)],
            spacing=1), padding=ft.Padding.symmetric(vertical=4)) for t in s.trace]

    def toggle(e: ft.Event[ft.ExpansionTile]) -> None:
        opened = e.data in (True, "true")
        if opened and not tile.controls:
            tile.controls = steps()

    tile = ft.ExpansionTile(
        title=v.text_line(f"Full calculation ({len(s.trace)} steps)", bold=True),
        controls=[], controls_padding=ft.Padding.symmetric(horizontal=12),
        expanded_cross_axis_alignment=ft.CrossAxisAlignment.START, maintain_state=False,
        on_change=toggle)
    return ft.Semantics(identifier="trace", content=ft.Container(
        content=tile, border=ft.Border.all(1, v.LINE), border_radius=10, bgcolor=v.CARD))
