"""The Section tab's loss-band card (where the recorded loss lies: the full length, or a band
of height with open holes in it) and, for a measured hollow section checked to EN 1993-1-1,
how it was made (hot-finished or cold-formed).

Identifiers: ``band-card``, ``loss-where-<full|band>``, ``band-from``, ``band-to``,
``hole-<flange|web|wall>``, ``save-band``, ``finish-card``, ``finish-<hot-finished|cold-formed>``.
Saves go through ``app.saver`` (checked again, Undo, refusals under the entry they name).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.ui import _entry_controls as ec
from fieldcol.ui import band_model as bm
from fieldcol.ui import readings as r
from fieldcol.ui.views import MUTED, text_line

if TYPE_CHECKING:
    from fieldcol.ui.tab_section import SectionTab

_WHERE = [("full", "Full length"), ("band", "A band of height")]


def _bare(text: str, unit: str) -> str:
    """``6 in`` on an inch site reads ``6`` in an entry that shows ``in`` beside it."""
    return text[:-len(unit) - 1] if text.endswith(" " + unit) else text


class BandCard:
    """The loss band and finish cards of the Section tab.

    Example: ``BandCard(tab).cards(view)``.
    """

    def __init__(self, tab: "SectionTab") -> None:
        self.tab = tab
        self.view: bm.BandView | None = None
        self.where: str | None = None          # None: as recorded
        self.typed: dict[str, str] | None = None
        self.fields: dict[str, ft.TextField] = {}

    def took(self, view: bm.BandView) -> None:
        """Keep the band read in the worker thread (what is typed stays).

        Example: ``card.took(bm.band_view(store, cid))``.
        """
        self.view = view
        if self.typed is None:
            # the unit kept with a bare number is shown beside the entry already
            self.typed = {k: _bare(t, view.unit) for k, t in
                          {"from": view.start, "to": view.end, **view.holes}.items()}

    def cards(self) -> list[ft.Control]:
        """The band card, and the finish card when it applies.

        Example: ``tab.body.controls += card.cards()``.
        """
        v = self.view
        if v is None or self.typed is None:
            return []
        out = [self._band(v)]
        if v.finish_offered:
            out.append(self._finish(v))
        return out

    def _band(self, v: bm.BandView) -> ft.Control:
        where = self.where or ("band" if v.start or v.end else "full")
        typed = self.typed or {}
        parts: list[ft.Control] = [
            text_line("The loss recorded (thickness readings in the Condition tab) lies over:",
                      size=16, color=MUTED),
            ec.choice_row(_WHERE, where, self._pick, "loss-where", said="loss over")]
        self.fields = {}
        if where == "band":
            bare = "in inches" if v.unit == "in" else "in mm"
            for key, label in (("from", "From height"), ("to", "To height")):
                self.fields[f"loss band {key}"] = ec.unit_entry(
                    label, typed.get(key, ""), v.unit, hint=f"above the bottom, {bare}",
                    on_change=self._typed(key), on_submit=self._save)
            holes = []
            for k in v.elements:
                tf = ec.unit_entry(bm.HOLE_WORDS[k], typed.get(k, ""), v.unit,
                                   hint="width lost; empty: none", on_change=self._typed(k),
                                   on_submit=self._save)
                self.fields[bm.HOLE_WORDS[k].lower()] = tf
                holes.append(ft.Container(ft.Semantics(identifier=f"hole-{k}", content=tf),
                                          col={"xs": 12, "sm": 6}))
            parts += [
                ft.ResponsiveRow([
                    ft.Container(ft.Semantics(identifier="band-from",
                                              content=self.fields["loss band from"]),
                                 col={"xs": 6}),
                    ft.Container(ft.Semantics(identifier="band-to",
                                              content=self.fields["loss band to"]),
                                 col={"xs": 6})], spacing=8, run_spacing=8),
                text_line("Open holes at one height in the band (optional):", size=16,
                          color=MUTED),
                ft.ResponsiveRow(holes, spacing=8, run_spacing=8),
                ec.big_button("Save band", ft.Icons.SAVE, self._save, "save-band")]
        elif v.start or v.end:
            parts.append(ec.big_button("Save: loss over the full length", ft.Icons.SAVE,
                                       self._save, "save-band"))
        return ec.card(parts, "Where the loss lies", identifier="band-card")

    def _finish(self, v: bm.BandView) -> ft.Control:
        return ec.card([
            ec.choice_row([(k, w) for k, (w, _) in bm.FINISH_WORDS.items()], v.finish,
                          self._pick_finish, "finish", said="made"),
            text_line(bm.FINISH_WORDS[v.finish][1], size=16, color=MUTED)],
            "How the tube was made", identifier="finish-card")

    # -- handlers -----------------------------------------------------------------------
    def _typed(self, key: str) -> Callable[[Any], None]:
        def keep(e: Any) -> None:
            if self.typed is not None:
                self.typed[key] = e.control.value or ""
            if e.control.error:
                e.control.error = None
                e.control.update()
        return keep

    def _pick(self, where: str) -> Callable[..., None]:
        def pick(_e: Any = None) -> None:
            self.where = where
            self.tab.redraw()
        return pick

    async def _run(self, label: str, change: Callable[[Any], r.Change],
                   fields: dict[str, ft.TextField] | None = None) -> None:
        def forget() -> None:
            self.typed, self.where = None, None  # shown as recorded again

        do, undo = r.undoable(change, forget)
        await self.tab.app.saver.save(label, do, undo=undo, field=fields or None,
                                      done=ec.saved_words)

    async def _save(self, _e: Any = None) -> None:
        d, v = self.tab.app.detail, self.view
        if d is None or v is None:
            return
        where = self.where or ("band" if v.start or v.end else "full")
        typed = dict(self.typed or {})

        def change(store: Any) -> r.Change:
            if where == "full":
                ch = bm.set_band(store, d.id, None)
            else:
                ch = bm.set_band(store, d.id, typed.get("from", ""), typed.get("to", ""),
                                 {k: typed.get(k, "") for k in v.elements})
            self.typed, self.where = None, None  # saved: shown as recorded
            return ch

        label = "loss over the full length" if where == "full" else "loss band"
        await self._run(label, change, dict(self.fields))

    def _pick_finish(self, finish: str) -> Callable[..., Any]:
        async def pick(_e: Any = None) -> None:
            d, v = self.tab.app.detail, self.view
            if d is None or v is None or v.finish == finish:
                return
            await self._run(f"finish {finish}", lambda s: bm.set_finish(s, d.id, finish))
        return pick
