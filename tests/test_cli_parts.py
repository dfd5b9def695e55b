"""``offgrid parts``: list, show, template, import, best (and --take), bom."""

from __future__ import annotations

import csv
import io
import shutil

import pytest

from offgrid.cli import main
from offgrid.design.sizing import design
from offgrid.project.store import load_project
from offgrid.stock.catalogue import (
    bundled_catalogue_dir,
    load_catalogue,
    template_csv,
    user_catalogue_dir,
)


def run(capsys, *args):
    try:
        code = main(list(args))
    except SystemExit as exc:
        code = exc.code
    out = capsys.readouterr()
    return code, out.out, out.err


def test_list_and_show_the_demonstration_catalogue(capsys):
    code, out, err = run(capsys, "parts", "list", "--kind", "controllers")
    assert code == 0 and "bundled demonstration catalogue" in err
    assert "Invented MPPT 150 V 60 A (demo): 320 USD  [invented]" in out
    code, out, _ = run(capsys, "parts", "show", "Invented 1000 W 48 V inverter (demo)")
    assert code == 0 and "surge_w: 2000.0" in out and "dc_voltage_v: 48" in out
    code, _, err = run(capsys, "parts", "show", "No such part")
    assert code == 2 and "offgrid parts list" in err


def test_template_then_import_reports_bad_rows_and_refuses_duplicates(capsys, tmp_path):
    code, out, _ = run(capsys, "parts", "template", "modules")
    assert code == 0 and out == template_csv("modules")
    good = "Shop module,300,32.5,9.23,39.8,9.75,0.05,-0.3,-0.4,60,1.63,45,99,USD,shop,\n"
    bad = "Broken module,300,32.5,9.23,39.8,9.75,0.05,-0.3,-0.4,sixty,1.63,45,99,USD,,\n"
    src = tmp_path / "modules.csv"
    src.write_text(out + good + bad)
    code, _, err = run(capsys, "parts", "import", str(src))
    assert code == 0
    assert "line 3, cells_in_series: 'sixty'" in err and "1 modules added" in err
    cat = load_catalogue(user_catalogue_dir())
    assert [p.name for p in cat.of("modules")] == ["Shop module"]
    code, _, err = run(capsys, "parts", "import", str(src))
    assert code == 2 and "already in your catalogue" in err
    other = tmp_path / "stock.csv"
    other.write_text(out + good)
    code, _, err = run(capsys, "parts", "import", str(other))
    assert code == 2 and "--kind" in err


@pytest.mark.slow
def test_best_take_saves_a_project_that_stands_alone(capsys, tmp_path, monkeypatch):
    out_file = tmp_path / "kit.toml"
    code, out, err = run(
        capsys, "parts", "best", "--demo", "--top", "2", "--take", "1", "-o", str(out_file)
    )
    assert code == 0, err
    assert out.startswith("Combinations tried: ")
    assert "Cheapest by capital:" in out and "Rejected, by reason:" in out
    taken = load_project(out_file)
    rec = taken.extra["stock"]
    first = out.split("Cheapest by capital:\n")[1].splitlines()[0]
    assert rec["module"]["name"] in first and rec["inverter"]["name"] in first
    assert taken.module.name == rec["module"]["name"]
    assert taken.module.pmax_w == rec["module"]["pmax_w"]
    assert taken.controller.max_current_a == rec["controller"]["max_current_a"]
    # reopens and designs with no catalogue at all (the bundled one moved away)
    monkeypatch.setattr("offgrid.stock.catalogue.bundled_catalogue_dir", lambda: tmp_path / "gone")
    d = design(taken, out_file.parent)
    assert d.array.module_count > 0
    code, text, err = run(capsys, "parts", "bom", str(out_file))
    assert code == 0
    rows = list(csv.reader(io.StringIO(text)))
    keys = [r[0] for r in rows]
    assert f"inverter:{rec['inverter']['name']}" in keys
    module_row = rows[keys.index(f"module:{rec['module']['name']}")]
    # the demo catalogue's rates.csv: 1 EUR = 1.08 USD (invented rate)
    rate = {"USD": 1.0, "EUR": 1.08}[rec["module"]["currency"]]
    assert float(module_row[-3]) == pytest.approx(round(rec["module"]["price"] * rate, 2))
    assert rows[-1][0] == "total" and "line(s) have no price" in err


def test_bom_of_the_demo_writes_a_file(capsys, tmp_path):
    out_file = tmp_path / "kit.csv"
    code, _, err = run(capsys, "parts", "bom", "--demo", "-o", str(out_file))
    assert code == 0 and "wrote" in err
    text = out_file.read_text()
    assert "surge-protector:DC" in text and "caution:grounding" in text


def test_catalogue_folder_option(capsys, tmp_path):
    folder = tmp_path / "cat"
    shutil.copytree(bundled_catalogue_dir(), folder)
    (folder / "inverters.csv").write_text("name,continuous_w\nx,1\n")
    code, out, err = run(capsys, "parts", "list", "--catalogue", str(folder))
    assert code == 0 and "inverters (0)" in out and "lacks the column(s)" in err
    code, _, err = run(capsys, "parts", "list", "--catalogue", str(tmp_path / "none"))
    assert code == 2 and "is not a folder" in err


def test_bad_stock_settings_are_refused_with_the_key(capsys, tmp_path):
    from offgrid.paths import demo_project_path

    text = demo_project_path().read_text() + '\n[stock]\nmounting = "pole"\n'
    src = tmp_path / "p.toml"
    src.write_text(text)
    code, _, err = run(capsys, "parts", "bom", str(src))
    assert code == 2 and "stock.mounting: 'pole' is not one of: ground, roof" in err


def test_names_with_terminal_escapes_are_shown_literally(capsys, tmp_path):
    folder = tmp_path / "cat"
    shutil.copytree(bundled_catalogue_dir(), folder)
    mods = (folder / "modules.csv").read_text().splitlines()
    evil = mods[1].replace("Invented 36-cell 150 W module (demo)", "Evil \x1b[31mred\x1b[0m")
    (folder / "modules.csv").write_text("\n".join([mods[0], evil]) + "\n")
    code, out, _ = run(capsys, "parts", "list", "--kind", "modules", "--catalogue", str(folder))
    assert code == 0 and "\x1b" not in out and "Evil" in out


def test_best_as_json_counts_add_up(capsys):
    import json

    code, out, _ = run(capsys, "parts", "best", "--demo", "--json", "--top", "3")
    assert code == 0
    data = json.loads(out)
    rejected = sum(v["count"] for v in data["rejected"].values())
    assert data["tried"] == data["meet_design"] + rejected == 4 * 5 * 4 * 4
    caps = [x["capital"] for x in data["by_capital"]]
    assert caps == sorted(caps) and len(caps) == 3
    assert all(v["example"] for v in data["rejected"].values())


def test_import_never_drops_rows_your_catalogue_cannot_read(capsys, tmp_path):
    user_catalogue_dir().mkdir(parents=True)
    mine = user_catalogue_dir() / "modules.csv"
    head = template_csv("modules")
    mine.write_text(head + "Half typed,300,,,,,,,,,,,,,,\n")
    src = tmp_path / "modules.csv"
    src.write_text(head + "Shop module,300,32.5,9.23,39.8,9.75,0.05,-0.3,-0.4,60,1.63,45,,,,\n")
    code, _, err = run(capsys, "parts", "import", str(src))
    assert code == 2 and "fix them first" in err and "line 2, vmp_v" in err
    assert "Half typed" in mine.read_text()
