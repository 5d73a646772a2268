"""The page and its building blocks: header, footer, headings, paragraphs, tables, photo rows.

Fonts are the bundled DejaVu Sans files under ``assets/fonts`` so the report looks the same on
every machine and never depends on the fonts a system happens to have.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Sequence

from fpdf import FPDF
from fpdf.enums import XPos, YPos
from fpdf.fonts import FontFace

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
TABLE_PT = 8.0
SMALL_PT = 7.0


@dataclass
class PhotoCell:
    """One photo to place: the image file (or None when the file is missing), its caption and
    the markup drawn over it (shapes as fractions of the upright photo)."""
    image: Path | None
    caption: str
    markup: list[dict] | None = None


class ReportPDF(FPDF):
    """A4 or Letter portrait pages with the site's header and the page-count / caution footer."""

    def __init__(self, *, paper: str, site_name: str, report_date: str, caution: str) -> None:
        super().__init__(orientation="P", unit="mm", format=paper)
        self.site_name, self.report_date, self.caution = site_name, report_date, caution
        fonts = ASSETS / "fonts"
        self.add_font(FONT, "", str(fonts / "DejaVuSans.ttf"))
        self.add_font(FONT, "B", str(fonts / "DejaVuSans-Bold.ttf"))
        self.set_margins(16, 20, 16)
        # room for the two-line footer: text must never run under it
        self.set_auto_page_break(True, margin=18)
        self.set_text_color(*INK)
        self.set_draw_color(*RULE)
        self.set_font(FONT, "", BODY_PT)
        self.set_title(f"Column assessment report: {site_name}")
        self.set_creator("fieldcol")

    # -- every page -----------------------------------------------------------------------
    def header(self) -> None:
        """Site name left, report date right, a thin rule under them."""
        self.set_y(8.5)
        self.set_font(FONT, "", SMALL_PT + 0.5)
        self.set_text_color(*GREY)
        right = f"report date {self.report_date}"
        rw = self.get_string_width(right) + 2
        # a long site name wraps onto a second header line rather than running into the date
        self.multi_cell(self.epw - rw, 3.2, f"{self.site_name}: column assessment", align="L",
                        new_x=XPos.RIGHT, new_y=YPos.TOP)
        self.cell(rw, 3.2, right, align="R")
        self.line(self.l_margin, 15.5, self.w - self.r_margin, 15.5)
        self.set_text_color(*INK)
        self.set_font(FONT, "", BODY_PT)
        self.set_y(self.t_margin)

    def footer(self) -> None:
        """The caution and ``page x of y`` on every page."""
        self.set_y(-15)
        self.line(self.l_margin, self.get_y(), self.w - self.r_margin, self.get_y())
        self.set_y(-14)
        self.set_font(FONT, "", SMALL_PT)
        self.set_text_color(*GREY)
        self.multi_cell(self.epw - 28, 3.2, self.caution, align="L", new_x=XPos.RIGHT,
                        new_y=YPos.TOP)
        self.cell(28, 3.2, f"page {self.page_no()} of {{nb}}", align="R")
        self.set_text_color(*INK)

    # -- blocks ---------------------------------------------------------------------------
    def heading(self, text: str, level: int = 1, *, keep: float = 0.0) -> None:
        """A section heading, kept on one page with the next ``keep`` mm (or a few lines)."""
        size = {1: 15.0, 2: 11.5, 3: 10.0}[level]
        need = max(keep + 8, {1: 30, 2: 22, 3: 16}[level])
        if self.will_page_break(need):
            self.add_page()
        self.ln({1: 1, 2: 3, 3: 2}[level])
        self.set_font(FONT, "B", size)
        self.multi_cell(self.epw, size * 0.5, text, align="L", new_x=XPos.LMARGIN,
                        new_y=YPos.NEXT)
        if level == 1:
            y = self.get_y() + 0.8
            self.set_line_width(0.4)
            self.line(self.l_margin, y, self.w - self.r_margin, y)
            self.set_line_width(0.2)
            self.ln(2.5)
        else:
            self.ln(1)
        self.set_font(FONT, "", BODY_PT)

    def para(self, text: str, *, size: float = BODY_PT, bold: bool = False,
             colour: tuple[int, int, int] = INK) -> None:
        """A wrapped paragraph across the text width."""
        self.set_font(FONT, "B" if bold else "", size)
        self.set_text_color(*colour)
        self.multi_cell(self.epw, size * 0.47, text, align="L", new_x=XPos.LMARGIN,
                        new_y=YPos.NEXT)
        self.set_text_color(*INK)
        self.set_font(FONT, "", BODY_PT)
        self.ln(1)

    def boxed(self, text: str, *, size: float = 10.0) -> None:
        """A paragraph in a ruled, shaded box: for the caution on the cover."""
        self.set_font(FONT, "B", size)
        self.set_fill_color(*SHADE)
        self.set_draw_color(*INK)
        self.set_line_width(0.6)
        self.multi_cell(self.epw, size * 0.5, text, border=1, fill=True, align="L",
                        padding=(3, 4, 3, 4), new_x=XPos.LMARGIN, new_y=YPos.NEXT)
        self.set_line_width(0.2)
        self.set_draw_color(*RULE)
        self.set_font(FONT, "", BODY_PT)
        self.ln(2)

    def table(self, headings: Sequence[str] | None, rows: Sequence[Sequence[str]],
              widths: Sequence[float], *, bold_rows: Sequence[int] = (),
              size: float = TABLE_PT) -> None:  # type: ignore[override]
        """A wrapped table; its heading row repeats on every page the table runs onto.

        Args:
            headings: column titles, or None for a plain key/value table.
            rows: the cells as text.
            widths: relative column widths.
            bold_rows: indexes of rows to set in bold (e.g. OVER columns, beside their word).
            size: the font size in points.
        """
        self.set_font(FONT, "", size)
        bold = FontFace(emphasis="BOLD")
        with super().table(col_widths=tuple(widths), width=self.epw, text_align="LEFT",
                           line_height=size * 0.45, padding=(0.9, 1.2, 0.9, 1.2),
                           v_align="TOP", first_row_as_headings=headings is not None,
                           headings_style=FontFace(emphasis="BOLD", fill_color=HEAD_FILL),
                           cell_fill_mode="ROWS", cell_fill_color=STRIPE,
                           repeat_headings=1, borders_layout="SINGLE_TOP_LINE"
                           if headings is not None else "HORIZONTAL_LINES") as t:
            if headings is not None:
                row = t.row()
                for h in headings:
                    row.cell(h)
            for i, cells in enumerate(rows):
                row = t.row()
                for c in cells:
                    row.cell(c, style=bold if i in bold_rows else None)
        self.set_font(FONT, "", BODY_PT)
        self.ln(2)

    def photos(self, cells: Sequence[PhotoCell], *, width: float = 40.0,
               max_height: float = 46.0) -> None:
        """Photos in rows across the page, each with its wrapped caption; a row never splits."""
        from PIL import Image

        per_row = max(1, int((self.epw + 4) // (width + 4)))
        for start in range(0, len(cells), per_row):
            chunk = cells[start:start + per_row]
            sizes = []
            for c in chunk:
                h = 12.0
                if c.image is not None:
                    with Image.open(c.image) as im:
                        pw, ph = im.size
                    h = min(max_height, width * ph / pw)
                    sizes.append((min(width, h * pw / ph), h))
                else:
                    sizes.append((width, h))
            self.set_font(FONT, "", SMALL_PT)
            caps = [self.multi_cell(width, 3.2, c.caption, dry_run=True, output="HEIGHT",
                                    align="L") for c in chunk]
            row_h = max(s[1] for s in sizes) + 1.5 + max(caps)
            if self.will_page_break(row_h):
                self.add_page()
            y0 = self.get_y()
            for i, (c, (w, h)) in enumerate(zip(chunk, sizes)):
                x = self.l_margin + i * (width + 4)
                if c.image is not None:
                    self.image(str(c.image), x=x, y=y0, w=w, h=h)
                    self.rect(x, y0, w, h)
                    if c.markup:
                        draw_markup(self, c.markup, x, y0, w, h, FONT)
                        self.set_font(FONT, "", SMALL_PT)
                else:
                    self.set_xy(x, y0)
                    self.multi_cell(width, 4, "photo file missing on this device", border=1,
                                    align="C")
                self.set_xy(x, y0 + max(s[1] for s in sizes) + 1.5)
                self.multi_cell(width, 3.2, c.caption, align="L")
            self.set_y(y0 + row_h + 3)
        self.set_font(FONT, "", BODY_PT)
