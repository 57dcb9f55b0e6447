"""The project report's HTML without a browser: self-contained, complete, accessible, safe to write.

The browser checks (screenshot, rendered text, network, PDF) live in test_report_browser.py.
"""

from __future__ import annotations

import re
from types import SimpleNamespace

import pytest
from conftest import DEMO
from typer.testing import CliRunner

from carbonledger import api
from carbonledger.about import CAUTION
from carbonledger.cli import app
from carbonledger.io.labels import stage_name, words
from carbonledger.io.report import ProjectReport, render_report, status_of

BLUE = DEMO / "blue_atr_ammonia.toml"


def run(*args, env=None):
    """The command line in-process (typer's CliRunner), as a process-like result: returncode, stdout, stderr."""
    result = CliRunner().invoke(app, [str(a) for a in args], env=env)
    return SimpleNamespace(returncode=result.exit_code, stdout=result.stdout, stderr=result.stderr)


def assert_one_line_error(process, *words_in_line):
    assert process.returncode == 2, process.stderr
    assert "Traceback" not in process.stderr
    lines = [line for line in process.stderr.splitlines() if line.strip()]
    assert len(lines) == 1 and lines[0].startswith("error: "), process.stderr
    for word in words_in_line:
        assert word in lines[0], (word, lines[0])


@pytest.fixture(scope="module")
def blue():
    items = api.report_items([BLUE])
    return items, render_report(items, generated="2026-12-01", caution=CAUTION)


def test_self_contained_nothing_to_fetch(blue):
    _, page = blue
    assert "<script" not in page and "<link" not in page and "@import" not in page and "url(" not in page
    assert not re.search(r"""\b(src|href|srcset|poster|data)\s*=\s*["']?\s*(https?:)?//""", page, re.I)


def test_contents_every_figure_a_reader_needs(blue):
    items, page = blue
    result = items[0].result
    plain = re.sub(r"<[^>]+>", "", page)
    assert result.project in plain
    assert result.factor_set.name in plain and result.factor_set.sha256 in plain
    assert f"version {result.carbonledger_version}" in plain and "2026-12-01" in plain
    assert plain.count(CAUTION) >= 2  # at a glance and at the end
    for check in result.checks:
        assert check.name in plain
    for factor in result.factors_used:
        assert factor.id in plain
    # every parameter outside [project] is listed with its unit
    for path, _, _unit, _ in items[0].inputs:
        if not path.startswith("project."):
            assert path in plain
    # the ATR demo uses grid and wind electricity: both show in the stage table by name
    assert "Electricity supply" in plain and "CO2 capture and storage" in plain


def test_waterfall_steps_add_up_to_the_total(blue):
    """A waterfall's steps end where the next begins, and the last ends at the total bar
    (conservation of the stage contributions: by_stage sums to the total)."""
    items, page = blue
    waterfall = re.search(r'<svg[^>]*aria-labelledby="p1-wf-t.*?</svg>', page, re.S).group(0)
    bars = [(float(x), float(w)) for x, w in re.findall(r'<rect x="([\d.]+)" y="[\d.]+" width="([\d.]+)" height="20" fill', waterfall)]
    total_x, total_w = (float(v) for v in re.search(r'<rect x="([\d.]+)" y="[\d.]+" width="([\d.]+)" height="\d+" class="total-bar"', waterfall).groups())
    nonzero = [(x, w) for x, w in bars if w > 1.3]
    assert len(nonzero) >= 4
    assert nonzero[0][0] == pytest.approx(total_x, abs=0.11)
    for (x1, w1), (x2, _) in zip(nonzero, nonzero[1:], strict=False):
        assert x1 + w1 == pytest.approx(x2, abs=0.2)  # all blue-ammonia stages are emissions (>= 0)
    assert nonzero[-1][0] + nonzero[-1][1] == pytest.approx(total_x + total_w, abs=0.3)


def test_status_and_reasons_when_the_verdict_rules_give_them(blue):
    items, _ = blue
    check = items[0].result.checks[0]
    assert status_of(check) == check.status and check.passes == (check.status == "qualifies")  # the verdict rules give the status
    richer = SimpleNamespace(**{**check.model_dump(), "status": "not_eligible", "reasons": ["natural gas with capture is not a renewable fuel of non-biological origin"]})
    result = items[0].result.model_copy(update={"checks": [richer]})  # no validation: a Check with status and reasons
    page = render_report([ProjectReport(result, items[0].inputs)], generated="2026-12-01", caution=CAUTION)
    assert 'class="badge off">not eligible<' in page
    assert "natural gas with capture is not a renewable fuel of non-biological origin" in page


def test_names_in_words():
    assert stage_name("co2_capture_and_storage") == "CO2 capture and storage"
    assert words("hydrogen_production") == "Hydrogen production"


def test_folder_gives_one_section_per_project_and_a_contents_table():
    items = api.report_items([DEMO / "portfolio"])
    page = render_report(items, generated="2026-12-01", caution=CAUTION)
    assert len(items) == 2 and all(item.lifetime is not None for item in items)
    assert page.count('<article class="project"') == 2
    assert "Projects in this report" in page and 'href="#p2"' in page
    assert page.count("Over the operating life") == 2


def test_command_writes_atomically_and_refuses_to_overwrite(tmp_path):
    out = tmp_path / "report.html"
    first = run("report", BLUE, "-o", out)
    assert first.returncode == 0, first.stderr
    assert out.read_text(encoding="utf-8").startswith("<!DOCTYPE html>")
    out.write_text("kept", encoding="utf-8")
    assert_one_line_error(run("report", BLUE, "-o", out), "--force")
    assert out.read_text(encoding="utf-8") == "kept"
    assert run("report", BLUE, "-o", out, "--force").returncode == 0
    assert out.read_text(encoding="utf-8") != "kept"
    assert not list(tmp_path.glob(".*.part"))


def test_command_bad_inputs_one_line(tmp_path, write_project):
    out = tmp_path / "r.html"
    assert_one_line_error(run("report", tmp_path / "missing.toml", "-o", out), "missing.toml")
    bad = write_project('[project]\nname = "x"\nproduct = "steel"\n')
    assert_one_line_error(run("report", bad, "-o", out), "product")
    assert_one_line_error(run("report", BLUE, "-o", tmp_path / "r.txt"), "--output", ".html")
    assert_one_line_error(run("report", BLUE, "-o", out, "--paper", "a3"), "--paper")
    assert not out.exists()


def test_pdf_without_chromium_is_one_line(tmp_path):
    import os

    env = {**os.environ, "CARBONLEDGER_CHROMIUM": str(tmp_path / "no-such-browser")}
    out, pdf = tmp_path / "r.html", tmp_path / "r.pdf"
    assert_one_line_error(run("report", BLUE, "-o", out, "--pdf", pdf, env=env), "--pdf", "Chromium")
    assert not pdf.exists() and not out.exists()


def test_score_chart_png_and_svg(tmp_path):
    png, svg = tmp_path / "grey.png", tmp_path / "grey.svg"
    shipped = DEMO / "grey_smr_ammonia_shipped.toml"
    assert run("score", shipped, "--no-ledger", "--chart", png).returncode == 0
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"  # the PNG signature (ISO/IEC 15948, 5.2)
    assert run("score", shipped, "--no-ledger", "--chart", svg).returncode == 0
    drawing = svg.read_text(encoding="utf-8")
    result = api.score(shipped)
    for stage in result.by_stage:
        assert stage_name(stage) in drawing  # labels in words, not identifiers
    for check in result.checks:
        assert check.name in drawing
    assert "Shipping" in drawing and "_" not in re.sub(r"<[^>]*>", "", drawing).replace("__", "")
    png.write_bytes(b"kept")
    assert_one_line_error(run("score", shipped, "--no-ledger", "--chart", png), "--force")
    assert png.read_bytes() == b"kept"
    assert_one_line_error(run("score", shipped, "--no-ledger", "--chart", tmp_path / "c.pdf"), "--chart", ".png or .svg")


@pytest.mark.parametrize("name", ["grey_smr_ammonia_shipped.toml", "green_hydrogen_piped_and_trucked.toml", "hybrid_hourly_hydrogen.toml"])
def test_report_figures_are_the_score_figures(name):
    """The report solves with the stacked numpy solver; bw2calc (through `score`, with the time
    series matched as `score` matches it) must give the same figures to 1e-9."""
    item = api.report_items([DEMO / name], draws=50)[0]
    scored = api.score(DEMO / name)
    assert item.result.total == pytest.approx(scored.total, rel=1e-9)
    for stage, value in scored.by_stage.items():
        assert item.result.by_stage[stage] == pytest.approx(value, rel=1e-9, abs=1e-12)
    assert [(c.scheme, c.status) for c in item.result.checks] == [(c.scheme, c.status) for c in scored.checks]
    for mine, theirs in zip(item.result.checks, scored.checks, strict=True):
        assert mine.value == pytest.approx(theirs.value, rel=1e-9)


def test_spread_section_only_with_uncertainty_and_the_seed_is_stated(tmp_path):
    """The Monte Carlo section follows the project's [uncertainty] table, with the draws and seed
    asked for on the command line (the same seed gives the same draws: a rerun gives the same page)."""
    plain = run("report", BLUE, "-o", tmp_path / "blue.html")
    assert plain.returncode == 0, plain.stderr
    assert "How sure" not in (tmp_path / "blue.html").read_text(encoding="utf-8")
    hourly = DEMO / "hybrid_hourly_hydrogen.toml"
    pages = []
    for number in (1, 2):
        done = run("report", hourly, "-o", tmp_path / f"hourly{number}.html", "--draws", 300, "--seed", 11, env={"SOURCE_DATE_EPOCH": "1764633600"})
        assert done.returncode == 0, done.stderr
        pages.append((tmp_path / f"hourly{number}.html").read_text(encoding="utf-8"))
    assert pages[0] == pages[1]
    assert "<strong>300 draws</strong>" in pages[0] and "<strong>seed 11</strong>" in pages[0]
    assert "Hour by hour: matching the electricity" in pages[0]


# --- issue 19: a report read at a glance ---------------------------------------------------------

FONT_PX = {"label": 13.0, "value": 12.5, "note": 11.5, "tick": 11.0}  # the report's stylesheet (svg .label, .value, .note, .tick)


@pytest.fixture(scope="module")
def hourly():
    items = api.report_items([DEMO / "hybrid_hourly_hydrogen.toml"], draws=500, seed=7)
    return items, render_report(items, generated="2026-12-01", caution=CAUTION)


@pytest.fixture(scope="module")
def portfolio():
    items = api.report_items([DEMO / "portfolio"])
    return items, render_report(items, generated="2026-12-01", caution=CAUTION)


def text_boxes(svg: str) -> list[tuple[str, float, float, float, float]]:
    """Every <text> of an SVG as (text, left, top, right, bottom), its width estimated as 0.6 em per
    character (wider than the average glyph of a sans-serif face, so the estimate errs towards overlap)."""
    boxes = []
    for attributes, content in re.findall(r"<text ([^>]*)>(.*?)</text>", svg, re.S):
        x, y = float(re.search(r'\bx="([-\d.]+)"', attributes).group(1)), float(re.search(r'\by="([-\d.]+)"', attributes).group(1))
        kind = next((k for k in FONT_PX if re.search(rf'class="[^"]*\b{k}\b', attributes)), "label")
        size = FONT_PX[kind]
        label = re.sub(r"<[^>]+>", "", content)
        width = 0.6 * size * len(label)
        anchor = re.search(r'text-anchor="(\w+)"', attributes)
        left = x - width if anchor and anchor.group(1) == "end" else x - width / 2 if anchor and anchor.group(1) == "middle" else x
        boxes.append((label, left, y - 0.8 * size, left + width, y + 0.2 * size))
    return boxes


@pytest.mark.parametrize("case", ["blue", "hourly", "portfolio"])
def test_no_label_is_drawn_over_another(case, request):
    """Two text boxes of one chart never overlap (each chart's <text> elements, estimated boxes)."""
    _, page = request.getfixturevalue(case)
    charts = re.findall(r"<svg\b.*?</svg>", page, re.S)
    assert charts
    for chart in charts:
        title = re.search(r"<title[^>]*>(.*?)</title>", chart).group(1)
        boxes = text_boxes(chart)
        for i, a in enumerate(boxes):
            for b in boxes[i + 1:]:
                overlap = min(a[3], b[3]) - max(a[1], b[1]) > 0.5 and min(a[4], b[4]) - max(a[2], b[2]) > 0.5
                assert not overlap, (title, a, b)


@pytest.mark.parametrize("case", ["blue", "hourly", "portfolio"])
def test_no_none_and_ticks_in_plain_numbers(case, request):
    _, page = request.getfixturevalue(case)
    plain = re.sub(r"<[^>]+>", " ", page)
    assert not re.search(r"\bNone\b", plain)
    assert not re.search(r"\bnan\b|\binf\b", plain)
    ticks = re.findall(r'<text [^>]*class="tick"[^>]*>(.*?)</text>', page)
    assert ticks
    for tick in ticks:  # a plain number: no trailing zeros after the point (14,900 not 14,900.0; 0 not 0.000), or a percentage, hour or month
        assert re.fullmatch(r"\u2212?\d{1,3}(,\d{3})*(\.\d*[1-9])?|\d+%|\d\d:00|[A-Z][a-z]{2} \d\d|\d{4}", tick) or re.search(r"\.\d*[1-9]$", tick), tick


def test_at_a_glance_one_row_per_scheme_with_its_deciding_reason(blue):
    items, page = blue
    glance = re.search(r'<section class="sheet" id="p1-glance".*?</section>', page, re.S).group(0)
    checks = items[0].result.checks
    assert glance.count('<tr class="verdict">') == len(checks) and glance.count('<tr class="why">') == len(checks)
    for check in checks:
        first = check.reasons[0]
        result, rule = first.split(": ", 1)
        assert result in ("met", "not met", "cannot be judged", "note")
        # the deciding reason is the first one, in one line, without its source
        shown = re.sub(r"<[^>]+>", "", re.search(rf'<td colspan="6" class="deciding" title="{re.escape(first[:30])}[^"]*">(.*?)</td>', glance.replace("&#x27;", "'"), re.S).group(1))
        assert shown.startswith(result + ":") and "[" not in shown
    assert "rules read on the dates of" in glance  # the assessment year


def test_against_each_scheme_reasons_are_a_table_citing_each_source_once(blue):
    items, page = blue
    schemes = re.search(r'<section class="sheet flows" id="p1-schemes".*?</section>', page, re.S).group(0)
    tables = re.findall(r'<table class="reasons">.*?</table>', schemes, re.S)
    checks = items[0].result.checks
    assert len(tables) == len(checks)
    for check, table in zip(checks, tables, strict=True):
        assert "<th scope=\"col\">Rule</th>" in table and "Result" in table and "Article" in table
        sources = {reason.rsplit("[", 1)[1].rstrip("]") if reason.endswith("]") else "" for reason in check.reasons}
        cells = re.findall(r'<td class="src" rowspan="\d+" title="([^"]*)"', table)
        assert len(cells) == len(set(cells)) == len(sources)  # each source once, however many rules rest on it
