"""The report in a real browser (headless chromium, installed by scripts/system-deps.sh).

One test opens the bundled example's report, takes a screenshot, and runs a probe script in the
page: the drawing has one shape per member, sorting the members table works, filtering works, and
clicking a member in the drawing opens its sheet. Another prints the report to PDF and checks that
nothing is cut: every page is landscape, every column heading of the members and stability tables
and every member's governing combination (the last columns) is in the printed text; a control
test shows that check failing on a copy whose members table is forced wider than the page.

No outside value is compared: the source of the expected members and utilisations is the run's
own summary.csv.
"""

from __future__ import annotations

import json
import re
import shutil
import subprocess
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from postproc.cli import main

pytestmark = pytest.mark.browser
EXAMPLE = Path(__file__).resolve().parents[2] / "examples" / "hillside_depot"
CHROMIUM_FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
                  "--disable-component-update", "--disable-sync", "--no-first-run"]
PROBE = """
<script>
(function () {
  var out = {};
  var svg = document.querySelector('svg.frame');
  out.shapes = Array.prototype.map.call(svg.querySelectorAll('polyline.member'),
                                        function (p) { return p.getAttribute('data-member'); });
  var table = document.getElementById('members-table');
  var head = table.tHead.rows[0].cells;
  function column(i, attr) {
    return Array.prototype.map.call(table.tBodies[0].rows, function (r) {
      return attr ? r.cells[i].getAttribute(attr) : r.cells[i].textContent.trim(); });
  }
  head[5].click();
  out.ascending = column(5, 'data-sort');
  head[5].click();
  out.descending = column(5, 'data-sort');
  head[0].click();
  out.by_name = column(0);
  var filter = document.getElementById('member-filter');
  filter.value = 'C0';
  filter.dispatchEvent(new Event('input'));
  out.filtered = Array.prototype.filter.call(table.tBodies[0].rows, function (r) {
    return r.style.display !== 'none'; }).map(function (r) { return r.cells[0].textContent; });
  var link = svg.querySelector('a.member-link');
  out.clicked = link.getAttribute('data-member');
  link.dispatchEvent(new MouseEvent('click', {bubbles: true, cancelable: true}));
  out.hash = decodeURIComponent(location.hash);
  var target = document.querySelector(':target');
  out.target = target ? target.id : null;
  out.target_heading = target ? target.querySelector('h3').textContent : null;
  out.target_top = target ? target.getBoundingClientRect().top : null;
  var pre = document.createElement('pre');
  pre.id = 'probe-result';
  pre.textContent = JSON.stringify(out);
  document.body.appendChild(pre);
})();
</script>
"""


def chromium() -> str:
    path = shutil.which("chromium") or shutil.which("chromium-browser")
    assert path, "chromium is not installed: run scripts/system-deps.sh (make setup installs it)"
    return path


def run_chromium(tmp: Path, *args: str, timeout: float = 120) -> subprocess.CompletedProcess:
    profile = tmp / f"profile-{len(list(tmp.glob('profile-*')))}"
    return subprocess.run([chromium(), *CHROMIUM_FLAGS, f"--user-data-dir={profile}", *args],
                          capture_output=True, text=True, timeout=timeout, check=True)


@pytest.fixture(scope="module")
def report(tmp_path_factory: pytest.TempPathFactory) -> Path:
    out = tmp_path_factory.mktemp("browser") / "out"
    code = main(["run", str(EXAMPLE / "project.toml"), "--out", str(out), "--quiet"])
    assert code in (0, 1, 3)
    return out


def test_screenshot_drawing_sorting_and_sheets(report: Path, tmp_path: Path) -> None:
    summary = pd.read_csv(report / "summary.csv")
    members = sorted(summary["member"].astype(str))
    shot = tmp_path / "report.png"
    run_chromium(tmp_path, "--window-size=1280,2000", f"--screenshot={shot}",
                 (report / "report.html").as_uri())
    from PIL import Image

    image = np.asarray(Image.open(shot).convert("RGB"))
    assert image.shape[0] == 2000 and image.shape[1] == 1280
    assert len(np.unique(image.reshape(-1, 3), axis=0)) > 50, "the screenshot looks blank"

    probed = tmp_path / "probed"
    shutil.copytree(report, probed)
    page = probed / "report.html"
    page.write_text(page.read_text(encoding="utf-8").replace("</body>", PROBE + "</body>"),
                    encoding="utf-8")
    dom = run_chromium(tmp_path, "--dump-dom", page.as_uri()).stdout
    found = re.search(r'<pre id="probe-result">(.*?)</pre>', dom, re.S)
    assert found, "the probe script did not run"
    out = json.loads(found.group(1).replace("&quot;", '"').replace("&amp;", "&"))
    # one shape per member in the drawing, each member once
    assert sorted(out["shapes"]) == members
    # sorting by utilisation, both ways, as numbers
    ascending = [float(v) for v in out["ascending"] if v != ""]
    descending = [float(v) for v in out["descending"] if v != ""]
    csv_rounding = 1e-5  # summary.csv keeps 6 significant figures, the page all of them
    assert ascending == pytest.approx(sorted(summary["max_utilisation"].dropna()), rel=csv_rounding)
    assert descending == pytest.approx(sorted(summary["max_utilisation"].dropna(), reverse=True),
                                       rel=csv_rounding)
    assert out["by_name"] == members
    assert out["filtered"] == [m for m in members if "c0" in m.lower()]
    # clicking a member in the drawing opens its sheet at the top of the window
    assert out["hash"] == f"#sheet-{out['clicked']}"
    assert out["target"] == f"sheet-{out['clicked']}"
    assert out["target_heading"] == f"Calculation sheet: member {out['clicked']}"
    assert abs(out["target_top"]) < 50


def pdf_pages(pdf: Path, tmp: Path) -> list[tuple[int, int]]:
    """(width, height) in pixels of every page rendered at 20 dpi."""
    from PIL import Image

    subprocess.run(["pdftoppm", "-r", "20", "-png", str(pdf), str(tmp / "page")], check=True,
                   timeout=120)
    return [Image.open(png).size for png in sorted(tmp.glob("page*.png"))]


def pdf_text(pdf: Path) -> str:
    """The PDF's text with all white space removed, so a heading wrapped over lines still
    matches; chromium leaves text it clips at the page edge out of the PDF."""
    text = subprocess.run(["pdftotext", str(pdf), "-"], capture_output=True, text=True,
                          check=True, timeout=120).stdout
    return re.sub(r"\s+", "", text)


MEMBERS_HEADINGS = ["member", "section", "grade", "kind", "length [m]", "largest utilisation",
                    "status", "governing check (clause)", "governing combination",
                    "why not evaluated"]


def print_to_pdf(page: Path, tmp: Path) -> Path:
    pdf = tmp / f"{page.stem}.pdf"
    run_chromium(tmp, "--no-pdf-header-footer", f"--print-to-pdf={pdf}", page.as_uri())
    assert pdf.exists() and pdf.stat().st_size > 1000
    return pdf


def test_printed_report_cuts_nothing(report: Path, tmp_path: Path) -> None:
    pdf = print_to_pdf(report / "report.html", tmp_path)
    pages = pdf_pages(pdf, tmp_path)
    assert len(pages) > 1 and all(w > h for w, h in pages), "every page is landscape"
    text = pdf_text(pdf)
    for heading in MEMBERS_HEADINGS:  # every column of the members table, the last included
        assert heading.replace(" ", "") in text, heading
    stability = pd.read_csv(report / "stability.csv")
    for heading in stability.columns:  # the widest table: every column printed
        assert heading.replace(" ", "") in text, heading
    summary = pd.read_csv(report / "summary.csv")
    for member, combination in zip(summary["member"].astype(str),
                                   summary["governing_combination"].astype(str), strict=True):
        assert f"Calculationsheet:member{member}" in text
        assert combination.replace(" ", "") in text  # the last columns' content


def test_the_cut_check_sees_a_table_wider_than_the_page(report: Path, tmp_path: Path) -> None:
    """The check above can fail: a copy whose members table is forced wider than an A4 page and
    kept from wrapping loses its right-hand columns from the printed text."""
    wide = tmp_path / "wide"
    shutil.copytree(report, wide)
    page = wide / "report.html"
    page.write_text(page.read_text(encoding="utf-8").replace(
        "</style>", "@media print { #members-table { width: 3000px !important; "
                    "table-layout: auto !important; } #members-table td, #members-table th "
                    "{ white-space: nowrap; } }</style>"), encoding="utf-8")
    text = pdf_text(print_to_pdf(page, tmp_path))
    assert "whynotevaluated" not in text
