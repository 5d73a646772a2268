"""One column's check as plain text: for a terminal, or pasted into a calculation package.

Lines stay within a width (100 characters by default), columns line up in a monospaced font, and
the symbols are the code's own (the same trace lines as the app's Check tab and the PDF report).
"""

from __future__ import annotations

import textwrap
from typing import Any, Mapping

from fieldcol import CAUTION


def column_text(result: Mapping[str, Any], system: str, *, width: int = 100,
                source: str = "") -> str:
    """A saved or fresh check (``Assessment.to_dict()``) as plain text.

    Args:
        result: the check's JSON form.
        system: ``us`` or ``si`` (the units values are shown in).
        width: the longest line, characters (at least 60).
        source: where the record came from (a file, or store, site and column), one line.

    Returns:
        The text: heading, result, every mode, warnings, the trace (symbol, value, what and
        formula, clause), the caution.

    Example: ``print(column_text(assess(record).to_dict(), "us"))``.
    """
    from fieldcol.report import _text as tx
    from fieldcol.ui.check_model import check_summary

    width = max(60, int(width))
    s = check_summary(result, system)
    word = tx.status_word(True, result.get("status"),
                          (result.get("utilization") or {}).get("value"))
    out = [f"Column {result.get('tag') or '-'}: {s.title}" + (f", {s.basis}" if s.basis else ""),
           *([source] if source else []), f"fieldcol {result.get('app_version', '')}", "",
           f"Result       {s.result_line}   {word}",
           f"Governs      {s.governs}"]
    out += _wrapped("Why          ", s.why, width)
    for line in s.extra:
        out.append(f"             {line}")
    out += ["", "Modes"]
    for c in s.capacities:
        out.append(f"  {c.name:<24} {c.strength:>13}  {c.length:>10}  {c.slenderness:<14}"
                   + ("  governs" if c.governs else "") + ("" if c.applies else "  (reported only)"))
    if s.warnings:
        out += ["", "Warnings"]
        for w in s.warnings:
            out += _wrapped("  - ", w, width)
    out += ["", "Trace"]
    rows = []
    for t in s.trace:
        what, value = t.what + (f" = {t.formula}" if t.formula else ""), t.value
        if " " in value and not any(ch.isdigit() for ch in value.split(" ")[0]):
            what, value = f"{what}: {value}", ""  # a sentence reads better in the wide column
        rows.append((t.symbol, value, what + (f"  [{t.clause}]" if t.clause else "")))
    sym_w = min(14, max((len(r[0]) for r in rows), default=6))
    val_w = min(16, max((len(r[1]) for r in rows), default=6))
    for sym, value, what in rows:
        out += _wrapped(f"  {sym:<{sym_w}} {value:>{val_w}}  ", what, width)
    out += [""] + textwrap.wrap(CAUTION, width)
    return "\n".join(line.rstrip() for line in out)


def _wrapped(lead: str, text: str, width: int) -> list[str]:
    """``text`` after ``lead``, continued lines indented under the text."""
    lines = textwrap.wrap(text, max(20, width - len(lead))) or [""]
    return [lead + lines[0]] + [" " * len(lead) + ln for ln in lines[1:]]
