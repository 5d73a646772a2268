"""The column screen's Section tab: the section now, picked from the catalogue with type-ahead,
or measured (with the gauge) and matched against the catalogue's rolling tolerances; cover
plates (welded, riveted or bolted, with the fasteners' pitch); the recorded loss labelled as what it is (remaining thickness, or loss per face),
where it lies (the full length, or a band of height with holes: ``_band_card.py``) and, for a
measured hollow section under EN 1993-1-1, how it was made.

Every save goes through ``app.saver`` (undo, "not saved" with retry, typed text kept); the
column is checked again after each, and what is typed stays while the tab is open.
"""

from __future__ import annotations

import asyncio
from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.errors import InputError
from fieldcol.ui import _entry_controls as ec
from fieldcol.ui import band_model as bm
from fieldcol.ui import readings as r
from fieldcol.ui import section as sx
from fieldcol.ui._band_card import BandCard
from fieldcol.ui._builtup_card import BuiltCard
from fieldcol.ui._tab import Tab
from fieldcol.ui.saving import plain_error
from fieldcol.ui.views import MUTED, TONES, text_line

if TYPE_CHECKING:
    from fieldcol.ui.app import FieldApp

_SHAPES = [("i", "I or H"), ("rect", "Box"), ("round", "Round")]
_JOINTS = [("welded", "Welded"), ("riveted", "Riveted"), ("bolted", "Bolted")]
_GAUGES = [("caliper", "Caliper"), ("tape", "Tape"), ("steel rule", "Rule"),
           ("ultrasonic thickness gauge", "Ultrasonic")]


_NO_PLATES = {"thickness": "", "width": "", "connection": "welded", "pitch": ""}


class SectionTab(Tab):
    """The Section tab (identifier ``tab-section``).

    Example: ``SectionTab(app)``; the app calls ``await tab.load()`` then ``tab.controls()``.
    """

    name, label, icon = "section", "Section", ft.Icons.VIEW_AGENDA_OUTLINED

    def __init__(self, app: "FieldApp") -> None:
        super().__init__(app)
        self.view: sx.SectionView | None = None
        self.search = ""
        self.found: list[str] = []
        self.shape: str | None = None
        self.typed: dict[str, dict[str, str]] = {}   # shape -> key -> text as typed
        self.gauge: str | None = None
        self.matches: list[sx.MatchLine] | None = None
        self.plates = _NO_PLATES.copy()
        self.body = ft.Column(spacing=12)
        self.suggest = ft.Column(spacing=6)
        self.match_area = ft.Column(spacing=10)
        self.fields: dict[str, ft.TextField] = {}
        self.search_field: ft.TextField | None = None
        self.plate_field: ft.TextField | None = None
        self.plate_fields: dict[str, ft.TextField] = {}
        self.built = BuiltCard(self)
        self.band = BandCard(self)

    async def load(self) -> None:
        """Fetch the section view-model (worker thread) and redraw.

        Example: ``await tab.load()``.
        """
        d = self.app.detail
        if d is None:
            return
        view, band = await asyncio.to_thread(
            lambda s: (sx.section_view(s, d.id), bm.band_view(s, d.id)), self.app.store)
        self.view = view
        self.band.took(band)
        if view.plates and not any(self.plates[k] for k in ("thickness", "width", "pitch")):
            self.plates = {"thickness": view.plates[0], "width": view.plates[1],
                           "connection": view.plate_joint[0], "pitch": view.plate_joint[1]}
        self._draw()

    def controls(self) -> list[ft.Control]:
        """The tab's body (synchronous, no I/O).

        Example: ``page.add(*tab.controls())``.
        """
        if self.view is None:
            return [text_line("Loading the section...", color=MUTED)]
        self._draw()
        return [ec.status_line(self.app.detail), self.body]

    # -- drawing ------------------------------------------------------------------------
    def _update(self, *controls: ft.Control) -> None:
        for c in controls:
            try:
                c.update()
            except RuntimeError:  # not on the page (another tab shown): drawn when it is
                pass

    def _draw(self) -> None:
        v = self.view
        assert v is not None
        # the matches follow the card, not inside it: a card taller than the screen had its
        # node cut short by the web client, and a match's Use button inside it with it
        parts = [self._now(v), self._pick(v), self._measure(v), self.match_area]
        if v.plates_allowed and v.source != "built":
            parts.append(self._plates(v))
        if v.source not in ("built", "none"):
            parts += self.band.cards()
        parts.append(self.built.card(v))
        self.body.controls = parts + [ft.Container(height=96)]  # clear of the save bar

    def _now(self, v: sx.SectionView) -> ft.Control:
        source = {"catalogue": "from the catalogue (nominal dimensions)",
                  "measured": "as measured (these dimensions are checked)",
                  "built": "built up from parts (checked as a built-up member)",
                  "none": "record one below"}[v.source]
        lines: list[ft.Control] = [
            ft.Semantics(identifier="section-now", label=f"section {v.summary}, {source}",
                         content=text_line(v.summary, size=22, bold=True)),
            text_line(source, size=16, color=MUTED)]
        # two to a row: the pane is phone-wide beside the list on a tablet too
        grid = [ft.Container(ec.value_line(x.label, x.value), col={"xs": 6})
                for x in v.dimensions]
        if grid:
            lines.append(ft.ResponsiveRow(grid, spacing=8, run_spacing=8))
        for x in v.condition:
            lines.append(ec.value_line(x.label, x.value))
        for note in v.notes:
            lines.append(ft.Row([ft.Icon(ft.Icons.WARNING, color=TONES["over"][0], size=22),
                                 text_line(note, size=16, color=TONES["over"][0])],
                                vertical_alignment=ft.CrossAxisAlignment.START, wrap=False))
        if v.measured:
            m0 = v.measured[0]
            who = ", ".join(p for p in (m0.gauge, m0.who, m0.when) if p)
            lines.append(text_line("Measured: " + "; ".join(f"{m.label.lower()} {m.value}"
                                                            for m in v.measured)
                                   + (f" ({who})" if who else ""), size=16, color=MUTED))
        return ec.card(lines, "Section now", identifier="section-card")

    def _pick(self, v: sx.SectionView) -> ft.Control:
        self.search_field = ec.unit_entry("Catalogue name", self.search, None,
                                          hint="e.g. W14X90, HSS8X8X1/2, HEB 300",
                                          on_change=self._typed_search,
                                          on_submit=self._submit_search)
        self._fill_suggest()
        return ec.card([ft.Semantics(identifier="section-search", content=self.search_field),
                        self.suggest], "Pick from the catalogue")

    def _fill_suggest(self) -> None:
        rows: list[ft.Control] = []
        for name in self.found:
            box = ft.Container(
                content=ft.Row([ft.Icon(ft.Icons.ARROW_FORWARD, size=22),
                                text_line(name, size=18, bold=True)], spacing=8),
                on_click=self._choose(name), ink=True, height=52,
                padding=ft.Padding.symmetric(horizontal=12), border_radius=8,
                border=ft.Border.all(1, ec.LINE), alignment=ft.Alignment.CENTER_LEFT)
            rows.append(ft.Semantics(identifier=f"pick-{name}", button=True,
                                     label=f"use {name}", content=box))
        self.suggest.controls = rows

    def _measure(self, v: sx.SectionView) -> ft.Control:
        shape = self.shape or v.shape
        gauge = self.gauge or v.gauge
        typed = self.typed.setdefault(shape, dict(v.typed) if shape == v.shape else {})
        self.fields = {}
        entries: list[ft.Control] = []
        for key, label in sx.DIMENSIONS[shape]:
            tf = ec.unit_entry(label, typed.get(key, ""), v.unit, on_change=self._typed_dim(key),
                               on_submit=self._find, data=key)
            self.fields[key] = tf
            entries.append(ft.Container(ft.Semantics(identifier=f"dim-{key}", content=tf),
                                        col={"xs": 6}))
        self._fill_matches()
        return ec.card([
            ec.choice_row(_SHAPES, shape, self._pick_shape, "shape", said="shape:"),
            # an empty entry shows its unit only once it has the keyboard: say it beforehand
            text_line(f"Bare numbers in {'inches' if v.unit == 'in' else 'mm'}.", size=16,
                      color=MUTED),
            ft.ResponsiveRow(entries, spacing=8, run_spacing=8),
            text_line("Gauge used", size=16, color=MUTED),
            ec.choice_row(_GAUGES, gauge if gauge in dict(_GAUGES) else "", self._pick_gauge,
                          "gauge", said="gauge:"),
            ft.Row([ec.big_button("Find matches", ft.Icons.SEARCH, self._find, "find-matches"),
                    ec.big_button("Keep as measured", ft.Icons.STRAIGHTEN, self._keep,
                                  "keep-measured", filled=False)], wrap=True, spacing=8,
                   run_spacing=8)], "Measure it", identifier="measure-card")

    def _fill_matches(self) -> None:
        if self.matches is None:
            self.match_area.controls = []
            return
        if not self.matches:
            self.match_area.controls = [text_line("No catalogue section of this kind.",
                                                  color=MUTED)]
            return
        out: list[ft.Control] = []
        if not any(m.within for m in self.matches):
            out.append(text_line("None lies within the rolling tolerances: the nearest are "
                                 "below. Keeping the section as measured is the safe choice.",
                                 size=16))
        for i, m in enumerate(self.matches):
            fg, bg, border = TONES["ok" if m.within else "none"]
            head = ft.Row([text_line(m.name, size=20, bold=True),
                           ft.Container(ft.Row([ft.Icon(ft.Icons.CHECK_CIRCLE if m.within
                                                        else ft.Icons.WARNING, color=fg,
                                                        size=20),
                                                text_line(m.word, size=16, bold=True, color=fg)],
                                               spacing=4, tight=True),
                                        bgcolor=bg, border=ft.Border.all(1, border),
                                        border_radius=6,
                                        padding=ft.Padding.symmetric(horizontal=8, vertical=3))],
                          wrap=True, spacing=8)
            lines = [text_line(x, size=16) for x in m.deviations]
            # the button beside the labelled words, not inside them: a labelled node whose lines
            # wrap is sized short by the web client, and the button inside it was cut to 34 px
            words = ft.Semantics(identifier=f"match-{i}", label=m.label, content=ft.Column(
                [head, *lines], spacing=10, horizontal_alignment=ft.CrossAxisAlignment.STRETCH))
            out.append(ec.card([words, ec.big_button(
                f"Use {m.name}", ft.Icons.CHECK, self._accept(m.name), f"accept-{m.name}",
                filled=m.within)]))
        self.match_area.controls = out

    def _plates(self, v: sx.SectionView) -> ft.Control:
        self.plate_field = ec.unit_entry("Plate thickness", self.plates["thickness"], v.unit,
                                         on_change=self._typed_plate("thickness"))
        width = ec.unit_entry("Plate width", self.plates["width"], v.unit,
                              hint="empty: as wide as the flange",
                              on_change=self._typed_plate("width"))
        how = self.plates["connection"]
        self.plate_fields = {"plate thickness": self.plate_field, "plate width": width}
        parts: list[ft.Control] = [
            text_line("On both flanges, on the steel that remains. Held by:", size=16,
                      color=MUTED),
            ec.choice_row(_JOINTS, how, self._pick_joint, "plate-connection",
                          said="plates held by"),
            ft.ResponsiveRow([
                ft.Container(ft.Semantics(identifier="plate-thickness", content=self.plate_field),
                             col={"xs": 6}),
                ft.Container(ft.Semantics(identifier="plate-width", content=width),
                             col={"xs": 6})], spacing=8)]
        if how != "welded":
            pitch = ec.unit_entry("Rivet pitch" if how == "riveted" else "Bolt pitch",
                                  self.plates["pitch"], v.unit,
                                  hint="spacing along the column, in one line",
                                  on_change=self._typed_plate("pitch"))
            self.plate_fields.update({"rivet pitch": pitch, "bolt pitch": pitch,
                                      "plate pitch": pitch})
            parts.append(ft.Semantics(identifier="plate-pitch", content=pitch))
        parts.append(ec.big_button("Save plates", ft.Icons.SAVE, self._save_plates,
                                   "save-plates"))
        if v.plates:
            parts.append(ec.small_button("Remove plates", ft.Icons.DELETE_OUTLINE,
                                         self._remove_plates, "remove-plates"))
        return ec.card(parts, "Cover plates")

    # -- handlers -----------------------------------------------------------------------
    def _typed_search(self, e: Any) -> None:
        self.search = e.control.value or ""
        if e.control.error:
            e.control.error = None
            self._update(e.control)
        # the catalogue index is built once and held: a search is a scan of ~1,200 names
        self.found = sx.catalogue_search(self.search, 6)
        self._fill_suggest()
        self._update(self.suggest)

    async def _submit_search(self, _e: Any = None) -> None:
        if self.found:
            await self._choose(self.found[0])()
        elif self.search.strip():
            await self._choose(self.search)()

    def _choose(self, name: str) -> Callable[..., Any]:
        async def choose(_e: Any = None) -> None:
            d = self.app.detail
            if d is None:
                return
            done: list[r.Change] = []

            def do(store: Any) -> r.Change:
                ch = sx.choose_section(store, d.id, name)
                done.append(ch)
                self.search, self.found, self.matches = "", [], None  # saved: start afresh
                return ch

            await self.app.saver.save(f"section {name}", do, undo=self._undo(done),
                                      field=self.search_field, done=ec.saved_words)
        return choose

    def _typed_dim(self, key: str) -> Callable[[Any], None]:
        def keep(e: Any) -> None:
            shape = self.shape or (self.view.shape if self.view else "i")
            self.typed.setdefault(shape, {})[key] = e.control.value or ""
            if e.control.error:
                e.control.error = None
                self._update(e.control)
        return keep

    def _pick_shape(self, shape: str) -> Callable[..., None]:
        def pick(_e: Any = None) -> None:
            self.shape, self.matches = shape, None
            self.redraw()
        return pick

    def _pick_gauge(self, gauge: str) -> Callable[..., None]:
        def pick(_e: Any = None) -> None:
            self.gauge = gauge
            self.redraw()
        return pick

    def _current(self) -> tuple[str, dict[str, str], str]:
        assert self.view is not None
        shape = self.shape or self.view.shape
        return shape, dict(self.typed.get(shape, {})), self.gauge or self.view.gauge

    def _field_for(self, e: Exception) -> ft.TextField | None:
        """The entry an error names (``flange width`` -> the flange width entry)."""
        shape = self.shape or (self.view.shape if self.view else "i")
        for key, label in sx.DIMENSIONS[shape]:
            if getattr(e, "field", "") == label.lower():
                return self.fields.get(key)
        return None

    async def _find(self, _e: Any = None) -> None:
        if self.view is None:
            return
        shape, typed, gauge = self._current()
        system = "us" if self.view.unit == "in" else "si"
        try:
            found = await asyncio.to_thread(sx.find_matches, shape, typed, gauge, system, 5,
                                            self.view.code)
        except InputError as e:
            tf = self._field_for(e)
            self.matches = None
            self._fill_matches()
            if tf is not None:
                tf.error = plain_error(e)
                self._update(tf)
            self.match_area.controls = [text_line(plain_error(e), size=16,
                                                  color=TONES["over"][0])]
            self._update(self.match_area)
            return
        self.matches = found
        self._fill_matches()
        self._update(self.match_area)

    def _accept(self, name: str | None) -> Callable[..., Any]:
        async def accept(_e: Any = None) -> None:
            d = self.app.detail
            if d is None or self.view is None:
                return
            shape, typed, gauge = self._current()
            person, visit = self.app.person, self.app.visit_id
            done: list[r.Change] = []

            def do(store: Any) -> r.Change:
                ch = sx.save_measured(store, d.id, shape, typed, gauge, accept=name,
                                      person=person, visit_id=visit)
                done.append(ch)
                self.matches = None  # the readings are kept: the form shows them as saved
                return ch

            label = f"section {name} (measured)" if name else "section as measured"
            field = None
            try:
                sx.read_dimensions(shape, typed, "us" if self.view.unit == "in" else "si")
            except InputError as e:  # point the saver at the entry the error names
                field = self._field_for(e)
            await self.app.saver.save(label, do, undo=self._undo(done), field=field,
                                      done=ec.saved_words)
        return accept

    async def _keep(self, _e: Any = None) -> None:
        await self._accept(None)()

    def _typed_plate(self, key: str) -> Callable[[Any], None]:
        def keep(e: Any) -> None:
            self.plates[key] = e.control.value or ""
            if e.control.error:
                e.control.error = None
                self._update(e.control)
        return keep

    def _pick_joint(self, how: str) -> Callable[..., None]:
        def pick(_e: Any = None) -> None:
            self.plates["connection"] = how
            self.redraw()
        return pick

    async def _save_plates(self, _e: Any = None) -> None:
        d = self.app.detail
        if d is None:
            return
        t, w, how = self.plates["thickness"], self.plates["width"], self.plates["connection"]
        # a pitch typed before welded was picked is not the record's: welded plates have none
        p = self.plates["pitch"] if how != "welded" else None
        done: list[r.Change] = []

        def do(store: Any) -> r.Change:
            ch = sx.set_plates(store, d.id, t if t.strip() else "", w, how, p)
            done.append(ch)
            return ch

        await self.app.saver.save(f"cover plates {t.strip()}", do, undo=self._undo(done),
                                  field=self.plate_fields or self.plate_field,
                                  done=ec.saved_words)

    async def _remove_plates(self, _e: Any = None) -> None:
        d = self.app.detail
        if d is None:
            return
        done: list[r.Change] = []

        def do(store: Any) -> r.Change:
            ch = sx.set_plates(store, d.id, None)
            done.append(ch)
            self.plates = _NO_PLATES.copy()
            return ch

        await self.app.saver.save("cover plates removed", do, undo=self._undo(done),
                                  done=ec.saved_words)

    @staticmethod
    def _undo(done: list[r.Change]) -> Callable[[Any], None]:
        def undo(store: Any) -> None:
            if done:
                r.undo_change(store, done[-1])
        return undo
