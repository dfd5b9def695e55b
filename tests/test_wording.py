"""Client-facing words for recalled values: what to confirm and where."""

from __future__ import annotations

from offgrid.design.sizing import design
from offgrid.paths import demo_project_path
from offgrid.project.store import load_project
from offgrid.wording import confirm_words


def test_recalled_values_say_what_to_confirm():
    assert confirm_words("IEC 62485-2:2010 eq. 1 and A = 28 Q, from memory") == (
        "IEC 62485-2:2010 eq. 1 and A = 28 Q; confirm against the current edition of IEC 62485-2"
    )
    assert confirm_words("typical service life (from memory).") == (
        "typical service life (confirm against the maker's datasheet)."
    )
    assert confirm_words("common practice, no source") == "common practice, no source"


def test_report_says_confirm_and_the_engine_keeps_from_memory():
    from offgrid.report.build import build_report
    from offgrid.report.text import render_text

    project = load_project(demo_project_path())
    d = design(project, demo_project_path().parent)
    assert any("from memory" in c for c in d.cautions)  # the stronger marking stays in code
    text = render_text(build_report(project, d, base=demo_project_path().parent, with_charts=False))
    assert "from memory" not in text
    assert "confirm against the current edition of IEC 62485-2" in text.replace("\n    ", " ")
