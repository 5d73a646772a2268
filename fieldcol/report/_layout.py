"""The page and its building blocks: header, footer, headings, paragraphs, tables, photo grids.

Fonts are the bundled DejaVu Sans files under ``assets/fonts`` so the report looks the same on
every machine and never depends on the fonts a system happens to have.

Text is wrapped here, word by word with the widths cached, and placed with ``FPDF.text``: the
library's own table and multi-cell layout measures every character of every cell again on each
call, which made a 500-column report take minutes.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from pathlib import Path
from typing import Sequence

from fpdf import FPDF

from fieldcol._resources import shipped
from fieldcol.report._marks import draw_markup

ASSETS = shipped("assets")
FONT = "DejaVu"
INK = (20, 20, 20)
GREY = (90, 90, 90)
RULE = (160, 160, 160)
HEAD_FILL = (225, 229, 234)
SHADE = (242, 242, 242)
STRIPE = (246, 247, 249)
BODY_PT = 9.0
TABLE_PT = 7.6
#: rows a table keeps with its heading (a heading never ends a page on its own)
FIRST_ROWS = 3
SMALL_PT = 7.0
PT_MM = 25.4 / 72
PAD_X = 1.2
PAD_Y = 0.7
MISSING_MARK = "\u25a1"  # a white square: the font has no glyph for the character here
#: a number, a fraction and a unit stay on one line ("1 1/8 in", "300 mm", "0.192 in,"): a
#: reading cut after its whole inches reads as another number
_NUMBER = re.compile(r"""^[(\['"]?[-−]?\d[\d.,]*(?:e[-+]?\d+)?$""")
_FRACTION = re.compile(r"""^\d+/\d+(?:\s*(?:in|")?)[),;:.'"]*$""")
_UNIT = re.compile(r"""^(?:in\.?|mm|m|ft|kips?|kN|N|ksi|MPa|psi|lbf?|%)\d?"""
                   r"""(?:[*/](?:in|mm|m|ft|kips?|kN|N|rad)|\^\d)*[),;:.'"]*$""")


@dataclass
class PhotoCell:
    """One photo to place: the image file (or None when the file is missing), its caption and
    the markup drawn over it (shapes as fractions of the upright photo)."""
    image: Path | None
    caption: str
    markup: list[dict] | None = None
    size: tuple[int, int] | None = None   # pixels of ``image`` (read from the file if None)


try:  # fpdf2's font class: its encoding of a text is kept per text (``_encode_once``)
    from fpdf.fonts import TTFFont as _TTFFont
except ImportError:  # pragma: no cover - another fpdf2 layout: encode as it does
    _TTFFont = None  # type: ignore[assignment,misc]

if _TTFFont is not None and hasattr(_TTFFont, "encode_text"):
    class _KeptEncoding(_TTFFont):  # type: ignore[misc,valid-type]
        """A bundled font whose encoding of each text is kept with its subset map.

        A report writes the same words (trace lines, headings, units) thousands of times and
        fpdf2 maps every character into the subset again each time: a fifth of a 500-column
        report's processor time. A character's code in the subset is fixed when first met, so
        a kept encoding stays right; it lives on the subset map, so it goes with it.
        """
        __slots__ = ()

        def encode_text(self, text: str) -> str:
            kept = self.subset.__dict__.setdefault("_kept_encodings", {})
            got = kept.get(text)
            if got is None:
                if len(kept) >= 50_000:  # bounded: most lines of a long report differ
                    kept.clear()
                got = kept[text] = super().encode_text(text)
            return got
else:  # pragma: no cover
    _KeptEncoding = None  # type: ignore[assignment,misc]


def _encode_once(font: object) -> None:
    """Give a bundled font the kept encoding (nothing changes on an fpdf2 without it)."""
    if (_KeptEncoding is not None and type(font) is _TTFFont
            and hasattr(getattr(font, "subset", None), "__dict__")):
        font.__class__ = _KeptEncoding


def _glued(words: list[str]) -> list[str]:
    """Words with each number joined to the fraction and the unit after it, to wrap as one
    (``["1", "1/8", "in", "over"]`` -> ``["1 1/8 in", "over"]``)."""
    out: list[str] = []
    for word in words:
        if out and word and (_UNIT.match(word) or _FRACTION.match(word)) and (
                _NUMBER.match(out[-1]) or _FRACTION.match(out[-1].rsplit(" ", 1)[-1])
                and not _UNIT.match(out[-1].rsplit(" ", 1)[-1])):
            out[-1] = f"{out[-1]} {word}"
        else:
            out.append(word)
    return out


class ReportPDF(FPDF):
    """A4 or Letter portrait pages with the site's header and the page-count / caution footer."""

    def __init__(self, *, paper: str, site_name: str, report_date: str, caution: str) -> None:
        super().__init__(orientation="P", unit="mm", format=paper)
        self.site_name, self.report_date, self.caution = site_name, report_date, caution
        self._widths: dict[tuple[str, float, str], float] = {}
        self.missing: set[str] = set()
        self.memo: dict[str, object] = {}   # pictures of records seen before in this report
        self._wrapped: dict[tuple[str, float, float, str], list[str]] = {}
        #: what a page that a part runs onto belongs to ("Column C/3-G, continued"), printed
        #: at its top by ``header``: a heading or warning carried over never stands unnamed
        self.continued = ""
        fonts = ASSETS / "fonts"
        self.add_font(FONT, "", str(fonts / "DejaVuSans.ttf"))
        self.add_font(FONT, "B", str(fonts / "DejaVuSans-Bold.ttf"))
        for f in self.fonts.values():
            _encode_once(f)
        self.set_margins(16, 20, 16)
        # room for the two-line footer: text must never run under it
        self.set_auto_page_break(True, margin=18)
        self.set_text_color(*INK)
        self.set_draw_color(*RULE)
        self.set_font(FONT, "", BODY_PT)
        self.set_title(f"Column assessment report: {site_name}")
        self.set_creator("fieldcol")

    # -- measuring and placing text --------------------------------------------------------
    def normalize_text(self, text: str) -> str:
        """Text as the font can show it: a character the bundled font lacks (e.g. CJK) becomes
        ``MISSING_MARK`` and is counted (``self.missing``), never dropped in silence."""
        text = super().normalize_text(text)
        cmap = getattr(self.current_font, "cmap", None)
        if cmap is None or text.isascii():
            return text
        out = []
        for ch in text:
            if ord(ch) in cmap or ch in "\n\r\t":
                out.append(ch)
            else:
                self.missing.add(ch)
                out.append(MISSING_MARK)
        return "".join(out)

    def width_of(self, text: str) -> float:
        """The width of ``text`` in the current font, mm (cached per font, size and text)."""
        key = (self.font_style, self.font_size_pt, text)
        w = self._widths.get(key)
        if w is None:
            w = self._widths[key] = self.get_string_width(self.normalize_text(text))
        return w

    def wrap(self, text: str, width: float) -> list[str]:
        """``text`` broken into lines no wider than ``width`` mm in the current font.

        Words wrap at spaces; a word wider than the line (a long tag, a path) is cut between
        characters, so nothing runs out of its cell.

        Example: ``pdf.wrap("Flange corroded at the base", 20)`` gives ``['Flange corroded',
        'at the base']`` at 9 pt.
        """
        out: list[str] = []
        space = self.width_of(" ")
        for para in str(text).split("\n"):
            line, lw = "", 0.0
            for word in _glued(para.split(" ")):
                ww = self.width_of(word)
                if line and lw + space + ww <= width:
                    line, lw = f"{line} {word}", lw + space + ww
                    continue
                if line:
                    out.append(line)
                if ww <= width:
                    line, lw = word, ww
                    continue
                piece = ""
                for ch in word:  # a word longer than the line: cut it
                    if piece and self.width_of(piece + ch) > width:
                        out.append(piece)
                        piece = ""
                    piece += ch
                line, lw = piece, self.width_of(piece)
            out.append(line)
        return out

    def lines_at(self, x: float, y: float, lines: Sequence[str], lh: float) -> None:
        """Place ready-wrapped ``lines`` from the top-left corner ``x, y`` (mm)."""
        base = y + lh * 0.5 + self.font_size * 0.35
        for i, line in enumerate(lines):
            if line:
                self.text(x, base + i * lh, line)

    def write_block(self, text: str, *, x: float | None = None, width: float | None = None,
                    size: float = BODY_PT, bold: bool = False,
                    colour: tuple[int, int, int] = INK, lh: float | None = None) -> float:
        """Wrapped text from the current position down, breaking onto new pages as needed.

        Returns:
            The height used on the last page, mm.
        """
        x = self.l_margin if x is None else x
        width = self.epw if width is None else width
        self.set_font(FONT, "B" if bold else "", size)
        self.set_text_color(*colour)
        lh = size * PT_MM * 1.18 if lh is None else lh
        lines = self.wrap(text, width)
        used = 0.0
        while lines:
            room = int((self.page_break_trigger - self.get_y()) // lh)
            if room < 1:
                self.add_page()
                room = int((self.page_break_trigger - self.get_y()) // lh)
            chunk, lines = lines[:room], lines[room:]
            self.set_font(FONT, "B" if bold else "", size)
            self.set_text_color(*colour)
            self.lines_at(x, self.get_y(), chunk, lh)
            used = len(chunk) * lh
            self.set_y(self.get_y() + used)
        self.set_text_color(*INK)
        self.set_font(FONT, "", BODY_PT)
        return used

    # -- every page -----------------------------------------------------------------------
    def header(self) -> None:
        """Site name left, report date right, a thin rule under them."""
        self.set_font(FONT, "", SMALL_PT + 0.5)
        self.set_text_color(*GREY)
        right = f"report date {self.report_date}"
        rw = self.width_of(right) + 2
        # a long site name wraps onto a second header line rather than running into the date
        lines = self.wrap(f"{self.site_name}: column assessment", self.epw - rw - 2)[:2]
        self.lines_at(self.l_margin, 8.5, lines, 3.2)
        self.text(self.w - self.r_margin - rw + 2, 8.5 + 1.6 + self.font_size * 0.35, right)
        self.set_draw_color(*RULE)
        self.set_line_width(0.2)
        self.line(self.l_margin, 15.5, self.w - self.r_margin, 15.5)
        self.set_text_color(*INK)
        self.set_y(self.t_margin)
        if self.continued:
            self.set_font(FONT, "B", 8)
            self.lines_at(self.l_margin, self.t_margin, self.wrap(self.continued, self.epw)[:1],
                          8 * PT_MM * 1.18)
            self.set_y(self.t_margin + 8 * PT_MM * 1.18 + 0.8)
        self.set_font(FONT, "", BODY_PT)

    def footer(self) -> None:
        """The caution and ``page x of y`` on every page, drawn last so nothing covers it."""
        y = self.h - 15
        self.set_draw_color(*RULE)
        self.set_line_width(0.2)
        self.line(self.l_margin, y, self.w - self.r_margin, y)
        self.set_font(FONT, "", SMALL_PT)
        self.set_text_color(*GREY)
        self.lines_at(self.l_margin, y + 0.8, self.wrap(self.caution, self.epw - 30), 3.0)
        # a cell, not text(): the page count alias is filled in only in cells
        self.set_xy(self.w - self.r_margin - 28, y + 0.8)
        self.cell(28, 3.0, f"page {self.page_no()} of {{nb}}", align="R")
        self.set_text_color(*INK)

    # -- blocks ---------------------------------------------------------------------------
    def heading(self, text: str, level: int = 1, *, keep: float = 0.0) -> None:
        """A section heading, kept on one page with the next ``keep`` mm (or a few lines)."""
        size = {1: 14.0, 2: 10.5, 3: 9.0}[level]
        need = max(keep + 8, {1: 30, 2: 18, 3: 12}[level])
        if self.will_page_break(need):
            self.add_page()
        self.ln({1: 0.5, 2: 2.2, 3: 1.2}[level])
        self.write_block(text, size=size, bold=True, lh=size * PT_MM * 1.25)
        if level == 1:
            y = self.get_y() + 0.6
            self.set_line_width(0.4)
            self.set_draw_color(*INK)
            self.line(self.l_margin, y, self.w - self.r_margin, y)
            self.set_line_width(0.2)
            self.set_draw_color(*RULE)
            self.ln(2.2)
        else:
            self.ln(0.6)

    def para(self, text: str, *, size: float = BODY_PT, bold: bool = False,
             colour: tuple[int, int, int] = INK) -> None:
        """A wrapped paragraph across the text width."""
        self.write_block(text, size=size, bold=bold, colour=colour)
        self.ln(1)

    def boxed(self, text: str, *, size: float = 10.0) -> None:
        """A paragraph in a ruled, shaded box: for the caution on the cover."""
        self.set_font(FONT, "B", size)
        lh = size * PT_MM * 1.25
        lines = self.wrap(text, self.epw - 8)
        h = len(lines) * lh + 6
        if self.will_page_break(h):
            self.add_page()
        y = self.get_y()
        self.set_fill_color(*SHADE)
        self.set_draw_color(*INK)
        self.set_line_width(0.6)
        self.rect(self.l_margin, y, self.epw, h, style="DF")
        self.set_line_width(0.2)
        self.set_draw_color(*RULE)
        self.lines_at(self.l_margin + 4, y + 3, lines, lh)
        self.set_font(FONT, "", BODY_PT)
        self.set_y(y + h + 2)

    def table(self, headings: Sequence[str] | None, rows: Sequence[Sequence[str]],
              widths: Sequence[float], *, bold_rows: Sequence[int] = (),
              size: float = TABLE_PT, x: float | None = None,
              width: float | None = None) -> float:  # type: ignore[override]
        """A wrapped table; its heading row repeats on every page the table runs onto.

        Args:
            headings: column titles, or None for a plain key/value table (first column bold).
            rows: the cells as text.
            widths: relative column widths.
            bold_rows: indexes of rows to set in bold (e.g. OVER columns, beside their word).
            size: the font size in points.
            x, width: where the table sits across the page (default: the text width).

        Returns:
            The y (mm) where the table ends on its last page.

        Example: ``pdf.table(["Tag", "Status"], [["C/3-G", "OVER"]], (1, 1))``.
        """
        x0 = self.l_margin if x is None else x
        full = self.epw if width is None else width
        total = float(sum(widths))
        ws = [full * w / total for w in widths]
        lh = size * PT_MM * 1.12
        pad = PAD_Y * size / 8.0
        bold_set = set(bold_rows)

        def cells(row: Sequence[str], style: str) -> list[list[str]]:
            return [self.wrap_cell(str(c), w, style, size) for c, w in zip(row, ws)]

        def draw(lines: list[list[str]], styles: Sequence[str], top: float, n: int,
                 first: int, fill: tuple[int, int, int] | None) -> float:
            h = n * lh + 2 * pad
            if fill is not None:
                self.set_fill_color(*fill)
                self.rect(x0, top, full, h, style="F")
            cx = x0
            for col, (cl, w) in enumerate(zip(lines, ws)):
                self.font(styles[col], size)
                self.lines_at(cx + PAD_X, top + pad, cl[first:first + n], lh)
                cx += w
            return h

        def head_row() -> None:
            if headings is None:
                return
            hl = cells(headings, "B")
            n = max(len(c) for c in hl)
            h = draw(hl, ["B"] * len(ws), self.get_y(), n, 0, HEAD_FILL)
            self.set_draw_color(*INK)
            self.line(x0, self.get_y(), x0 + full, self.get_y())
            self.set_draw_color(*RULE)
            self.set_y(self.get_y() + h)

        if headings is not None and self.will_page_break(3 * lh + 4 * PAD_Y):
            self.add_page()
        head_row()
        for i, row in enumerate(rows):
            style = "B" if i in bold_set else ""
            styles = [("B" if headings is None and c == 0 else style) for c in range(len(ws))]
            lines = [self.wrap_cell(str(c), w, st, size) for c, w, st in zip(row, ws, styles)]
            n = max(1, max(len(c) for c in lines))
            fill = STRIPE if headings is not None and i % 2 else None
            first = 0
            fresh = self.page_break_trigger - self.t_margin - 10
            while first < n:
                room = int((self.page_break_trigger - self.get_y() - 2 * pad) // lh)
                left = n - first
                # a row moves whole to the next page; only a row longer than a page splits
                if room < left and (room < 1 or (first == 0 and left * lh + 2 * pad <= fresh)):
                    self.add_page()
                    head_row()
                    room = int((self.page_break_trigger - self.get_y() - 2 * pad) // lh)
                take = max(1, min(n - first, room))
                h = draw(lines, styles, self.get_y(), take, first, fill)
                self.set_y(self.get_y() + h)
                if headings is None:
                    self.line(x0, self.get_y(), x0 + full, self.get_y())
                first += take
        self.set_font(FONT, "", BODY_PT)
        end = self.get_y()
        self.ln(1.6)
        return end

    def row_heights(self, rows: Sequence[Sequence[str]], widths: Sequence[float], *,
                    size: float = TABLE_PT, width: float | None = None,
                    style: str = "") -> list[float]:
        """The height each row of ``table`` takes with these arguments, mm."""
        full = self.epw if width is None else width
        total = float(sum(widths))
        ws = [full * w / total for w in widths]
        lh = size * PT_MM * 1.12
        pad = PAD_Y * size / 8.0
        return [max(1, max(len(self.wrap_cell(str(c), w, style, size)) for c, w in zip(r, ws)))
                * lh + 2 * pad for r in rows]

    def first_rows(self, headings: Sequence[str] | None, rows: Sequence[Sequence[str]],
                   widths: Sequence[float], *, size: float = TABLE_PT,
                   flow: bool = False, gap: float = 4.0) -> float:
        """The height (mm) of a table's heading row and its first ``FIRST_ROWS`` rows as
        ``table`` (or, with ``flow``, ``table_flow``) draws them: pass it as a heading's
        ``keep`` so the heading never stands alone at the foot of a page.

        Example: ``pdf.heading("Readings", 3, keep=pdf.first_rows(heads, rows, widths))``.
        """
        width = (self.epw - gap) / 2 if flow else None
        first = self.row_heights(rows[:FIRST_ROWS], widths, size=size, width=width)
        head = 0.0 if headings is None else \
            self.row_heights([headings], widths, size=size, width=width, style="B")[0]
        return head + sum(first) + (0.6 if flow else 0.0)

    def table_flow(self, headings: Sequence[str], rows: Sequence[Sequence[str]],
                   widths: Sequence[float], *, size: float = TABLE_PT, gap: float = 4.0,
                   continued: str = "") -> None:
        """A long table flowed in two columns down the page, as a newspaper does: the space
        left on this page first (left column, then right), then the next page; the last part
        is balanced between the two columns. ``continued`` heads each further page (e.g.
        "Calculation trace of C/3-G, continued"), so rows carried over say what they belong to;
        the page's own ``continued`` line is back as it was once the table ends.

        Example: ``pdf.table_flow(["Symbol", "Value", "What"], rows, (1, 1, 4), size=6)``.
        """
        half = (self.epw - gap) / 2
        hs = self.row_heights(rows, widths, size=size, width=half)
        outer, self.continued = self.continued, continued or self.continued
        head = self.row_heights([headings], widths, size=size, width=half, style="B")[0]
        i, n = 0, len(rows)
        fresh = False  # a page just begun for these rows: rows taller than it go on anyway
        while i < n:
            avail = self.page_break_trigger - self.get_y() - head - 0.6
            if avail < sum(hs[i:i + FIRST_ROWS]) and not fresh:
                self.add_page()
                fresh = True
                continue
            fresh = False

            def take(start: int, room: float) -> int:
                k, used = start, 0.0
                while k < n and used + hs[k] <= room:
                    used += hs[k]
                    k += 1
                return k

            rest = sum(hs[i:])
            mid = i
            acc = 0.0
            while mid < n and acc + hs[mid] / 2 < rest / 2:  # the balanced split point
                acc += hs[mid]
                mid += 1
            if acc <= avail and take(mid, avail) == n:
                split, end = mid, n
            else:
                split = take(i, avail)
                if split == i:  # one row taller than the space left: a table of its own
                    split = i + 1
                end = take(split, avail)
            y = self.get_y()
            self.table(headings, rows[i:split], widths, size=size, width=half)
            bottom = self.get_y()
            if end > split:
                self.set_y(y)
                self.table(headings, rows[split:end], widths, size=size, width=half,
                           x=self.l_margin + half + gap)
                bottom = max(bottom, self.get_y())
            self.set_y(bottom)
            i = end
            if i < n:
                self.add_page()
        self.continued = outer

    def wrap_cell(self, text: str, width: float, style: str, size: float) -> list[str]:
        """A cell's text wrapped to its width less the padding, in ``style`` and ``size``
        (kept: a table is measured before it is drawn)."""
        key = (style, size, round(width, 3), text)
        lines = self._wrapped.get(key)
        if lines is None:
            self.font(style, size)
            lines = self._wrapped[key] = self.wrap(text, width - 2 * PAD_X)
            if len(self._wrapped) > 20000:  # a long report: keep the cache bounded
                self._wrapped.clear()
        return lines

    def font(self, style: str, size: float) -> None:
        """``set_font`` of the report's family, skipped when nothing changes (it is called for
        every cell)."""
        if self.font_style != style or self.font_size_pt != size or self.font_family != FONT.lower():
            self.set_font(FONT, style, size)

    def photos(self, cells: Sequence[PhotoCell], *, per_row: int = 4,
               max_height: float = 44.0) -> None:
        """Photos in a grid across the page, each with its wrapped caption; a row never splits."""
        from PIL import Image

        gap = 4.0
        width = (self.epw - gap * (per_row - 1)) / per_row
        lh = SMALL_PT * PT_MM * 1.15
        for start in range(0, len(cells), per_row):
            chunk = cells[start:start + per_row]
            sizes = []
            for c in chunk:
                if c.image is None:
                    sizes.append((width, 14.0))
                    continue
                if c.size is None:
                    with Image.open(c.image) as im:
                        c.size = im.size
                pw, ph = c.size
                h = min(max_height, width * ph / pw)
                sizes.append((min(width, h * pw / ph), h))
            self.set_font(FONT, "", SMALL_PT)
            caps = [self.wrap(c.caption, width) for c in chunk]
            pic_h = max(s[1] for s in sizes)
            row_h = pic_h + 1.5 + max(len(c) for c in caps) * lh
            if self.will_page_break(row_h):
                self.add_page()
            y0 = self.get_y()
            for i, (c, (w, h)) in enumerate(zip(chunk, sizes)):
                x = self.l_margin + i * (width + gap)
                if c.image is not None:
                    self.image(str(c.image), x=x, y=y0, w=w, h=h)
                    self.set_draw_color(*RULE)
                    self.rect(x, y0, w, h)
                    if c.markup:
                        draw_markup(self, c.markup, x, y0, w, h, FONT)
                else:
                    self.set_draw_color(*RULE)
                    self.rect(x, y0, width, h)
                    self.set_font(FONT, "", SMALL_PT)
                    self.lines_at(x + 1, y0 + 2, self.wrap("photo file missing on this device",
                                                           width - 2), lh)
                self.set_font(FONT, "", SMALL_PT)
                self.set_text_color(*INK)
                self.lines_at(x, y0 + pic_h + 1.5, caps[i], lh)
            self.set_y(y0 + row_h + 3)
        self.set_font(FONT, "", BODY_PT)
