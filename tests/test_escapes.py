"""Names that carry terminal escapes, markup or spreadsheet formulas (issue 12).

A name is saved as typed; every output shows it harmlessly: terminals and report files get
no raw control character (ECMA-48 escapes: OSC 52 writes the clipboard, OSC 0 the window
title, CSI 2J clears the screen), Markdown gets no link or image, and CSV files get no
cell a spreadsheet runs as a formula (OWASP "CSV Injection": cells beginning with
``= + - @``, tab or carriage return get a leading apostrophe).
"""

from __future__ import annotations

import csv
import io
import re

import pytest

from offgrid.cli import main
from offgrid.project.loads_csv import loads_to_csv, read_loads_csv
from offgrid.project.model import PriceItem
from offgrid.project.store import save_project
from offgrid.safetext import csv_cell, csv_uncell, markdown_text, printable, visible
from tests.conftest import hand_project

OSC52 = "\x1b]52;c;cm0gLXJmIH4=\x07"  # writes "rm -rf ~" to the clipboard
TITLE = "\x1b]0;owned\x07"
CLEAR = "\x1b[2J\x1b[H"
#: any C0 control but newline and tab, DEL, or a C1 control (ECMA-48 section 5)
RAW_CONTROL = re.compile("[\x00-\x08\x0b-\x1f\x7f-\x9f]")


def hostile_project():
    p = hand_project()
    p.info.name = f"Clinic{TITLE}"
    p.site.name = f"Ridge{CLEAR}"
    p.loads[0].name = f"Lamp{OSC52}\nsecond line | [x](javascript:alert(1)) ![i](http://e/x.png)"
    p.loads[1].name = '=HYPERLINK("http://e","click")'
    p.prices = [PriceItem(part="module", unit_price=100.0, note="@SUM(A1:A9)")]
    return p


@pytest.fixture
def hostile(tmp_path):
    path = tmp_path / "hostile.toml"
    save_project(hostile_project(), path)
    return path


def run(capsys, *argv):
    try:
        code = main(list(argv))
    except SystemExit as exc:
        code = exc.code
    out, err = capsys.readouterr()
    return code, out, err


def test_size_summary_shows_escapes_visibly(hostile, capsys):
    code, out, err = run(capsys, "size", str(hostile))
    assert code == 0, err
    assert not RAW_CONTROL.search(out + err)
    assert "Clinic\u241b]0;owned\u2407" in out  # ESC and BEL as control pictures


@pytest.mark.parametrize("fmt", ["txt", "md", "html"])
def test_reports_hold_no_raw_control_bytes(hostile, tmp_path, capsys, fmt):
    code, out, err = run(capsys, "report", str(hostile), "--format", fmt, "--no-charts")
    assert code == 0, err
    assert not RAW_CONTROL.search(out), RAW_CONTROL.search(out)
    target = tmp_path / f"r.{fmt}"
    code, _, err = run(
        capsys,
        "report",
        str(hostile),
        "-o",
        str(target),
        "--no-charts",
        "--bom",
        str(tmp_path / f"b-{fmt}.csv"),
    )
    assert code == 0, err
    text = target.read_text(encoding="utf-8")
    assert not RAW_CONTROL.search(text)
    assert "\u241b" in text
    bom = (tmp_path / f"b-{fmt}.csv").read_text(encoding="utf-8")
    assert not RAW_CONTROL.search(bom)


def test_markdown_report_has_no_link_image_or_split_row(hostile, tmp_path, capsys):
    target = tmp_path / "r.md"
    code, _, err = run(capsys, "report", str(hostile), "-o", str(target), "--no-charts")
    assert code == 0, err
    md = target.read_text(encoding="utf-8")
    assert not re.search(r"(?<!\\)\]\(", md), "a link or image survived"
    assert "\\[x\\](javascript:alert(1))" in md
    row = next(line for line in md.splitlines() if "Lamp" in line and line.startswith("|"))
    assert "second line" in row  # the newline did not split the row
    assert "\\|" in row  # the pipe in the name does not add a column
    # CommonMark 2.4: a backslash before ASCII punctuation makes it a literal character
    assert markdown_text("![i](u)") == "!\\[i\\](u)"


def test_error_message_quoting_a_name_is_visible(tmp_path, capsys):
    p = hostile_project()
    p.loads[0].hours_per_day = 30.0  # out of range: the message quotes the load's name
    path = tmp_path / "bad.toml"
    save_project(p, path)
    code, _, err = run(capsys, "size", str(path))
    assert code == 2
    assert "hours_per_day" in err and "Lamp\u241b]52" in err
    assert not RAW_CONTROL.search(err) and "\n" not in err.split("(load '")[1].split("')")[0]


def test_load_list_export_neutralises_formulas_and_reads_back(tmp_path):
    loads = hostile_project().loads
    loads[0].name = "-2+3"
    text = loads_to_csv(loads)
    cells = [row[0] for row in csv.reader(io.StringIO(text))][1:]
    assert cells == ["'-2+3", '\'=HYPERLINK("http://e","click")']
    back = read_loads_csv(text)
    assert [ld.name for ld in back] == [ld.name for ld in loads]


def test_bom_and_price_template_csv_neutralise_formulas(hostile, tmp_path, capsys):
    code, out, err = run(capsys, "bom", str(hostile))
    assert code == 0, err
    for row in csv.reader(io.StringIO(out)):
        for cell in row:
            assert not cell.startswith(("=", "+", "@", "\t", "\r")), cell
            assert not cell.startswith("-") or re.fullmatch(r"-[\d.]+", cell), cell
    code, out, err = run(capsys, "prices", str(hostile), "--template")
    assert code == 0, err
    assert "'@SUM(A1:A9)" in out
    from offgrid.economics.prices import read_price_csv

    assert [p.note for p in read_price_csv(out) if p.part == "module"] == ["@SUM(A1:A9)"]


def test_plan_rows_csv_neutralises_formulas():
    from offgrid.plan.text import rows_csv

    class Row:
        line, id, name, kind, count, status, kit = 2, "=1+1", "@x", "household", 1, "ok", None
        design = tier = tier_served = oversize_array_pct = oversize_battery_pct = None
        unit_cost = None
        reason = "+danger"

    class Plan:
        rows, bad_rows, standard = [Row()], [], None

    rows = list(csv.reader(io.StringIO(rows_csv(Plan()))))
    assert rows[1][1:3] == ["'=1+1", "'@x"] and rows[1][-1] == "'+danger"


@pytest.mark.parametrize("text", ["=1", "'=1", "''+x", "-", "plain", "'quoted", "-5", "\t@"])
def test_csv_cell_round_trips(text):
    assert csv_uncell(csv_cell(text)) == text
    cell = csv_cell(text)
    assert cell == text or cell.startswith("'")


def test_visible_keeps_lines_printable_does_not():
    assert visible("a\x1b[2Jb\nc\td") == "a\u241b[2Jb\nc\td"
    assert printable("a\nb") == "a\u240ab"


def test_text_ui_refusing_a_project_at_start_shows_escapes_visibly(tmp_path, capsys):
    """``offgrid FILE`` prints the load problems before any screen opens."""
    p = hostile_project()
    p.loads[0].hours_per_day = 30.0
    path = tmp_path / "bad.toml"
    save_project(p, path)
    from offgrid.tui.launch import run as run_ui

    assert run_ui([str(path)]) == 2
    err = capsys.readouterr().err
    assert "hours_per_day" in err and not RAW_CONTROL.search(err)
    assert run_ui([f"--x{CLEAR}", "y"]) == 2
    assert not RAW_CONTROL.search(capsys.readouterr().err)


def test_plan_markdown_report_escapes_links_and_row_splits():
    # A survey row whose id carries a link, an image and a pipe, and a community name with a
    # newline: the plan's Markdown report shows them as text (issue 12, Markdown reports).
    from offgrid.paths import load_profiles_dir
    from offgrid.plan.community import plan_community
    from offgrid.plan.survey import read_survey
    from offgrid.plan.text import markdown_report

    lines = [
        "community,Hill | [x](javascript:alert(1)) (invented)",
        "climate,kisanga-ridge-demo",
        "project,kisanga-ridge-home-parts",
        "prices,kisanga-ridge-prices",
        "id,count,load_list,daily_energy_wh,peak_power_w,ac_dc",
        "![i](http://example.invalid/p.png),1,household-basic,,,",
        "A|B,1,,300,60,dc",
        "H3,1,,,,",
    ]
    plan = plan_community(
        read_survey("\n".join(lines) + "\n", base_dir=load_profiles_dir()), kits=1, jobs=1
    )
    md = markdown_report(plan)
    import re

    # no bracket left unescaped before a parenthesis: no link or image can form
    assert not re.search(r"(?<!\\)\]\(", md)
    assert not re.search(r"(?<!\\)!(?<!\\)\[", md)
    assert "\\[x\\]" in md  # shown as text
    for line in md.splitlines():
        if line.startswith("|"):  # every table row keeps its own cells
            assert "A|B" not in line
