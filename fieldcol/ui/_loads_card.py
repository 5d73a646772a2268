"""The Check tab's loads card: beams bearing on the column at an eccentricity, first-order end
moments per axis and, optionally, the story the column stands in.

What is recorded is listed first (each with Remove); below, one part at a time is added or
changed (a choice row picks it, so a phone shows one short form). Every save goes through
``app.saver`` (checked again, Undo, a refusal in plain words under its entry with the text
kept). The card and its entries are made once and only their contents change: an entry moved
into a card made anew is a new box on the device, which drops its focus and letters not yet
sent (see DEVELOPERS.md, the tab contract).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.ui import _entry_controls as ec
from fieldcol.ui import loads_model as lm
from fieldcol.ui import readings as r
from fieldcol.ui.views import MUTED, text_line

if TYPE_CHECKING:
    from fieldcol.ui.tab_check import CheckTab

_PARTS = [("reactions", "Beams"), ("moments", "Moments"), ("story", "Story")]  # one row at 390 px
#: entry -> its identifier
_ENTRIES = {"load": "reaction-load", "eccentricity": "reaction-eccentricity",
            "top": "moment-top", "bottom": "moment-bottom", "story_load": "story-load",
            "story_buckling": "story-buckling", "story_stiffness": "story-stiffness"}


class LoadsCard:
    """The loads card of one column (identifier ``loads-card``).

    Example: ``card = LoadsCard(tab); card.took(view); card.draw()``.
    """

    def __init__(self, tab: "CheckTab") -> None:
        self.tab = tab
        self.view: lm.LoadsView | None = None
        self.part = "reactions"
        self.axis = {"reactions": "strong", "moments": "strong"}
        self.side = "plus"
        self.curvature: str | None = None   # None: the recorded one for the axis, else single
        self.typed = {k: "" for k in _ENTRIES}
        # Enter in an entry does what the part's button does
        submit = {"load": self._add_reaction, "eccentricity": self._add_reaction,
                  "top": self._save_moments, "bottom": self._save_moments}
        self.entries = {k: ec.unit_entry("", "", None, on_change=self._typed(k), data=k,
                                         on_submit=submit.get(k, self._save_story))
                        for k in _ENTRIES}
        self.boxes = {k: ft.Semantics(identifier=_ENTRIES[k], content=tf)
                      for k, tf in self.entries.items()}
        self.card = ec.card([], "Loads on the column", identifier="loads-card")
        self._col: ft.Column = self.card.content.content
        self._head = list(self._col.controls)

    def took(self, view: lm.LoadsView | None) -> None:
        """Keep the loads read in the worker thread.

        Example: ``card.took(lm.loads_view(store, cid))``.
        """
        self.view = view

    # -- drawing ------------------------------------------------------------------------
    def draw(self) -> ft.Control:
        """The card with what is recorded and the chosen part's form (the same card object).

        Example: ``tab_controls.append(card.draw())``.
        """
        v = self.view
        if v is None:
            self._col.controls = [*self._head, text_line("Loading the loads...", color=MUTED)]
            return self.card
        for k, tf in self.entries.items():
            if (tf.value or "") != self.typed[k]:
                tf.value = self.typed[k]  # e.g. emptied after a save
        parts: list[ft.Control] = [*self._recorded(v), text_line(
            "Add or change (saved, then checked again; Undo in the bar below):", size=16,
            color=MUTED), ec.choice_row(_PARTS, self.part, self._pick("part"), "loads-part",
                                        said="add or change:")]
        parts += {"reactions": self._reaction_form, "moments": self._moment_form,
                  "story": self._story_form}[self.part](v)
        self._col.controls = [*self._head, *parts]
        return self.card

    def _recorded(self, v: lm.LoadsView) -> list[ft.Control]:
        out: list[ft.Control] = []
        lines: list[tuple[str, str, Any, str]] = [
            (x.words, f"reaction-{x.index}", self._remove("reaction", x.index),
             f"reaction {x.index + 1}") for x in v.reactions]
        lines += [(x.words + " (first order)", f"end-moments-{ax}", self._remove("moments", ax),
                   f"{ax} axis end moments") for ax, x in v.moments.items()]
        if v.story:
            lines.append((v.story_words, "story", self._remove("story", None), "the story"))
        if not lines:
            return [text_line("No beam reactions, end moments or story recorded: the check "
                              "takes the axial force alone" + (", plus any bow or plumb."
                                                              if v.has_axial else "."),
                              size=16, color=MUTED)]
        for words, ident, remove, said in lines:
            out.append(ft.Semantics(identifier=ident, label=words, content=ft.Row(
                [ft.Container(text_line(words, size=17), expand=True),
                 ec.small_button("Remove", ft.Icons.DELETE_OUTLINE, remove, f"remove-{ident}",
                                 f"remove {said}")],
                vertical_alignment=ft.CrossAxisAlignment.CENTER, wrap=False)))
        return out

    def _entry(self, key: str, label: str, unit: str | None, hint: str = "") -> ft.Control:
        tf = self.entries[key]
        tf.label = label
        tf.suffix = text_line(unit, size=17, color=MUTED) if unit else None
        tf.helper = hint or None
        return self.boxes[key]

    @staticmethod
    def _pair(a: ft.Control, b: ft.Control) -> ft.Control:
        # one above the other: the pane is phone-wide beside the list on a tablet too, and a
        # label such as "Reaction 2 eccentricity" wraps in half of it
        return ft.Column([a, b], spacing=10, horizontal_alignment=ft.CrossAxisAlignment.STRETCH)

    def _reaction_form(self, v: lm.LoadsView) -> list[ft.Control]:
        n = len(v.reactions) + 1
        axis = self.axis["reactions"]
        return [
            text_line("Bends the column about the", size=16, color=MUTED),
            ec.choice_row([(a, w) for a, (w, _) in lm.AXES.items()], axis,
                          self._pick("reactions-axis"), "reaction-axis", said="bends about the"),
            text_line(lm.AXES[axis][1], size=16, color=MUTED),
            self._pair(self._entry("load", f"Reaction {n} load", v.force_unit,
                                   f"bare numbers in {v.force_unit}; part of the axial demand"),
                       self._entry("eccentricity", f"Reaction {n} eccentricity", v.length_unit,
                                   f"from the column's centre, bare numbers in "
                                   f"{'inches' if v.length_unit == 'in' else 'mm'}; empty: "
                                   f"the face + {v.default_offset_words} is taken")),
            text_line("Side it bears on (beams on opposite sides cancel)", size=16,
                      color=MUTED),
            ec.choice_row([(k, w) for k, (w, _) in lm.SIDES.items()], self.side,
                          self._pick("side"), "reaction-side", said="bears on the"),
            ec.big_button(f"Add reaction {n}", ft.Icons.ADD, self._add_reaction,
                          "add-reaction")]

    def _moment_form(self, v: lm.LoadsView) -> list[ft.Control]:
        axis = self.axis["moments"]
        now = v.moments.get(axis)
        curv = self.curvature or (now.curvature if now else "single")
        return [
            text_line("First-order moments at the ends (amplified by the check), about the",
                      size=16, color=MUTED),
            ec.choice_row([(a, w) for a, (w, _) in lm.AXES.items()], axis,
                          self._pick("moments-axis"), "moment-axis", said="moments about the"),
            self._pair(self._entry("top", "Moment at the top", v.moment_unit,
                                   f"bare numbers in {v.moment_unit}; "
                                   + (f"now {now.top}" if now and now.top else "empty: zero")),
                       self._entry("bottom", "Moment at the bottom", v.moment_unit,
                                   f"bare numbers in {v.moment_unit}; "
                                   + (f"now {now.bottom}" if now and now.bottom
                                      else "empty: zero"))),
            # short words: both on one row at 390 px; the line below says what each means
            ec.choice_row([("single", "Single (C)"), ("reverse", "Reverse (S)")], curv,
                          self._pick("curvature"), "curvature", said="curvature:"),
            text_line(f"{lm.CURVATURES[curv][0]}: {lm.CURVATURES[curv][1]}", size=16,
                      color=MUTED),
            ec.big_button("Save end moments", ft.Icons.SAVE, self._save_moments,
                          "save-moments")]

    def _story_form(self, v: lm.LoadsView) -> list[ft.Control]:
        return [
            text_line("Optional. For the sway of a measured out-of-plumb: the story's total "
                      "gravity load, and its buckling load or its lateral stiffness. Without "
                      "it the column's own load on its own buckling load is taken.", size=16,
                      color=MUTED),
            self._entry("story_load", "Story load", v.force_unit,
                        f"all the columns of the story, in {v.force_unit}"),
            self._pair(self._entry("story_buckling", "Story buckling load", v.force_unit,
                                   f"in {v.force_unit}; or give the stiffness"),
                       self._entry("story_stiffness", "Story stiffness", v.stiffness_unit,
                                   f"sideways force over the sway it makes (H / ΔH), in "
                                   f"{v.stiffness_unit}")),
            ec.big_button("Save story", ft.Icons.SAVE, self._save_story, "save-story")]

    # -- handlers -----------------------------------------------------------------------
    def _typed(self, key: str) -> Callable[[Any], None]:
        def keep(e: Any) -> None:
            ft.context.disable_auto_update()  # a keystroke changes nothing else on screen
            self.typed[key] = e.control.value or ""
            if e.control.error:
                e.control.error = None
                e.control.update()
        return keep

    def _pick(self, what: str) -> Callable[[str], Callable[..., None]]:
        def choose(value: str) -> Callable[..., None]:
            def pick(_e: Any = None) -> None:
                if what == "part":
                    self.part = value
                elif what.endswith("-axis"):
                    self.axis[what.split("-")[0]] = value
                    if what == "moments-axis":
                        self.curvature = None
                elif what == "side":
                    self.side = value
                else:
                    self.curvature = value
                self.tab.redraw()
            return pick
        return choose

    def _done(self, keys: tuple[str, ...], sent: dict[str, str]) -> None:
        """Saved: the entries that still hold what was sent start empty again."""
        for k in keys:
            if self.typed[k] == sent[k]:
                self.typed[k] = ""

    async def _run(self, label: str, change: Callable[[Any], r.Change],
                   fields: dict[str, ft.TextField]) -> None:
        ft.context.disable_auto_update()  # the saver draws the re-checked tab
        do, undo = r.undoable(change)
        await self.tab.app.saver.save(label, do, undo=undo, field=fields, done=ec.saved_words)

    async def _add_reaction(self, _e: Any = None) -> None:
        d, v = self.tab.app.detail, self.view
        if d is None or v is None:
            return
        n = len(v.reactions) + 1
        sent = dict(self.typed)
        axis, side = self.axis["reactions"], lm.SIDES[self.side][1]

        def change(store: Any) -> r.Change:
            ch = lm.add_reaction(store, d.id, sent["load"], axis, sent["eccentricity"], side)
            self._done(("load", "eccentricity"), sent)
            return ch

        await self._run(f"reaction {n}", change, {
            "axial demand": self.entries["load"], f"reaction {n} load": self.entries["load"],
            f"reaction {n} eccentricity": self.entries["eccentricity"]})

    async def _save_moments(self, _e: Any = None) -> None:
        d, v = self.tab.app.detail, self.view
        if d is None or v is None:
            return
        axis = self.axis["moments"]
        now = v.moments.get(axis)
        curv = self.curvature or (now.curvature if now else "single")
        sent = dict(self.typed)

        def change(store: Any) -> r.Change:
            ch = lm.set_end_moments(store, d.id, axis, sent["top"], sent["bottom"], curv)
            self._done(("top", "bottom"), sent)
            self.curvature = None
            return ch

        await self._run(f"{axis} axis end moments", change, {
            "axial demand": self.entries["top"],
            f"{axis} axis moment at the top": self.entries["top"],
            f"{axis} axis moment at the bottom": self.entries["bottom"]})

    async def _save_story(self, _e: Any = None) -> None:
        d = self.tab.app.detail
        if d is None:
            return
        sent = dict(self.typed)

        def change(store: Any) -> r.Change:
            ch = lm.set_story(store, d.id, sent["story_load"], sent["story_buckling"],
                              sent["story_stiffness"])
            self._done(("story_load", "story_buckling", "story_stiffness"), sent)
            return ch

        await self._run("story", change, {
            "axial demand": self.entries["story_load"],
            "story load": self.entries["story_load"],
            "story buckling load": self.entries["story_buckling"],
            "story stiffness": self.entries["story_stiffness"]})

    def _remove(self, what: str, which: Any) -> Callable[..., Any]:
        async def remove(_e: Any = None) -> None:
            d = self.tab.app.detail
            if d is None:
                return
            if what == "reaction":
                label = f"reaction {which + 1} removed"
                change: Callable[[Any], r.Change] = \
                    lambda s: lm.remove_reaction(s, d.id, which)
            elif what == "moments":
                label = f"{which} axis end moments removed"
                change = lambda s: lm.set_end_moments(s, d.id, which, "", "")  # noqa: E731
            else:
                label = "story removed"
                change = lambda s: lm.set_story(s, d.id, "", "", "")  # noqa: E731
            await self._run(label, change, {})
        return remove
