"""The printed budget as a PDF: every example opens, carries the sections, charts, sources and
the same summary figures as the text budget; tables break across pages; bad input exits 2.

The PDF is read back with pypdf (pure Python, in the test extra).
"""

from __future__ import annotations

import glob
import os
import re
import sys

import pypdf  # the test extra; matplotlib comes with the pdf extra (CI installs both)
import pytest

from cryoplan.cli import main
from cryoplan.errors import CryoplanError, InputError
from cryoplan.evaluation import evaluate
from cryoplan.plan import examples_dir, load_plan
from cryoplan.report import render
from cryoplan.report.budget import build_document
from cryoplan.report.document import Bullets, Chart, Heading, Paragraph, Table
from cryoplan.report.pdf import (
    MARGIN_X,
    PAPER_SIZES,
    layout_blocks,
    paper_size,
    render_blocks_pdf,
    render_pdf,
    text_width,
)

EXAMPLES = sorted(glob.glob(os.path.join(examples_dir(), "*.toml")))
NUMBER = re.compile(r"\d+(?:,\d{3})*(?:\.\d+)?(?:e[-+]?\d+)?")


def _reader(payload: bytes):
    import io

    return pypdf.PdfReader(io.BytesIO(payload))


def _squash(text: str) -> str:
    """Text with every run of whitespace removed: line breaks fall where the page wraps."""
    return re.sub(r"\s+", "", text)


@pytest.fixture(scope="module", params=EXAMPLES, ids=os.path.basename)
def example(request):
    data = evaluate(load_plan(request.param)).to_dict()
    payload = render_pdf(data, paper="a4")
    reader = _reader(payload)
    pages = [p.extract_text() for p in reader.pages]
    # the running text without the page footers (drawn last on each page), which would
    # interrupt an item broken over two pages
    body = "\n".join(p[: p.rfind("cryoplan budget:")] for p in pages)
    return {
        "data": data,
        "payload": payload,
        "reader": reader,
        "pages": pages,
        "text": body,
        "blocks": build_document(data),
    }


def test_examples_exist():
    assert len(EXAMPLES) >= 3  # the three examples of the repository's examples/ folder


def test_pdf_opens_on_a4(example):
    payload, reader = example["payload"], example["reader"]
    assert payload.startswith(b"%PDF-")
    assert len(reader.pages) >= 2  # title, summary, sections and sources never fit one page
    n = len(reader.pages)
    for k, text in enumerate(example["pages"], start=1):
        assert "cryoplan budget:" in text and f"page {k} of {n}" in text  # the footer
    w, h = PAPER_SIZES["a4"]
    for page in reader.pages:
        # ISO 216 A4, 210 mm x 297 mm; 0.5 pt covers the rounding of the page box
        assert float(page.mediabox.width) == pytest.approx(w, abs=0.5)
        assert float(page.mediabox.height) == pytest.approx(h, abs=0.5)


def test_title_block(example):
    first = example["pages"][0]
    p = example["data"]["plan"]
    assert _squash(p["title"]) in _squash(first)
    assert _squash(str(p["file"])) in _squash(first)
    assert p["date"] in first
    assert f"cryoplan {p['cryoplan_version']}" in first


def test_every_heading_in_order(example):
    text = _squash(example["text"])
    at = 0
    for b in example["blocks"]:
        if isinstance(b, Heading):
            found = text.find(_squash(b.text), at)
            assert found >= 0, f"heading {b.text!r} missing or out of order"
            at = found


def test_every_source_named(example):
    text = _squash(example["text"])
    assert example["data"]["sources"]
    for source in example["data"]["sources"]:
        assert _squash(source) in text, source


def test_cautions_printed(example):
    from cryoplan.report.cautions import CAUTIONS

    text = _squash(example["text"])
    for caution in CAUTIONS:
        assert _squash(caution.title) in text


def test_table_cells_all_printed(example):
    text = _squash(example["text"])
    for b in example["blocks"]:
        if isinstance(b, Table):
            for row in b.rows:
                for cell in row:
                    assert _squash(str(cell)) in text, (b.name, cell)


def test_charts_drawn(example):
    charts = [b for b in example["blocks"] if isinstance(b, Chart)]
    reader = example["reader"]
    for chart in charts:
        pages = [k for k, t in enumerate(example["pages"]) if _squash(chart.title) in _squash(t)]
        assert pages, chart.title
        k = pages[0]
        page_text = _squash(example["pages"][k])
        # the axis labels are drawn only by a chart
        assert _squash(chart.x_label) in page_text and _squash(chart.y_label) in page_text
        content = reader.pages[k].get_contents().get_data().decode("latin-1")
        # markers and ticks are painted as form XObjects ("Do"); a page of text has none
        assert len(re.findall(r"\bDo\b", content)) >= len(chart.series)


def test_pages_without_charts_paint_no_markers(example):
    """The check above can fail: pages of text and tables carry no chart drawing."""
    titles = [_squash(b.title) for b in example["blocks"] if isinstance(b, Chart)]
    for k, page in enumerate(example["reader"].pages):
        if any(t in _squash(example["pages"][k]) for t in titles):
            continue
        content = page.get_contents().get_data().decode("latin-1")
        assert not re.findall(r"\bDo\b", content)


def _section(text: str, start: str, stop: str | None) -> str:
    i = text.index(start) + len(start)
    j = text.index(stop, i) if stop else len(text)
    return text[i:j]


def test_summary_figures_match_text_budget(example):
    blocks, data = example["blocks"], example["data"]
    headings = [b.text for b in blocks if isinstance(b, Heading)]
    assert headings[0] == "Summary"
    nxt = headings[1]
    text_budget = render(data, "text")
    body = text_budget.split("\n", 5)[5]  # after the banner (title, file, date)
    in_text = _section(body, "SUMMARY", nxt.upper())
    pdf_pages = example["pages"]
    pdf_body = "\n".join(pdf_pages)
    pdf_body = pdf_body[pdf_body.index("Printed") :]
    pdf_body = pdf_body[pdf_body.index("\n") :]
    in_pdf = _section(pdf_body, "Summary", nxt)
    numbers_text = sorted(NUMBER.findall(in_text))
    numbers_pdf = sorted(NUMBER.findall(in_pdf))
    assert len(numbers_text) >= 4  # at least the minimum work, the heat and two more
    assert numbers_pdf == numbers_text


def test_black_and_white_only(example):
    """Every colour set in the page streams is a grey (r = g = b): nothing relies on colour."""
    for page in example["reader"].pages:
        content = page.get_contents().get_data().decode("latin-1")
        for r, g, b in re.findall(r"([\d.]+) ([\d.]+) ([\d.]+) (?:rg|RG)\b", content):
            assert float(r) == float(g) == float(b)


def test_letter_paper():
    data = evaluate(load_plan(EXAMPLES[0])).to_dict()
    reader = _reader(render_pdf(data, paper="Letter"))
    for page in reader.pages:
        # US Letter, 8.5 in x 11 in = 612 pt x 792 pt (ANSI/ASME Y14.1)
        assert float(page.mediabox.width) == pytest.approx(612.0, abs=0.5)
        assert float(page.mediabox.height) == pytest.approx(792.0, abs=0.5)


# --- the writer on blocks made here ----------------------------------------------------------


def test_long_table_breaks_across_pages_with_its_header():
    rows = [[f"part {k}", f"{k * 1.5:.1f}"] for k in range(220)]
    blocks = [Heading("Parts"), Table(["Part name", "Mass [kg]"], rows, title="Every part")]
    reader = _reader(render_blocks_pdf(blocks, title="long table"))
    pages = [p.extract_text() for p in reader.pages]
    assert len(pages) >= 4  # 220 rows at about 11 pt each need over 2400 pt: 4 A4 pages
    for text in pages:
        assert "Part name" in text  # the header is repeated on every page of the table
    for text in pages[1:]:
        assert "Every part (continued)" in text
    found = [int(m) for m in re.findall(r"part (\d+)\b", "\n".join(pages))]
    assert found == list(range(220))  # every row once, in order


def _ops_inside_margins(layout):
    lo, hi = MARGIN_X - 0.5, layout.width - MARGIN_X + 0.5  # 0.5 pt: rounding of positions
    for page in layout.pages:
        for op in page.ops:
            if op[0] != "text":
                continue
            _, x, y, s, size, bold, mono, ha, _ = op
            w = text_width(s, size, bold, mono)
            x0, x1 = (x - w, x) if ha == "right" else (x, x + w)
            assert lo <= x0 and x1 <= hi, (s, x0, x1)
            assert y <= layout.bottom + 0.5


@pytest.mark.parametrize("paper", ["a4", "letter"])
def test_wide_table_and_long_words_stay_on_the_page(paper):
    headers = [f"Column with a long header {k}" for k in range(12)]
    rows = [[f"value {k} of row {r} with words" for k in range(12)] for r in range(5)]
    path = "/very/long/" + "folder-name-without-spaces" * 12 + "/plan.toml"
    blocks = [
        Table(headers, rows),
        Paragraph(f"Plan file: {path}"),
        Bullets([path] * 2),
        Heading("A heading " * 20),
    ]
    layout = layout_blocks(blocks, paper, title="wide " * 40, details=[path])
    _ops_inside_margins(layout)


def test_dollar_signs_are_not_typeset_as_mathematics():
    blocks = [
        Paragraph("Helium at $18/L and nitrogen at $0.60/L."),
        Table(["Item", "Price"], [["helium", "$18/L"]]),
        Chart("Price $ chart", "x $", "y", [("series $a$", [1, 2], [3, 4])]),
    ]
    text = _reader(render_blocks_pdf(blocks, title="$ title")).pages[0].extract_text()
    assert "$18/L and nitrogen at $0.60/L" in text
    assert "series $a$" in text


def test_chart_series_differ_in_line_style_and_marker_all_black():
    from matplotlib.figure import Figure

    from cryoplan.report.pdf import _draw_chart

    chart = Chart(
        "c",
        "T [K]",
        "L",
        [(f"s{k}", [1, 2, 3, 4], [k, k + 1, k + 2, k + 3]) for k in range(5)],
        log_x=True,
    )
    fig = Figure(figsize=(6, 4))
    _draw_chart(fig, 432, 288, 0, 0, 432, 288, chart)
    ax = fig.axes[0]
    styles = {(line.get_linestyle(), line.get_marker()) for line in ax.lines}
    assert len(styles) == 5
    assert {line.get_color() for line in ax.lines} == {"black"}
    assert ax.get_xscale() == "log"


def test_empty_chart_and_unknown_block_still_render():
    class Note:
        text = "a block kind the writer does not know"

    blocks = [Chart("Nothing yet", "t", "T", [("a", [], [])]), Note()]
    text = _reader(render_blocks_pdf(blocks)).pages[0].extract_text()
    assert "(no data)" in text and "a block kind the writer does not know" in text


# --- bad input -------------------------------------------------------------------------------


def test_unknown_paper_size_names_the_known_ones():
    with pytest.raises(InputError) as exc:
        paper_size("a5")
    assert "a4" in str(exc.value) and "letter" in str(exc.value) and "a5" in str(exc.value)


def test_cli_unknown_paper_exits_2_and_writes_nothing(tmp_path, capsys):
    out = tmp_path / "budget.pdf"
    code = main(["print", EXAMPLES[0], "--format", "pdf", "-o", str(out), "--paper", "a3"])
    assert code == 2
    err = capsys.readouterr().err
    assert "paper" in err and "a4" in err and "letter" in err and "Traceback" not in err
    assert list(tmp_path.iterdir()) == []


def test_cli_writes_a_pdf(tmp_path):
    out = tmp_path / "budget.pdf"
    assert main(["print", EXAMPLES[0], "--format", "pdf", "-o", str(out)]) == 0
    assert out.read_bytes().startswith(b"%PDF-")
    assert [p.name for p in tmp_path.iterdir()] == ["budget.pdf"]  # no temporary left


def test_cli_unwritable_output_exits_2_without_a_partial_file(tmp_path, capsys):
    missing = tmp_path / "no-such-folder" / "budget.pdf"
    assert main(["print", EXAMPLES[0], "--format", "pdf", "-o", str(missing)]) == 2
    assert "cannot write" in capsys.readouterr().err
    assert list(tmp_path.iterdir()) == []
    folder = tmp_path / "a-folder"  # the output path is a folder: the rename fails
    folder.mkdir()
    assert main(["print", EXAMPLES[0], "--format", "pdf", "-o", str(folder)]) == 2
    assert "cannot write" in capsys.readouterr().err
    assert list(folder.iterdir()) == [] and list(tmp_path.iterdir()) == [folder]


def test_missing_matplotlib_says_to_install_the_pdf_extra(monkeypatch):
    for name in [m for m in sys.modules if m == "matplotlib" or m.startswith("matplotlib.")]:
        monkeypatch.setitem(sys.modules, name, None)
    monkeypatch.setitem(sys.modules, "matplotlib", None)
    with pytest.raises(CryoplanError) as exc:
        render_blocks_pdf([Paragraph("x")])
    assert "pdf extra" in str(exc.value) and "matplotlib" in str(exc.value)


def _drawn_extents(layout, page):
    """(x0, x1) [pt] of every text drawn on a page, measured by matplotlib at 720 dpi, where
    hinting moves a glyph by well under 0.1 pt: independent of the layout's own measure."""
    from matplotlib.backends.backend_agg import RendererAgg
    from matplotlib.figure import Figure

    from cryoplan.report.pdf import _draw_page

    dpi = 720
    w, h = layout.width, layout.height
    renderer = RendererAgg(int(w / 72 * dpi), int(h / 72 * dpi), dpi)
    fig = _draw_page(Figure, page, w, h, "", "")
    fig.set_dpi(dpi)
    out = []
    for text in fig.texts:
        if text.get_text():
            box = text.get_window_extent(renderer)
            out.append((text.get_text(), box.x0 / dpi * 72, box.x1 / dpi * 72))
    return out


@pytest.mark.parametrize("words", [2, 8, 11, 12, 13, 14, 16, 30])
def test_drawn_table_text_stays_inside_its_rules(words):
    """From a table that fits in body type to ones that drop to smaller type and wrap."""
    detail = " ".join(["phosphor-bronze", "sunk", "at", "shield"] * 8)
    detail = " ".join(detail.split()[:words])
    rows = [["4K plate", "coax and DC wiring", "radiation", "0.0267", detail]] * 3
    table = Table(["Stage", "Load", "Kind", "Power [W]", "Detail"], rows, "lllrl")
    layout = layout_blocks([table], "a4", title="")
    rules = [op for op in layout.pages[0].ops if op[0] == "rule"]
    left = min(op[1] for op in rules)
    right = max(op[2] for op in rules)
    words = {w for row in [table.headers] + rows for cell in row for w in cell.split()}
    words |= {"Cryoplan", "budget"}  # the title block above the table
    for text, x0, x1 in _drawn_extents(layout, layout.pages[0]):
        # 1 pt: the side bearings of the first and last glyph
        assert left - 1 <= x0 and x1 <= right + 1, (text, x0, x1, right)
        assert set(text.split()) <= words  # cells wrap between words, never inside one


def test_drawn_text_stays_inside_the_margins():
    blocks = [
        Table([f"Head {k}" for k in range(10)], [[f"cell {k} text" for k in range(10)]]),
        Paragraph("word " * 200),
        Bullets(["item " * 50]),
    ]
    layout = layout_blocks(blocks, "a4", title="title " * 30)
    for page in layout.pages:
        for text, x0, x1 in _drawn_extents(layout, page):
            assert MARGIN_X - 1 <= x0 and x1 <= layout.width - MARGIN_X + 1, (text, x0, x1)
