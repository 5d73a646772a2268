"""The Findings tab of a column: a photo of a defect in two taps, findings with where they are
(face and height), their photos with markup, and the column's own photos.

The short path: "Photo of a defect" -> pick or take the photo -> a new open finding holds it at
once (nothing to type first); its card opens with one line for the words and a Save.
Every save goes through ``app.saver.save`` (undo, "not saved" with retry).
Identifiers: ``photo-defect``, ``new-finding``, ``finding-form``, ``finding-text``,
``finding-category``, ``severity-<s>``, ``face-<f>``, ``finding-height``, ``save-finding``,
``hide-finding-form``, ``finding-note``, ``finding-<i>``, ``finding-<i>-edit``,
``finding-<i>-photo``, ``finding-<i>-toggle``, ``photo-f<i>-<j>``, ``column-photos``,
``column-photo-add``, ``photo-c-<j>``.
"""

from __future__ import annotations

import asyncio
import weakref
from typing import TYPE_CHECKING, Any, Callable

import flet as ft

from fieldcol.ui import views as v

from fieldcol.errors import InputError
from fieldcol.ui._tab import Tab
from fieldcol.ui import findings as fm
from fieldcol.ui import photos as pm
from fieldcol.ui.intake import intake_for
from fieldcol.ui.photo_views import photo_opener, thumbnails
from fieldcol.ui.views import INK, LINE, MUTED, TAP, TONES, _card, text_line

if TYPE_CHECKING:
    from fieldcol.ui.app import FieldApp

Handler = Callable[..., Any]
ACCENT, CARD, CHOSEN_BG = v.ACCENT, v.CARD, v.CHOSEN_BG
ICONS = {"info_outline": ft.Icons.INFO_OUTLINE, "low_priority": ft.Icons.LOW_PRIORITY,
         "report_outlined": ft.Icons.REPORT_OUTLINED, "warning": ft.Icons.WARNING,
         "dangerous": ft.Icons.DANGEROUS, "radio_button_unchecked": ft.Icons.RADIO_BUTTON_UNCHECKED,
         "task_alt": ft.Icons.TASK_ALT}
# severity tones: the word and icon say it, the tint only helps
SEVERITY_TONES = {"info": "none", "low": "none", "medium": "none", "high": "over", "urgent": "over"}
# what is typed survives reloads and tab switches: per app session, per column
_DRAFTS: "weakref.WeakKeyDictionary[Any, dict[str, dict]]" = weakref.WeakKeyDictionary()


def tag(word: str, icon: str, tone: str) -> ft.Control:
    """A word with its icon on a tinted chip (the word says it; the tint only helps).

    Example: ``tag("high", "warning", "over")``.
    """
    fg, bg, border = TONES[tone]
    return ft.Container(
        content=ft.Row([ft.Icon(ICONS.get(icon, ft.Icons.INFO_OUTLINE), color=fg, size=18),
                        text_line(word, size=16, bold=True, color=fg)], spacing=4, tight=True),
        bgcolor=bg, border=ft.Border.all(1, border), border_radius=6,
        padding=ft.Padding.symmetric(horizontal=8, vertical=3))


def choice_row(prefix: str, options: list[tuple[str, str]], current: str,
               choose: Callable[[str], Handler], what: str) -> ft.Control:
    """Choices as 48 px buttons; the chosen one is ticked, bold and marked selected.

    Args:
        prefix: identifier prefix (``<prefix>-<key>``).
        options: (key, word) pairs.
        current: the chosen key (``""`` for none).
        choose: gives the click handler for a key; a tap on the chosen one unchooses it.
        what: what is chosen, for a screen reader (``severity``).

    Example: ``choice_row("face", [("web", "web")], "", handler, "face")``.
    """
    items: list[ft.Control] = []
    for key, word in options:
        on = key == current
        box = ft.Container(
            content=ft.Row([ft.Icon(ft.Icons.CHECK if on else ft.Icons.CIRCLE_OUTLINED, size=18,
                                    color=INK if on else MUTED),
                            text_line(word, size=16, bold=on)], spacing=4, tight=True),
            on_click=choose(key), ink=True, height=TAP,
            padding=ft.Padding.symmetric(horizontal=12), border_radius=8,
            bgcolor=CHOSEN_BG if on else CARD,
            border=ft.Border.all(2.5 if on else 1, ACCENT if on else LINE))
        items.append(ft.Semantics(identifier=f"{prefix}-{key}", button=True, selected=on,
                                  label=f"{what} {word}{' (chosen)' if on else ''}",
                                  content=box))
    return ft.Row(items, wrap=True, spacing=6, run_spacing=6)


def _error_style() -> ft.TextStyle:
    return ft.TextStyle(size=16, color=TONES["over"][0])


class FindingsTab(Tab):
    """Findings and photos of the shown column (see the module docstring)."""

    name, label, icon = "findings", "Findings", ft.Icons.ASSIGNMENT_LATE_OUTLINED

    def __init__(self, app: "FieldApp") -> None:
        super().__init__(app)
        self.findings: list[fm.FindingLine] | None = None
        self.column_photos: list[pm.PhotoThumb] = []
        self.root = ft.Column(spacing=12, horizontal_alignment=ft.CrossAxisAlignment.STRETCH)
        self.note = ft.Text("", size=16, color=INK)
        self.fields: dict[str, ft.TextField] = {}
        # the picker is a service the client must know before the first tap asks it
        intake_for(app.page)

    # -- state kept across reloads ---------------------------------------------------------
    @property
    def _state(self) -> dict[str, Any]:
        per_app = _DRAFTS.setdefault(self.app, {})
        cid = self.app.detail.id if self.app.detail is not None else ""
        return per_app.setdefault(cid, {"draft": fm.Draft(), "errors": {}, "open": False,
                                        "editing": None})

    @property
    def cid(self) -> str:
        assert self.app.detail is not None
        return self.app.detail.id

    # -- contract --------------------------------------------------------------------------
    async def load(self) -> None:
        """Fetch the column's findings and photos (off the UI loop)."""
        cid = self.cid
        store = self.app.store
        self.findings, self.column_photos = await asyncio.to_thread(
            lambda: (fm.column_findings(store, cid), pm.photos_of(store, column_id=cid)))

    def controls(self) -> list[ft.Control]:
        """The tab's body (synchronous: built from what ``load`` fetched)."""
        self._build()
        return [self.root]

    # -- building -------------------------------------------------------------------------
    def _redraw(self) -> None:
        self._build()
        try:
            self.root.update()  # only this tab's controls are compared again: quick
        except RuntimeError:  # not on the page (the tab was switched meanwhile)
            pass

    def _build(self) -> None:
        st = self._state
        findings = self.findings or []
        # the note is hidden as a whole when silent: a hidden child of a Semantics draws an
        # error box in the page
        note = ft.Semantics(identifier="finding-note", live_region=True, content=self.note,
                            visible=bool(self.note.value))
        top = ft.Row([
            ft.Semantics(identifier="photo-defect", button=True,
                         label="Photo of a defect: take or pick a photo, it becomes a finding",
                         content=ft.FilledButton("Photo of a defect", icon=ft.Icons.ADD_A_PHOTO,
                                                 on_click=self._photo_defect, height=TAP)),
            ft.Semantics(identifier="new-finding", button=True, content=ft.OutlinedButton(
                "New finding", icon=ft.Icons.ADD, on_click=self._open_form(None), height=TAP))],
            wrap=True, spacing=8, run_spacing=8)
        out: list[ft.Control] = [top, note]
        if st["open"] and st["editing"] is None:
            out.append(self._form("New finding"))
        opened = sum(f.status == "open" for f in findings)
        out.append(text_line(
            f"{len(findings)} finding{'s' if len(findings) != 1 else ''} on this column, "
            f"{opened} open" if findings else "No findings on this column yet.",
            size=17, bold=True))
        for i, f in enumerate(findings):
            out.append(self._card(i, f))
        out.append(self._column_photos())
        self.root.controls = out

    def _card(self, i: int, f: fm.FindingLine) -> ft.Control:
        st = self._state
        closed = f.status == "closed"
        head = ft.Row([tag(f.severity_word, f.severity_icon,
                           SEVERITY_TONES.get(f.severity, "none")),
                       tag(f.status_word, f.status_icon, "ok" if closed else "none"),
                       text_line(f.category, size=16, color=MUTED)], wrap=True, spacing=8)
        body: list[ft.Control] = [head]
        if f.needs_words:
            body.append(ft.Row([ft.Icon(ft.Icons.EDIT_NOTE, color=INK, size=20),
                                text_line("Words to add: say what the photo shows", bold=True)],
                               spacing=4, wrap=True))
        else:
            body.append(text_line(f.text, color=MUTED if closed else INK))
        body.append(text_line(f"where: {f.where}" if f.where else "where: not said yet",
                              size=16, color=INK if f.where else MUTED))
        body.append(text_line(f"noted {f.date}", size=16, color=MUTED))
        if f.photos:
            body.append(thumbnails(f.photos, self._open_photo, f"f{i}"))
        if st["open"] and st["editing"] == f.id:
            body.append(self._form("Edit this finding"))
        else:
            body.append(ft.Row([
                ft.Semantics(identifier=f"finding-{i}-edit", button=True,
                             content=ft.OutlinedButton(
                                 "Add words" if f.needs_words else "Edit",
                                 icon=ft.Icons.EDIT, on_click=self._open_form(f), height=TAP)),
                ft.Semantics(identifier=f"finding-{i}-photo", button=True,
                             content=ft.OutlinedButton(
                                 "Add photo", icon=ft.Icons.ADD_A_PHOTO,
                                 on_click=self._add_photo(finding_id=f.id), height=TAP)),
                ft.Semantics(identifier=f"finding-{i}-toggle", button=True,
                             content=ft.OutlinedButton(
                                 "Reopen" if closed else "Close finding",
                                 icon=ft.Icons.UNDO if closed else ft.Icons.TASK_ALT,
                                 on_click=self._toggle(f), height=TAP))],
                wrap=True, spacing=6, run_spacing=6))
        return ft.Semantics(identifier=f"finding-{i}", label=f.label, content=ft.Container(
            content=ft.Column(body, spacing=6), border=ft.Border.all(1, LINE), border_radius=10,
            padding=12, bgcolor=v.BG if closed else CARD))

    def _form(self, title: str) -> ft.Control:
        st = self._state
        d: fm.Draft = st["draft"]
        errors: dict[str, str] = st["errors"]

        def field(key: str, label: str, helper: str, **kw: Any) -> ft.Control:
            def on_change(e: Any) -> None:
                setattr(d, key, e.control.value or "")
                if errors.pop(key, None) is not None:  # being corrected: the message goes
                    e.control.error = None
                    e.control.update()
            tf = ft.TextField(label=label, value=getattr(d, key), on_change=on_change,
                              helper=helper, text_size=17, color=INK, border_color=LINE,
                              error=errors.get(key), error_max_lines=3, helper_max_lines=2,
                              error_style=_error_style(),
                              helper_style=ft.TextStyle(size=16, color=MUTED), **kw)
            self.fields[key] = tf
            return ft.Semantics(identifier=f"finding-{key}", content=tf)

        controls: list[ft.Control] = [
            field("text", "What was found", "one line is enough, e.g. web pitted 3 mm deep",
                  multiline=True, min_lines=1, max_lines=4, autofocus=True,
                  on_submit=self._save),
            field("category", "Category", "e.g. corrosion, bow, bracing, damage"),
            text_line("Severity", size=16, color=MUTED),
            choice_row("severity", [(s, fm.SEVERITY_WORDS[s][0]) for s in fm.SEVERITIES],
                       d.severity, self._pick("severity"), "severity")]
        if errors.get("severity"):
            controls.append(ft.Semantics(identifier="severity-error", content=text_line(
                errors["severity"], size=16, color=TONES["over"][0])))
        controls += [
            text_line("Which face (optional)", size=16, color=MUTED),
            choice_row("face", [(k, fm.FACE_WORDS[k]) for k in fm.FACES], d.face,
                       self._pick("face"), "face"),
            field("height", "Height from the bottom (optional)", "e.g. 4 ft, 4'-6\" or 1.2 m")]
        controls.append(ft.Row([
            ft.Semantics(identifier="save-finding", button=True, content=ft.FilledButton(
                "Save finding", icon=ft.Icons.SAVE, on_click=self._save, height=TAP)),
            # hiding keeps what is typed: it comes back when the form opens again
            ft.Semantics(identifier="hide-finding-form", button=True, content=ft.TextButton(
                "Hide form", on_click=self._hide, height=TAP))], wrap=True, spacing=8))
        return ft.Semantics(identifier="finding-form", content=_card(controls, title=title))

    def _column_photos(self) -> ft.Control:
        body: list[ft.Control] = []
        if self.column_photos:
            body.append(thumbnails(self.column_photos, self._open_photo, "c"))
        else:
            body.append(text_line("No photos of the column as a whole yet.", size=16,
                                  color=MUTED))
        body.append(ft.Semantics(identifier="column-photo-add", button=True,
                                 content=ft.OutlinedButton(
                                     "Add photo of the column", icon=ft.Icons.ADD_A_PHOTO,
                                     on_click=self._add_photo(column_id=self.cid), height=TAP)))
        return ft.Semantics(identifier="column-photos",
                            content=_card(body, title="Photos of the column"))

    # -- handlers -----------------------------------------------------------------------
    def _say(self, words: str) -> None:
        self.note.value = words

    def _open_form(self, f: fm.FindingLine | None) -> Handler:
        def open_form(_e: Any = None) -> None:
            st = self._state
            if f is not None and st["editing"] != f.id:
                st["draft"], st["errors"] = fm.draft_of(f), {}
            elif f is None and st["editing"] is not None:
                st["draft"], st["errors"] = fm.Draft(), {}  # the edit's values stay with it
            st["open"], st["editing"] = True, (f.id if f else None)
            self._redraw()
        return open_form

    def _hide(self, _e: Any = None) -> None:
        self._state["open"] = False
        self._redraw()

    def _pick(self, key: str) -> Callable[[str], Handler]:
        def pick(value: str) -> Handler:
            def choose(_e: Any = None) -> None:
                st = self._state
                d = st["draft"]
                setattr(d, key, "" if getattr(d, key) == value else value)
                st["errors"].pop(key, None)
                self._redraw()
            return choose
        return pick

    async def _save(self, _e: Any = None) -> None:
        st = self._state
        cid, draft, editing = self.cid, fm.Draft(**vars(st["draft"])), st["editing"]
        errors = await asyncio.to_thread(fm.check_draft, self.app.store, cid, draft)
        if errors:
            st["errors"] = errors
            self._say("Not saved yet: " + "; ".join(errors.values()))
            self._redraw()
            return
        made: dict[str, fm.Saved] = {}

        def do(store: Any) -> fm.Saved:
            made["saved"] = fm.save_finding(store, cid, draft, editing)
            return made["saved"]

        def undo(store: Any) -> None:
            fm.undo_saved(store, made["saved"])

        words = draft.text.strip()
        result = await self.app.saver.save(f"finding: {words[:40]}", do, undo)
        if result is not None:
            st.update(draft=fm.Draft(), errors={}, open=False, editing=None)
            self._say(f"Saved finding: {words}")
            self._redraw()

    def _toggle(self, f: fm.FindingLine) -> Handler:
        async def toggle(_e: Any = None) -> None:
            cid = self.cid
            new = "open" if f.status == "closed" else "closed"
            await self.app.saver.save(
                f"finding {'reopened' if new == 'open' else 'closed'}",
                lambda store: fm.set_status(store, cid, f.id, new),
                lambda store: fm.set_status(store, cid, f.id, f.status))
        return toggle

    async def _pick_photos(self) -> list[Any]:
        try:
            return await intake_for(self.app.page).pick()
        except InputError as e:
            self._say(f"Photo not received: {fm.plain(e)}")
            self._redraw()
            return []

    async def _photo_defect(self, _e: Any = None) -> None:
        cid = self.cid
        picked = await self._pick_photos()
        made: dict[str, pm.PhotoFinding] = {}
        if not picked:
            return
        first, rest = picked[0], picked[1:]

        def do(store: Any) -> pm.PhotoFinding:
            made["f"] = pm.photo_finding(store, cid, first.data, first.name)
            # more photos picked at once show the same defect: they join its finding
            for p in rest:
                pm.add_photo(store, p.data, p.name, finding_id=made["f"].finding_id)
            return made["f"]

        def undo(store: Any) -> None:
            pm.undo_photo_finding(store, made["f"])

        if await self.app.saver.save("photo of a defect", do, undo) is not None:
            st = self._state
            # the new finding opens for its one line of words (optional: it is saved already)
            st.update(draft=fm.Draft(category=pm.QUICK_CATEGORY, severity=pm.QUICK_SEVERITY),
                      errors={}, open=True, editing=made["f"].finding_id)
            self._say(f"Saved: a new finding with {len(picked)} photo"
                      f"{'s' if len(picked) > 1 else ''}. Add its words now or later.")
            self._redraw()

    def _add_photo(self, **target: str) -> Handler:
        async def add(_e: Any = None) -> None:
            for p in await self._pick_photos():
                links: dict[str, str] = {}

                def do(store: Any, p: Any = p) -> str:
                    links["id"] = pm.add_photo(store, p.data, p.name, **target)
                    return links["id"]

                def undo(store: Any) -> None:
                    pm.detach_link(store, links["id"])

                if await self.app.saver.save(f"photo {p.name}", do, undo) is None:
                    return
        return add

    def _open_photo(self, p: pm.PhotoThumb) -> Handler:
        return photo_opener(self.app)(p)


__all__ = ["FindingsTab", "tag", "choice_row"]
