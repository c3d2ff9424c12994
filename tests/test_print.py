"""The printed report: headless Chromium prints it to PDF on A4 and on Letter.

Runs only where Chromium is installed (Debian's ``chromium`` package); skipped
otherwise.  Checks the paper size of every page, the page count (each section
starts a page, the summary fits one), that no table, figure or line of text is
wider than the printed page (the print rules laid out at the page's width), and,
where poppler's ``pdftotext`` is installed, that every page carries the title
block.  Three Chromium runs in all (two prints, one layout), a few seconds.  Paper sizes: ISO 216 (A4, 210 x 297 mm = 595.3 x 841.9 pt) and ANSI/ASME
Y14.1 (Letter, 8.5 x 11 in = 612 x 792 pt).
"""

import json
import re
import shutil
import subprocess
import zlib
from pathlib import Path

import pytest

from axialfe import parse_model, solve
from axialfe.checks import check_solution
from axialfe.output.report import SECTIONS, build_html
from axialfe.review.sheet import thermal_split

from test_report import MODEL, PROJECT

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
pytestmark = pytest.mark.skipif(CHROMIUM is None, reason="chromium is not installed")

# page size in points and the printed width in CSS pixels (96 per inch) inside 12 mm margins
PAPER = {"a4": ((595.3, 841.9), (210 - 24) / 25.4 * 96),
         "letter": ((612.0, 792.0), (215.9 - 24) / 25.4 * 96)}


def _chromium(*args, timeout=60):
    return subprocess.run([CHROMIUM, "--headless", "--no-sandbox", "--disable-gpu",
                           "--no-first-run", "--disable-extensions", *args],
                          capture_output=True, text=True, timeout=timeout)


def _pages(pdf: bytes):
    """The MediaBox of every page object of a PDF (Skia writes page dictionaries plainly;
    object streams are read too, in case)."""
    text = pdf.decode("latin-1")
    chunks = [text]
    for m in re.finditer(r"/Filter\s*/FlateDecode[^>]*>>\s*stream\r?\n", text):
        start = m.end()
        end = text.find("endstream", start)
        try:
            inner = zlib.decompress(pdf[start:end]).decode("latin-1")
        except zlib.error:
            continue
        if "/Type" in inner and "/Page" in inner:
            chunks.append(inner)
    boxes = []
    for chunk in chunks:
        for m in re.finditer(r"/Type\s*/Page(?![s\w])", chunk):
            window = chunk[max(0, m.start() - 600):m.end() + 600]
            box = re.search(r"/MediaBox\s*\[\s*([-\d.\s]+)\]", window)
            if box:
                x0, y0, x1, y1 = map(float, box.group(1).split())
                boxes.append((x1 - x0, y1 - y0))
    return boxes


def _print(tmp_path, page: str, paper: str, name: str):
    html_path = tmp_path / f"{name}.html"
    html_path.write_text(page, encoding="utf-8")
    pdf_path = tmp_path / f"{name}.pdf"
    run = _chromium("--no-pdf-header-footer", f"--print-to-pdf={pdf_path}", html_path.as_uri())
    assert pdf_path.exists(), run.stderr[-2000:]
    return pdf_path


_MEASURE = """<script>
window.addEventListener('load', () => {
  const w = document.documentElement.clientWidth;
  const wide = [...document.querySelectorAll('table, figure, svg, p, li, h1, h2, h3')]
    .filter(e => e.getBoundingClientRect().right > w + 0.5 || e.scrollWidth > e.clientWidth + 1
                 && e.tagName !== 'svg')
    .map(e => e.tagName + '#' + (e.id || e.className || '') + ':'
              + Math.round(e.getBoundingClientRect().right) + '/' + w);
  document.body.setAttribute('data-overflow', JSON.stringify(wide));
  document.body.setAttribute('data-width', String(w));
});
</script>"""


def _overflow(tmp_path, page: str, width_px: float, name: str):
    """The elements wider than ``width_px`` when the print rules lay the report out."""
    screen = page.replace("@media print {", "@media all {").replace("</body>", _MEASURE + "</body>")
    path = tmp_path / f"{name}-measure.html"
    path.write_text(screen, encoding="utf-8")
    run = _chromium(f"--window-size={int(width_px)},1200", "--hide-scrollbars",
                    "--dump-dom", path.as_uri())
    m = re.search(r'data-overflow="([^"]*)"', run.stdout)
    assert m, run.stderr[-2000:]
    width = int(re.search(r'data-width="(\d+)"', run.stdout).group(1))
    assert abs(width - int(width_px)) <= 1   # laid out at the printed width
    return json.loads(m.group(1).replace("&quot;", '"'))


@pytest.mark.parametrize("paper", ["a4", "letter"])
def test_the_report_prints_one_section_a_page_on_its_paper(tmp_path, paper):
    solution = solve(parse_model(PROJECT))
    page = build_html(solution, date="2026-03-20", checks=check_solution(solution),
                      thermal=thermal_split(solution), paper=paper)
    pdf = _print(tmp_path, page, paper, f"small-{paper}")
    boxes = _pages(pdf.read_bytes())
    (w, h), _ = PAPER[paper]
    # a small model: each section fits one page and starts its own, the summary first
    assert len(boxes) == len(SECTIONS)
    for bw, bh in boxes:
        assert bw == pytest.approx(w, abs=1.0) and bh == pytest.approx(h, abs=1.0)
    if shutil.which("pdftotext"):
        text = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], capture_output=True,
                              text=True, timeout=30).stdout
        pages = text.split("\f")[:len(boxes)]
        assert all("J-2291" in p and "R. Okafor" in p for p in pages)   # the title block
        assert "Verdict: PASS" in pages[0]


def test_no_table_is_wider_than_the_printed_page(tmp_path):
    # the widest report of the suite (parallel parts, a taper, a gap, three cases), with a
    # segment of a long unbroken name (names run to 200 characters: table cells give it break
    # opportunities), laid out at A4's width: Letter's is 5.9 mm wider, so what fits A4 fits it
    long = "x" * 180
    text = MODEL.replace('name = "sleeve"', f'name = "{long}"')
    assert long in text
    solution = solve(parse_model(text, "job.toml"))
    page = build_html(solution, date="2026-03-20", checks=check_solution(solution),
                      thermal=thermal_split(solution))
    assert PAPER["letter"][1] > PAPER["a4"][1]
    assert _overflow(tmp_path, page, PAPER["a4"][1], "wide") == []
