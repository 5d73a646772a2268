"""Flet forms of the app: a site, a new column, who is recording (and the theme).

Each form keeps its ``TextField`` objects in a dict the app holds per route, so what is typed
survives a redraw; the app saves through ``app.saver.save(..., field=<that dict>)`` so a refusal
shows under the entry it names. Identifiers: ``site-<field>``, ``column-new-<field>``,
``who-<field>``, ``visit-<field>``, choices ``code-<i>``, ``units-<value>``, ``theme-<value>``, buttons
``save-site``, ``save-column``, ``save-who``, ``start-visit``.
"""

from __future__ import annotations

from typing import Any, Callable

import flet as ft

from fieldcol.ui import sites as s
from fieldcol.ui import views as v

Handler = v.Handler


def entry(label: str, value: str, helper: str | None = None, **kw: Any) -> ft.TextField:
    """A form entry in the app's type scale (18 px typed text, 16 px helper and error).

    Example: ``entry("Tag", "", "e.g. B/4-2")``.
    """
    return ft.TextField(label=label, value=value, helper=helper, text_size=18, color=v.INK,
                        border_color=v.LINE, error_max_lines=4, helper_max_lines=2,
                        content_padding=ft.Padding.symmetric(horizontal=12, vertical=14),
                        error_style=ft.TextStyle(size=16, color=v.TONES["over"][0]),
                        helper_style=ft.TextStyle(size=16, color=v.MUTED), **kw)


def choice_row(options: list[tuple[str, str]], current: str,
               choose: Callable[[str], Handler], prefix: str) -> ft.Control:
    """Choices as 48 px buttons; the chosen one is ticked, bold and marked selected.

    Example: ``choice_row(s.SYSTEM_CHOICES, "us", handler, "units")``.
    """
    items: list[ft.Control] = []
    for i, (value, word) in enumerate(options):
        on = value == current
        box = ft.Container(
            content=ft.Row([ft.Icon(ft.Icons.CHECK if on else ft.Icons.CIRCLE_OUTLINED, size=20,
                                    color=v.INK), v.text_line(word, bold=on)],
                           spacing=6, tight=True),
            on_click=choose(value), ink=True, height=v.TAP,
            padding=ft.Padding.symmetric(horizontal=12), border_radius=8,
            bgcolor=v.CHOSEN_BG if on else v.CARD,
            border=ft.Border.all(2.5 if on else 1, v.ACCENT if on else v.LINE))
        ident = f"{prefix}-{i}" if "/" in value else f"{prefix}-{value}"
        items.append(ft.Semantics(identifier=ident, button=True, selected=on,
                                  label=f"{word}{' (chosen)' if on else ''}", content=box))
    return ft.Row(items, wrap=True, spacing=6, run_spacing=6)


def site_form(fields: dict[str, ft.TextField], values: dict[str, str],
              choose: Callable[[str, str], Callable[..., Any]], save: Handler,
              new: bool) -> list[ft.Control]:
    """The site form: name, address, owner's reference, code and basis (gamma_M1 for EN),
    units, default material.

    Args:
        fields: the entries (made here on first use, kept by the caller).
        values: the current values (choices included).
        choose: ``choose(key, value)`` gives the handler of a choice.
        save: saves the form.
        new: a new site (else an edit).

    Returns:
        The form's controls.

    Example: ``site_form({}, s.site_values(store), choose, save, True)``.
    """
    specs = [("name", "Site name (required)", "e.g. Kestrel Lane Print Works"),
             ("address", "Address", None), ("owner_ref", "Owner's reference", "their job number"),
             ("material", "Default material for new columns", "grade, e.g. A992, A36, S355")]
    for key, label, helper in specs:
        if key not in fields:
            fields[key] = entry(label, values.get(key, ""), helper)
    en = values.get("code", "").startswith("en1993")
    if "gamma_m1" not in fields:
        fields["gamma_m1"] = entry("gamma_M1", values.get("gamma_m1", "1.0"),
                                   "partial factor for buckling, 1.0 to 1.5")
    out: list[ft.Control] = [
        ft.Semantics(identifier="site-name", content=fields["name"]),
        ft.Semantics(identifier="site-address", content=fields["address"]),
        ft.Semantics(identifier="site-owner_ref", content=fields["owner_ref"]),
        v.text_line("Code and basis", bold=True),
        choice_row(s.CODE_CHOICES, values.get("code", ""), lambda x: choose("code", x), "code")]
    if en:
        out.append(ft.Semantics(identifier="site-gamma_m1", content=fields["gamma_m1"]))
    out += [v.text_line("Units", bold=True),
            choice_row(s.SYSTEM_CHOICES, values.get("unit_system", ""),
                       lambda x: choose("unit_system", x), "units"),
            ft.Semantics(identifier="site-material", content=fields["material"]),
            v.text_line("Code, basis and material apply to columns added from now on; "
                        "columns already recorded keep theirs.", color=v.MUTED),
            ft.Semantics(identifier="save-site", content=ft.FilledButton(
                "Create site" if new else "Save site", icon=ft.Icons.SAVE, on_click=save,
                height=v.TAP))]
    return [v._card(out, title="New site" if new else "Site")]


def column_form(fields: dict[str, ft.TextField], tag: str, save: Handler) -> list[ft.Control]:
    """The new-column form: tag (proposed), level, grid, location note.

    Example: ``column_form({}, "D/5-G", handler)``.
    """
    specs = [("tag", "Tag (required)", "the column's mark, e.g. B/4-2", tag),
             ("level", "Level", "e.g. Ground, L2", ""), ("grid", "Grid", "e.g. B/4", ""),
             ("location", "Location note", "e.g. by the loading door", "")]
    for key, label, helper, value in specs:
        if key not in fields:
            fields[key] = entry(label, value, helper, on_submit=save if key == "location" else None)
    out: list[ft.Control] = [ft.Semantics(identifier=f"column-new-{k}", content=fields[k])
                             for k, *_ in specs]
    out.append(ft.Semantics(identifier="save-column", content=ft.FilledButton(
        "Add column", icon=ft.Icons.ADD, on_click=save, height=v.TAP)))
    return [v._card(out, title="New column")]


def who_form(fields: dict[str, ft.TextField], person: Any, save: Handler,
             theme: str | None = None,
             choose_theme: Callable[[str], Handler] | None = None) -> list[ft.Control]:
    """Who is recording on this device (name, initials, the device's name); with ``theme``,
    the light / dark choice too (the settings screen).

    Example: ``who_form({}, None, handler)``.
    """
    specs = [("name", "Your name", "kept with every reading, photo and finding you record",
              getattr(person, "name", "")),
             ("initials", "Initials", "e.g. RA", getattr(person, "initials", "")),
             ("device", "This device's name", "e.g. site tablet 2", getattr(person, "device", ""))]
    for key, label, helper, value in specs:
        if key not in fields:
            fields[key] = entry(label, value or "", helper)
    out: list[ft.Control] = [ft.Semantics(identifier=f"who-{k}", content=fields[k])
                             for k, *_ in specs]
    out.append(ft.Semantics(identifier="save-who", content=ft.FilledButton(
        "Save", icon=ft.Icons.SAVE, on_click=save, height=v.TAP)))
    controls = [v._card(out, title="Who is recording")]
    if theme is not None and choose_theme is not None:
        controls.append(v._card([choice_row([("light", "Light (bright sun)"), ("dark", "Dark")],
                                             theme, choose_theme, "theme")], title="Theme"))
    return controls


def visit_form(fields: dict[str, ft.TextField], today: str, person: str | None,
               save: Handler) -> list[ft.Control]:
    """Start a visit: the date (today), who is there, weather and access notes.

    Example: ``visit_form({}, "2026-12-04", "R. Amadi", handler)``.
    """
    specs = [("date", "Date", "YYYY-MM-DD", today),
             ("people", "Who is on site", "names, e.g. R. Amadi, T. Osei", person or ""),
             ("weather", "Weather", "e.g. wet, 6 C", ""),
             ("access", "Access notes", "e.g. north door only, no lift", "")]
    for key, label, helper, value in specs:
        if key not in fields:
            fields[key] = entry(label, value, helper)
    out: list[ft.Control] = [ft.Semantics(identifier=f"visit-{k}", content=fields[k])
                             for k, *_ in specs]
    out += [v.text_line("While the visit is open, readings, findings, photos and restraint "
                        "changes on this site belong to it.", color=v.MUTED),
            ft.Semantics(identifier="start-visit", content=ft.FilledButton(
                "Start visit", icon=ft.Icons.PLAY_ARROW, on_click=save, height=v.TAP))]
    return [v._card(out, title="New visit")]
