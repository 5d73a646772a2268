"""One path for every edit the app saves: errors in plain words, "Not saved" with Retry, Undo.

Public API::

    saver = Saver(app)                       # one per FieldApp, as ``app.saver``
    result = await app.saver.save(label, do, undo=None, field=None, *, done=None)
    await app.saver.undo_last()              # what the Undo button runs
    app.saver.say(text)                      # a plain message in the same bar (no action)
    app.saver.follow(route)                  # the message goes on with the screen a save opens
    app.saver.moved(route)                   # a screen was drawn (FieldApp._render calls it)
    app.saver.bar                            # the bar control (identifier ``save-note``)
    plain_error(e: InputError) -> str        # the plain words for an error
    failure_words(e: BaseException) -> str   # a store / device failure in plain words
    FIELD_WORDS: dict[str, tuple[str, str]]  # field -> (words, example); extend for new fields

``do(store) -> T`` runs in a worker thread under ``app.lock``. What happens next:

- ``InputError``: returns ``None``. With ``field`` (a TextField, or a form's entries by
  name) the typed text stays and the error shows under the entry in plain words; it goes on
  the field's next change, and the bar only says "Not saved: check <the entry's label>." (it
  never repeats the entry's words). With no entry to show it the bar says
  "<Label> not saved: <plain words>".
- ``StoreBusyError``, any ``sqlite3.Error`` or ``OSError``: returns ``None``; the bar says
  "Not saved: ..." with a Retry button (identifier ``save-retry``) that runs the same ``do``
  again. Whatever was typed stays where it was.
- Success: the bar says "Saved <label>" (or ``done``: a text, or a function of the result)
  with an Undo button (identifier ``save-undo``) when ``undo(store)`` is given; then
  ``await app.changed()``; returns ``do``'s result. Only the last change can be undone, and
  Undo goes through ``save`` too (so a busy store during an undo also offers Retry).

A message belongs to the screen it was said on (or, by ``follow``, the one its save opened:
a new column, the site after a deletion): drawn another screen, the bar closes and its Undo
or Retry is dropped, so an Undo never acts on a change the screen shown does not hold. A save
that finishes after the engineer has left the screen it was made on is kept but says nothing
(no "Saved", no Undo) on the screen then shown.
"""

from __future__ import annotations

import asyncio
import inspect
import re
import sqlite3
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, Callable, TypeVar

import flet as ft

from fieldcol.errors import InputError, StoreBusyError
from fieldcol.ui import views as v

if TYPE_CHECKING:
    from fieldcol.store import Store
    from fieldcol.ui.app import FieldApp

T = TypeVar("T")

#: a field's name (as ``InputError.field`` gives it) -> (the words for it, an example entry)
FIELD_WORDS: dict[str, tuple[str, str]] = {
    "length": ("Length", "type a length, e.g. 12'-6\" or 3.8 m"),
    "section": ("Section", "type a catalogue name, e.g. W14X90 or HE 300 B"),
    "material": ("Material", "type a grade, e.g. A992, A36 or S355"),
    "demand.axial": ("Axial demand", "type a force, e.g. 840 kip or 3700 kN"),
    "demand": ("Axial demand", "type a force, e.g. 840 kip or 3700 kN"),
    "tag": ("Tag", "type the column's mark, e.g. B/4-2"),
    "name": ("Name", "type a name"),
    "initials": ("Initials", "type two or three letters, e.g. RA"),
    "device": ("Device name", "type a name for this phone or tablet, e.g. site tablet 2"),
    "text": ("What was found", "type a few words"),
    "category": ("Category", "type e.g. corrosion, bow or bracing"),
    "severity": ("Severity", "pick one of the choices"),
    "date": ("Date", "type a date as YYYY-MM-DD, e.g. 2026-12-03"),
    "people": ("Who is on site", "type names, e.g. R. Amadi, T. Osei"),
    "weather": ("Weather", "type a few words, e.g. wet, 6 C"),
    "access": ("Access notes", "type a few words"),
    "visit": ("The visit", "start a visit for this site"),
    "gamma_m1": ("gamma_M1", "type a factor such as 1.0 or 1.1"),
    "db": ("The database", "try again in a moment"),
}
_REQUIRED = ("this is required", "the entry is empty", "required", "is empty")


def _words(field: str) -> tuple[str, str]:
    if field in FIELD_WORDS:
        return FIELD_WORDS[field]
    # deeper fields read as words: restraints.weak.braces[0].at -> Restraints weak brace 1 at
    text = re.sub(r"\[(\d+)\]", lambda mt: f" {int(mt.group(1)) + 1}", field)
    text = text.replace(".", " ").replace("_", " ").strip() or "This entry"
    return text[:1].upper() + text[1:], ""


def _label_words(tf: Any) -> str | None:
    """An entry's label as words for a message, less its asides: "Stiffness (blank: taken as
    rigid)" -> "Stiffness"; ``None`` for an entry without a text label."""
    label = getattr(tf, "label", None)
    if not isinstance(label, str):
        return None
    return re.sub(r"\s*\([^)]*\)", "", label).strip() or None


def _sentence(text: str) -> str:
    text = text.strip()
    if not text:
        return ""
    text = text[:1].upper() + text[1:]
    return text if text.endswith((".", "?", "!")) else text + "."


def plain_error(e: InputError, named: str | None = None) -> str:
    """An input error in plain words: what is wrong with which entry, and what would do.

    Args:
        e: the ``InputError``.
        named: the entry's words as its label shows them (else from ``FIELD_WORDS``).

    Returns:
        One or two short sentences; never the internal ``field: cannot use ...`` form.

    Example:
        >>> plain_error(InputError("length", "", "the entry is empty", None))
        'Length is needed. Type a length, e.g. 12\\'-6" or 3.8 m.'
        >>> plain_error(InputError("length", "12 fr", "unknown length unit 'fr'", "use ft or m"))
        "Length '12 fr' not understood: unknown length unit 'fr'. Use ft or m."
        >>> plain_error(InputError("length", "", "the entry is empty", None), "Cable length")[:22]
        'Cable length is needed'
    """
    words, example = _words(e.field)
    words = named or words
    if isinstance(e, StoreBusyError):
        return "The database is busy (another program is writing to it). Try again in a moment."
    if not str(e.text).strip() or e.text in ("''", "None") or e.reason in _REQUIRED:
        return f"{words} is needed. " + _sentence(example or e.hint or "type a value")
    first = f"{words} '{e.text}' not understood: {e.reason}" if e.text else f"{words}: {e.reason}"
    return _sentence(first) + (" " + _sentence(e.hint or example) if (e.hint or example) else "")


def failure_words(e: BaseException) -> str:
    """A store or device failure in plain words (busy, refused, no space), for "Not saved"
    and for a screen that could not be loaded.

    Example:
        >>> failure_words(sqlite3.OperationalError("database is locked"))[:24]
        'The database is busy (an'
    """
    if isinstance(e, StoreBusyError):
        return plain_error(e)
    if isinstance(e, sqlite3.OperationalError) and "locked" in str(e).lower():
        return "The database is busy (another program is writing to it). Try again in a moment."
    if isinstance(e, OSError):
        return f"The device refused to write ({e.strerror or e}). Check free space, then retry."
    return f"The database refused the change ({e}). Retry, or note it down."


def _screen(route: str) -> str:
    """A route less its query and trailing slash: the screen it draws."""
    return route.split("?")[0].rstrip("/") or "/"


@dataclass
class _Change:
    label: str
    undo: Callable[["Store"], Any]


class Saver:
    """Runs every save of one app session and shows what happened in the save bar.

    Args:
        app: the ``FieldApp`` (its ``store``, ``lock``, ``changed()`` and ``page``).

    Example: ``await app.saver.save("tag B/4-2", lambda s: s.update_column(cid, tag="B/4-2"))``.
    """

    def __init__(self, app: "FieldApp") -> None:
        self.app = app
        self.last: _Change | None = None
        self.text = ft.Text("", size=17, color=v.INK, expand=True)
        self.icon = ft.Icon(ft.Icons.CHECK_CIRCLE_OUTLINE, size=24, color=v.INK)
        self.action = ft.Row([], spacing=4, tight=True)
        self.box = ft.Container(
            ft.Row([self.icon, self.text, self.action], spacing=8,
                   vertical_alignment=ft.CrossAxisAlignment.CENTER),
            padding=ft.Padding.symmetric(horizontal=12, vertical=6), bgcolor=v.BAR_BG,
            border=ft.Border.only(top=ft.BorderSide(2, v.LINE)))
        # hide the Semantics itself: a hidden content under a shown Semantics draws a red box
        self.bar = ft.Semantics(identifier="save-note", live_region=True, content=self.box,
                                visible=False)
        # one Retry and one Undo control for the session, only their handler changes: a
        # button made anew at each message would be a new node under a finger (or a test's
        # click) while saves that were queued behind a busy store report one after another
        self._retry_do: Callable[..., Any] | None = None
        self._retry = self._button("Retry", ft.Icons.REFRESH, "save-retry", self._run_retry)
        self._undo = self._button("Undo", ft.Icons.UNDO, "save-undo", self.undo_last)
        self._running: set[str] = set()  # the labels of the saves under way
        self.home: str | None = None  # the screen (route) the bar's message belongs to

    # -- the bar --------------------------------------------------------------------------
    def say(self, text: str, *, kind: str = "ok", button: ft.Control | None = None,
            draw: bool = True) -> None:
        """Show a message in the save bar (``kind``: ``ok``, ``error``, ``info``).

        Args:
            text: the words.
            kind: picks the icon and tint; the words say it anyway.
            button: an action beside the words (Undo, Retry), or none.
            draw: send it to the screen now (False: with the caller's next update).

        Example: ``app.saver.say("Checked again: 0.84 OK")``.
        """
        self.text.value = text
        self.icon.icon = {"ok": ft.Icons.CHECK_CIRCLE_OUTLINE, "error": ft.Icons.ERROR_OUTLINE,
                          "info": ft.Icons.INFO_OUTLINE}[kind]
        self.icon.color = v.TONES["over"][0] if kind == "error" else v.INK
        self.box.bgcolor = v.TONES["over"][1] if kind == "error" else v.BAR_BG
        wanted = [button] if button is not None else []
        if self.action.controls != wanted:
            self.action.controls = wanted
        self.bar.visible = bool(text)
        self.home = getattr(self.app, "screen", None)
        if draw:
            self.app.page.update()

    def follow(self, route: str) -> None:
        """The message (and its Undo) goes on with the screen ``route``, which the save just
        made and the caller opens next (the copy of a column, the site of a deleted one).

        Example: ``app.saver.follow(f"/columns/{cid}")`` before ``page.push_route`` to it.
        """
        self.home = route

    def moved(self, route: str) -> None:
        """A screen was drawn: a message of another screen closes, its Undo and Retry with it
        ("Saved theme dark" with Undo, met on a column screen, would undo what is not there).
        The same screen drawn again (a redraw, a resize) keeps it. Nothing is sent here: the
        caller's update carries the closed bar.

        Example: ``app.saver.moved("/columns/" + cid)`` (``FieldApp`` calls it).
        """
        if self.home is None or _screen(route) == _screen(self.home):
            return
        self.home = None
        self.last = None
        self._retry_do = None
        self.clear()

    def clear(self) -> None:
        """Hide the bar (the last change stays undoable until the next one).

        Example: ``app.saver.clear()``.
        """
        self.text.value = ""
        self.bar.visible = False

    def _button(self, word: str, icon: ft.IconData, identifier: str,
                on_click: Callable[..., Any]) -> ft.Control:
        return ft.Semantics(identifier=identifier, content=ft.FilledButton(
            word, icon=icon, on_click=on_click, height=v.TAP))

    # -- saving ---------------------------------------------------------------------------
    async def save(self, label: str, do: Callable[["Store"], T],
                   undo: Callable[["Store"], Any] | None = None,
                   field: ft.TextField | dict[str, ft.TextField] | None = None, *,
                   done: str | Callable[[T], str] | None = None) -> T | None:
        """Run ``do(store)`` in a worker thread under the app's lock and say how it went.

        Args:
            label: what is saved, in words, e.g. ``"length 12 ft"`` ("Saved length 12 ft").
            do: the change, ``do(store) -> T``; raises ``InputError`` for a bad entry.
            undo: puts the change back, ``undo(store)``; offered as Undo when given.
            field: the entry the change came from: a refusal shows under it; or a form's
                entries by field name: the refusal shows under the one it names.
            done: the message on success instead of "Saved <label>" (text or f(result)).

        Returns:
            ``do``'s result, or ``None`` when nothing was saved.

        Example: ``await app.saver.save("site name", lambda s: s.update_site(sid, name=n))``.
        """
        app = self.app
        if label in self._running:  # Enter then leaving the entry: the same change, once
            return None
        self._running.add(label)
        began = _screen(getattr(app, "screen", None) or "/")  # the screen the change was made on
        try:
            async with app.lock:
                result = await asyncio.to_thread(do, app.store)
        except (StoreBusyError, sqlite3.Error, OSError) as e:
            async def retry() -> None:
                await self.save(label, do, undo, field, done=done)
            self._retry_do = retry
            self.say(f"Not saved: {failure_words(e)}", kind="error", button=self._retry)
            return None
        except InputError as e:
            words = plain_error(e)
            at = field.get(e.field) or field.get(e.field.split(".")[0]) \
                if isinstance(field, dict) else field
            if at is not None:
                # the entry says what is wrong, under itself; the bar, read away from it,
                # only says that nothing was saved and which entry to look at (the same
                # sentence twice on one screen read as two errors). The entry is named as
                # its label reads: "Cable or rod length", not "Length" (the column's)
                self._show_at(at, words)
                self.say(f"Not saved: check {_label_words(at) or _words(e.field)[0]}.",
                         kind="error")
                return None
            self.say(f"{label[:1].upper() + label[1:]} not saved: {words}", kind="error")
            return None
        finally:
            self._running.discard(label)
        for tf in (field.values() if isinstance(field, dict) else [field]):
            if tf is not None and tf.error:
                tf.error = None
        if _screen(getattr(app, "screen", None) or "/") == began:
            self.last = _Change(label, undo) if undo is not None else None
            text = done(result) if callable(done) else (done or f"Saved {label}")
            self._retry_do = None
            # the words and the re-checked screen go to the client in one update: "Saved ...;
            # checked again: 0.58 OK" never shows above the old result
            self.say(text, button=self._undo if undo is not None else None, draw=False)
        # else the engineer moved on while it ran (a slow disk, a save queued behind another):
        # the change is kept, but its words would read as about the screen now shown ("Saved
        # length 13 ft" over another column) and its Undo would take back a change not in
        # sight; the bar, its Undo and Retry stay as the new screen left them. The screen
        # shown is still read again below, so a list shows the column's new status
        draws = getattr(app, "draws", 0)
        try:
            await app.changed()
        finally:
            if getattr(app, "draws", 0) == draws:  # nothing drawn: the words go alone
                self.app.page.update()
        return result

    async def _run_retry(self, _e: Any = None) -> None:
        retry, self._retry_do = self._retry_do, None
        if retry is None:  # already saved meanwhile (e.g. by leaving the entry)
            return
        await retry()

    async def undo_last(self, _e: Any = None) -> None:
        """Undo the last change (once); what is undone is said in the bar.

        Example: ``await app.saver.undo_last()``.
        """
        change, self.last = self.last, None
        if change is None:
            self.say("Nothing to undo.", kind="info")
            return
        saved = await self.save(f"undo of {change.label}", lambda s: (change.undo(s), True)[1],
                                done=f"Undone: {change.label}")
        if saved is None and self.last is None:
            self.last = change  # refused or busy: it can still be undone after a retry

    @staticmethod
    def _show_at(field: ft.TextField, words: str) -> None:
        field.error = words
        before = field.on_change
        if getattr(before, "_clears_error", False):
            return

        async def clear(e: Any) -> None:
            # the first change after a refusal takes the message away; the field's own
            # handler still runs
            if field.error is not None:
                field.error = None
                field.update()
            field.on_change = before
            if before is not None:
                out = before(e)
                if inspect.isawaitable(out):
                    await out

        clear._clears_error = True  # type: ignore[attr-defined]
        field.on_change = clear
