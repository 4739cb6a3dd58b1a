"""Tests of shotplan.render.export: scenes to PNG, SVG and PDF files."""

from __future__ import annotations

import io
import re
import struct
import threading
import xml.etree.ElementTree as ET
import zlib
from dataclasses import dataclass, field

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from matplotlib.figure import Figure
from PIL import Image

from shotplan import InputError, Table, TableSpec
from shotplan.render.export import (
    Page,
    render_png_bytes,
    wrap_text,
    write_pages,
    write_scene,
)
from shotplan.render.scene import CircleShape, PolylineShape, Scene, TextShape
from shotplan.render.table_shapes import layout_scene, table_scene

# PNG signature and IHDR layout: the PNG specification (W3C / ISO 15948), 5.2 and 11.2.2.
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


def _png_size(data: bytes) -> tuple[int, int]:
    assert data[12:16] == b"IHDR"
    return struct.unpack(">II", data[16:24])


def _image(data: bytes) -> np.ndarray:
    return np.asarray(Image.open(io.BytesIO(data)).convert("RGB")).astype(int)


def _pdf_pages(data: bytes) -> int:
    # ISO 32000-1, 7.7.3.3: every page object has /Type /Page (the tree nodes /Pages).
    return len(re.findall(rb"/Type\s*/Page(?![a-zA-Z])", data))


def _pdf_text(data: bytes) -> str:
    """The strings shown by the content streams (Tj and TJ operands), joined."""
    out = []
    for m in re.finditer(rb"stream\r?\n(.*?)\r?\nendstream", data, re.S):
        try:
            content = zlib.decompress(m.group(1))
        except zlib.error:
            continue
        out += [s.decode("latin-1") for s in re.findall(rb"\(((?:[^()\\]|\\.)*)\)", content)]
    return "".join(out)


@dataclass
class StandInLayout:
    table: TableSpec
    balls: dict[str, tuple[float, float]] = field(default_factory=dict)
    title: str = ""
    note: str = ""

    @property
    def geometry(self) -> Table:
        return Table(self.table)

    def positions(self) -> dict[str, tuple[float, float]]:
        return dict(self.balls)


@pytest.fixture(scope="module")
def nine_foot() -> Scene:
    spec = TableSpec.preset("pool-9ft")
    balls = {"cue": (0.635, 0.635), "1": (1.905, 0.635), "9": (1.98, 0.68)}
    return layout_scene(StandInLayout(spec, balls, "Nine-foot demo", "cue ball on the head spot"))


# ---------------------------------------------------------------- PNG

@pytest.mark.parametrize("name", ["pool-9ft", "snooker", "carom"])
def test_png_has_the_aspect_of_the_bounds(name):
    scene = table_scene(Table(TableSpec.preset(name)))
    data = render_png_bytes(scene, dpi=80, width_in=8)
    assert data.startswith(PNG_SIGNATURE)
    w, h = _png_size(data)
    assert w == 640
    assert abs(h - w * scene.height_m / scene.width_m) <= 2


def test_png_with_title_and_note_keeps_the_tables_aspect(nine_foot, tmp_path):
    path = write_scene(nine_foot, tmp_path / "demo.PNG", dpi=60, width_in=8)  # any case
    data = path.read_bytes()
    assert data.startswith(PNG_SIGNATURE)
    img = _image(data)
    # The rail is the only wood-brown thing: its pixel box has the bounds' aspect.
    brown = (img[..., 0] > img[..., 2] + 40) & (img[..., 1] < 110) & (img[..., 0] > 80)
    rows, cols = np.nonzero(brown)
    width_px = cols.max() - cols.min() + 1
    height_px = rows.max() - rows.min() + 1
    assert width_px == pytest.approx(480, abs=2)
    assert abs(height_px - width_px * nine_foot.height_m / nine_foot.width_m) <= 2
    # Title above and note below: dark text pixels outside the table's rows.
    dark = img.sum(axis=2) < 150
    assert dark[: rows.min()].any() and dark[rows.max() + 1:].any()


def test_long_note_is_wrapped_inside_the_figure():
    scene = table_scene(Table(TableSpec.preset("pool-8ft")))
    short = _image(render_png_bytes(scene.with_title("t", "one line"), dpi=40, width_in=8))
    text = " ".join(["the cue ball rolls through the spot and stops"] * 8)
    img = _image(render_png_bytes(scene.with_title("t", text), dpi=40, width_in=8))
    assert img.shape[1] == short.shape[1] == 320
    assert img.shape[0] >= short.shape[0] + 2 * 8  # at least two more lines of ~8 px
    brown = (img[..., 0] > img[..., 2] + 40) & (img[..., 1] < 110) & (img[..., 0] > 80)
    band = img[np.nonzero(brown.any(axis=1))[0].max() + 1:]  # below the rail
    assert (band.sum(axis=2) < 400).any(axis=1).sum() >= 3 * 5  # several rows of text
    dark_cols = np.nonzero((band.sum(axis=2) < 400).any(axis=0))[0]
    assert dark_cols.min() > 2 and dark_cols.max() < 317  # no text cut at the edges


def test_balls_drawn_to_scale():
    # One red carom ball, 61.25 mm (UMB band middle), on a 1 m wide scene drawn
    # 1000 px wide: a red disc about 61 px across (hand check).
    spec = TableSpec.preset("carom")
    scene = layout_scene(StandInLayout(spec, {"red": (1.0, 0.7)}))
    scene = Scene(scene.shapes, (0.5, 0.2, 1.5, 1.2))
    img = _image(render_png_bytes(scene, dpi=100, width_in=10))
    red = (img[..., 0] > 150) & (img[..., 1] < 90) & (img[..., 2] < 90)
    rows, cols = np.nonzero(red)
    assert cols.max() - cols.min() + 1 == pytest.approx(61.25, abs=2)
    assert rows.max() - rows.min() + 1 == pytest.approx(61.25, abs=2)
    # The centre at (1.0, 0.7): 500 px from the left, 500 px from the top (y up).
    assert (cols.min() + cols.max()) / 2 == pytest.approx(500, abs=1.5)
    assert (rows.min() + rows.max()) / 2 == pytest.approx(500, abs=1.5)


def test_sizes_in_mm_of_table():
    # 1 m drawn 500 px wide: a 20 mm line is 10 px thick; a digit of 100 mm em
    # is about 0.73 em = 36 px tall (DejaVu Sans digit height 0.729 em, from memory).
    line = PolylineShape([(0.1, 0.5), (0.4, 0.5)], colour="#000000", line_width_mm=20.0)
    text = TextShape((0.75, 0.5), "8", size_mm=100.0, colour="#000000")
    img = _image(render_png_bytes(Scene((line, text), (0, 0, 1, 1)), dpi=50, width_in=10))
    dark = img.sum(axis=2) < 300
    column = dark[:, 125]
    assert column.sum() == pytest.approx(10, abs=1)
    rows = np.nonzero(dark[:, 320:450].any(axis=1))[0]
    assert rows.max() - rows.min() + 1 == pytest.approx(36.5, rel=0.12)
    # Anchored at its centre, the digit's middle sits on y = 0.5 (row 250).
    assert (rows.max() + rows.min()) / 2 == pytest.approx(250, abs=2)


def test_nothing_is_drawn_that_is_not_in_the_scene():
    blank = _image(render_png_bytes(Scene((), (0, 0, 2, 1)), dpi=50, width_in=4))
    assert blank.min() == 255
    one = Scene((CircleShape((0.5, 0.5), 0.1, fill="#000000"),), (0, 0, 2, 1))
    img = _image(render_png_bytes(one, dpi=50, width_in=4))  # 200 x 100 px
    rows, cols = np.nonzero(img.sum(axis=2) < 765)
    assert 38 <= cols.min() and cols.max() <= 61 and 38 <= rows.min() and rows.max() <= 61


def test_rendering_from_threads(nine_foot):
    expected = render_png_bytes(nine_foot, dpi=40)
    results: list[bytes] = []

    def work() -> None:
        results.append(render_png_bytes(nine_foot, dpi=40))

    threads = [threading.Thread(target=work) for _ in range(3)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert results == [expected] * 3


# ------------------------------------------------------------ SVG, PDF

def test_svg_parses_and_keeps_the_aspect(nine_foot, tmp_path):
    path = write_scene(table_scene(Table(TableSpec.preset("snooker"))), tmp_path / "t.svg")
    root = ET.parse(path).getroot()
    assert root.tag == "{http://www.w3.org/2000/svg}svg"
    w, h = (float(root.attrib[k].removesuffix("pt")) for k in ("width", "height"))
    # WSF 3569 x 1778 mm plus 165 mm of rubber and rail each side (drawing widths).
    assert h / w == pytest.approx((1.778 + 0.33) / (3.569 + 0.33), abs=2 / w)


@pytest.mark.parametrize("suffix", [".svg", ".pdf"])
def test_vector_files_are_reproducible(nine_foot, tmp_path, suffix):
    a = write_scene(nine_foot, tmp_path / f"a{suffix}").read_bytes()
    b = write_scene(nine_foot, tmp_path / f"b{suffix}").read_bytes()
    assert a == b
    assert b"CreationDate" not in a and b"<dc:date>" not in a


def test_pdf(nine_foot, tmp_path):
    data = write_scene(nine_foot, tmp_path / "one.pdf").read_bytes()
    assert data.startswith(b"%PDF")
    assert _pdf_pages(data) == 1
    assert "Nine-foot demo" in _pdf_text(data)


def test_three_pages(nine_foot, tmp_path):
    carom = table_scene(Table(TableSpec.preset("carom"))).with_title("Carom page")
    pages = [Page(nine_foot, ["Speed: medium", "Tip: draw"]), carom,
             Page(nine_foot, ("third page",))]
    data = write_pages(pages, tmp_path / "sheet.pdf").read_bytes()
    assert data.startswith(b"%PDF")
    assert _pdf_pages(data) == 3
    text = _pdf_text(data)
    for word in ("Speed", "medium", "draw", "Carom", "third"):
        assert word in text


# --------------------------------------------------------- bad input

def test_bad_suffix_raises_before_any_work(nine_foot, tmp_path, monkeypatch):
    def no_drawing(*args, **kwargs):
        raise AssertionError("drew before checking the suffix")

    monkeypatch.setattr("shotplan.render.export.render_figure", no_drawing)
    with pytest.raises(InputError, match=r"'\.bmp'.*must end in one of \.png, \.svg, \.pdf"):
        write_scene(nine_foot, tmp_path / "t.bmp")
    with pytest.raises(InputError, match="must end in one of .pdf"):
        write_pages([nine_foot], tmp_path / "t.png")
    assert list(tmp_path.iterdir()) == []


def test_missing_folder_and_bad_values(nine_foot, tmp_path):
    with pytest.raises(InputError, match="does not exist"):
        write_scene(nine_foot, tmp_path / "nowhere" / "t.png")
    with pytest.raises(InputError, match="dpi"):
        write_scene(nine_foot, tmp_path / "t.png", dpi=0)
    with pytest.raises(InputError, match="no pages"):
        write_pages([], tmp_path / "t.pdf")
    assert list(tmp_path.iterdir()) == []


def test_failed_write_leaves_the_old_file(nine_foot, tmp_path, monkeypatch):
    target = tmp_path / "keep.png"
    target.write_bytes(b"the old diagram")

    def broken_savefig(self, fname, *args, **kwargs):
        # Fails half way through writing wherever it writes (a file name or
        # a file object): the drawing is rendered in memory before any file
        # is made, so nothing of it may reach the folder.
        if hasattr(fname, "write"):
            fname.write(b"half a fi")
        else:
            with open(fname, "wb") as fh:
                fh.write(b"half a fi")
        raise OSError("disk full")

    monkeypatch.setattr(Figure, "savefig", broken_savefig)
    with pytest.raises(OSError, match="disk full"):
        write_scene(nine_foot, target)
    assert target.read_bytes() == b"the old diagram"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["keep.png"]


# ------------------------------------------------- patterns, print style, limits

def test_a_dash_pattern_leaves_its_gaps():
    # 1 m drawn 500 px wide, a 10 mm (5 px) line; pattern 3 on, 1 off (in line
    # widths): 15 px ink, 5 px gap, so 3/4 of the line's length is ink (hand check).
    solid = PolylineShape([(0.1, 0.5), (0.9, 0.5)], colour="#000000", line_width_mm=10.0)
    dashed = PolylineShape([(0.1, 0.5), (0.9, 0.5)], colour="#000000", line_width_mm=10.0,
                           pattern=(3.0, 1.0))
    row = {}
    for name, line in (("solid", solid), ("dashed", dashed)):
        img = _image(render_png_bytes(Scene((line,), (0, 0, 1, 1)), dpi=50, width_in=10))
        row[name] = (img[250, 60:440].sum(axis=1) < 383).mean()
    assert row["solid"] == 1.0
    assert row["dashed"] == pytest.approx(0.75, abs=0.06)


def test_print_style_is_light_on_ink():
    # Ink: the share of pixels darker than mid grey. The print style's table
    # is a line drawing; the colour style's is mostly dark cloth and wood.
    spec = TableSpec.preset("pool-9ft")
    balls = {"cue": (0.635, 0.635), "1": (1.905, 0.635)}
    share = {}
    for style in ("print", "colour"):
        scene = layout_scene(StandInLayout(spec, balls), style=style)
        img = _image(render_png_bytes(scene, dpi=60))
        share[style] = (img.sum(axis=2) < 3 * 128).mean()
    assert share["print"] < 0.04 < 0.5 < share["colour"]


def test_pixel_limit_refuses_before_drawing(nine_foot, tmp_path, monkeypatch):
    from shotplan.render.export import DPI_RANGE, MAX_PIXELS

    assert DPI_RANGE[1] == 2400
    # 10 in at 2400 dpi: 24000 px wide, and the 9 ft table with its rails is
    # 1.626 / 2.896 as tall (hand check): far over the limit.
    assert 24000 * 24000 * 1.626 / 2.896 > MAX_PIXELS
    with pytest.raises(InputError, match=r"big\.png.*24000 x \d+ pixel PNG.*million allowed, "
                                         r"use a dpi of \d+ or less"):
        write_scene(nine_foot, tmp_path / "big.png", dpi=2400)
    assert list(tmp_path.iterdir()) == []
    # The same dpi on a drawing 1 in wide is fine (2400 px), and a vector file
    # has no pixels to count.
    write_scene(nine_foot, tmp_path / "small.png", dpi=2400, width_in=1.0)
    write_scene(nine_foot, tmp_path / "big.svg", dpi=2400)
    assert _png_size((tmp_path / "small.png").read_bytes())[0] == 2400


def test_draw_dpi_help_and_limit_agree(tmp_path, capsys):
    # Issue 12: 'draw --dpi 2400' was inside the help's range but refused.
    from shotplan.cli import build_parser, main

    layout = (__import__("pathlib").Path(__file__).resolve().parent.parent
              / "assets" / "layouts" / "club-night-1-straight-in.json")
    helptext = " ".join(build_parser()._subparsers._group_actions[0]  # type: ignore[union-attr]
                        .choices["draw"].format_help().split())
    assert "20 to 2400" in helptext and "100 million pixels" in helptext
    out = tmp_path / "x.png"
    assert main(["draw", str(layout), "-o", str(out), "--dpi", "2400"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "million pixels" in err[0] and "x.png" in err[0]
    assert not out.exists()
    assert main(["draw", str(layout), "-o", str(tmp_path / "y.png"), "--dpi", "20"]) == 0


# ----------------------------------------------------- the one figure writer

def test_figure_bytes_png_is_inches_times_dpi():
    # A PNG's size in pixels is its size in inches times the dots per inch
    # (the definition of dpi); width and height read from the IHDR chunk
    # (PNG specification, 11.2.2).
    from shotplan.render.export import figure_bytes, new_figure

    fig = new_figure((4.0, 2.5))
    fig.add_subplot().plot([0, 1], [0, 1])
    assert _png_size(figure_bytes(fig, "png", dpi=50)) == (200, 125)
    assert _png_size(figure_bytes(fig, "png", dpi=120)) == (480, 300)


def test_pdf_bytes_one_page_per_figure_each_its_own_size():
    # PDF user space is 1/72 inch (ISO 32000-1, 8.3.2.3): an A4 page of
    # 8.27 x 11.69 in is 595.44 x 841.68 pt, a 4 x 3 in page 288 x 216 pt.
    from shotplan.render.export import new_figure, pdf_bytes

    data = pdf_bytes([new_figure((8.27, 11.69)), new_figure((4.0, 3.0))])
    boxes = [tuple(float(v) for v in m.split()) for m in
             re.findall(rb"/MediaBox \[ ([^\]]*)\]", data)]
    assert boxes == [(0.0, 0.0, 595.44, 841.68), (0.0, 0.0, 288.0, 216.0)]
    assert b"/Count 2" in data


@pytest.mark.parametrize("fmt", ["png", "svg", "pdf"])
def test_figure_bytes_are_the_same_each_time(fmt):
    # No dates or versions in the files: the same figure gives the same bytes.
    from shotplan.render.export import figure_bytes, new_figure

    # A chart's axes clip their lines, and SVG clip paths get ids: they are
    # salted, so they too are the same each time.
    fig = new_figure((3.0, 2.0))
    fig.add_subplot().plot([0, 1, 2], [2, 0, 1])
    assert figure_bytes(fig, fmt, dpi=40) == figure_bytes(fig, fmt, dpi=40)


def test_write_figures_checks_before_writing(tmp_path):
    from shotplan.render.export import figure_bytes, new_figure, write_figures

    figs = [new_figure((2.0, 2.0)), new_figure((2.0, 2.0))]
    with pytest.raises(InputError, match="several pages need a .pdf"):
        write_figures(figs, tmp_path / "two.png")
    with pytest.raises(InputError, match="no figure"):
        write_figures([], tmp_path / "none.pdf")
    with pytest.raises(InputError):
        write_figures(figs[:1], tmp_path / "one.bmp")
    with pytest.raises(InputError):
        figure_bytes(figs[0], "bmp")
    assert sorted(p.name for p in tmp_path.iterdir()) == []  # nothing written
    one = write_figures(figs[:1], tmp_path / "one.png", dpi=30)
    assert _png_size(one.read_bytes()) == (60, 60)
    pages = write_figures(figs, tmp_path / "two.pdf")
    assert b"/Count 2" in pages.read_bytes()  # the page tree's count (ISO 32000-1, 7.7.3.2)


def test_wrap_text_hand_worked():
    from shotplan.render.export import wrap_text

    assert wrap_text("", 10, 100) == []
    # Wide enough for everything: one line per paragraph, newlines kept.
    assert wrap_text("one two\nthree", 10, 10_000) == ["one two", "three"]
    # Narrower than any word: each word alone, none cut.
    assert wrap_text("one two three", 10, 1) == ["one", "two", "three"]
    # At 10 pt a line of 40 characters is wider than 100 pt (an average
    # glyph of the default sans face is over half an em: from memory), so
    # it breaks, and every line stays within the width unless one word is wider.
    text = "a b c d e f g h i j k l m n o p q r s t"
    lines = wrap_text(text, 10, 100)
    assert len(lines) > 1 and " ".join(lines) == text


def _wrap_measuring_every_line(text: str, size_pt: float, width_pt: float,
                               bold: bool) -> list[str]:
    """The reference: greedy breaks, every candidate line measured by
    matplotlib's own text layout (TextToPath, with kerning and bearings)."""
    from matplotlib.font_manager import FontProperties
    from matplotlib.textpath import TextToPath

    ttp = TextToPath()
    prop = FontProperties(size=size_pt, weight="bold" if bold else "normal")
    out: list[str] = []
    for paragraph in text.split("\n"):
        line = ""
        for word in paragraph.split(" "):
            trial = f"{line} {word}" if line else word
            if not line or ttp.get_text_width_height_descent(trial, prop, False)[0] <= width_pt:
                line = trial
            else:
                out.append(line)
                line = word
        out.append(line)
    return out


_WORDS = __import__("pathlib").Path(__file__).resolve().parents[1].joinpath(
    "README.md").read_text(encoding="utf-8").split()


@settings(max_examples=150, deadline=None)
@given(st.lists(st.sampled_from(_WORDS), min_size=20, max_size=60),
       st.floats(5.0, 14.0), st.floats(20.0, 600.0), st.booleans())
def test_wrap_text_breaks_as_measuring_every_line(words, size, width, bold):
    # wrap_text settles lines far from the width by advance widths; its
    # breaks must be those of measuring every line (the README's own words,
    # with its symbols, at sizes and widths of scenes and sheets).
    text = " ".join(words)
    assert wrap_text(text, size, width, bold) == _wrap_measuring_every_line(text, size, width,
                                                                          bold)


@pytest.mark.filterwarnings("ignore:Glyph")  # matplotlib: "missing from font(s)"
@settings(max_examples=60, deadline=None)
@given(st.text(st.characters(codec="utf-8", exclude_categories=("Cs", "Cc")), min_size=1,
               max_size=80),
       st.floats(5.0, 14.0), st.floats(10.0, 300.0))
def test_wrap_text_any_characters(text, size, width):
    # Glyphs the face lacks (drawn by a fallback) are always measured.
    assert wrap_text(text, size, width) == _wrap_measuring_every_line(text, size, width, False)


def test_render_api_is_documented():
    # The numpydoc rule of tests/test_docstrings.py, on the public API of render/.
    from test_docstrings import _module_problems

    problems = []
    for name in ("scene", "palette", "table_shapes", "overlays", "captions", "export", "sheet"):
        problems += _module_problems(f"shotplan.render.{name}")
    assert not problems, "\n".join(problems)
