"""The HTML report: well formed, self-contained, every section, printable and responsive."""

from __future__ import annotations

import re
from html.parser import HTMLParser

import pytest

from offgrid.report import make_report
from offgrid.report.build import SECTION_KEYS
from tests.report_helpers import demo

VOID = {
    "area",
    "base",
    "br",
    "col",
    "embed",
    "hr",
    "img",
    "input",
    "link",
    "meta",
    "source",
    "track",
    "wbr",
}


class _Checker(HTMLParser):
    """Tag balance (HTML void elements and self-closed SVG elements excepted), ids, attributes."""

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.stack: list[str] = []
        self.errors: list[str] = []
        self.ids: list[str] = []
        self.attrs: list[tuple[str, str, str]] = []
        self.tags: dict[str, int] = {}

    def handle_starttag(self, tag, attrs):
        self._attrs(tag, attrs)
        if tag not in VOID:
            self.stack.append(tag)

    def handle_startendtag(self, tag, attrs):
        self._attrs(tag, attrs)

    def _attrs(self, tag, attrs):
        self.tags[tag] = self.tags.get(tag, 0) + 1
        for k, v in attrs:
            self.attrs.append((tag, k, v or ""))
            if k == "id":
                self.ids.append(v or "")

    def handle_endtag(self, tag):
        if tag in VOID:
            return
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"</{tag}> closes <{self.stack[-1] if self.stack else '-'}>")
            if tag in self.stack:
                while self.stack and self.stack.pop() != tag:
                    pass
            return
        self.stack.pop()


@pytest.fixture(scope="module")
def html_text() -> str:
    project, base = demo()
    return make_report(project, base, "html")


@pytest.fixture(scope="module")
def checked(html_text) -> _Checker:
    c = _Checker()
    c.feed(html_text)
    c.close()
    return c


def test_html_parses_and_is_balanced(html_text, checked):
    assert html_text.startswith("<!DOCTYPE html>")
    assert not checked.errors, checked.errors[:5]
    assert not checked.stack, checked.stack
    assert len(checked.ids) == len(set(checked.ids)), "duplicate ids"


def test_html_holds_no_external_reference(html_text, checked):
    assert "http:" not in html_text and "https:" not in html_text
    assert "//" not in html_text
    assert "@import" not in html_text
    assert not re.search(r"url\((?!#)", html_text), "url() must only point inside the page"
    for tag, key, value in checked.attrs:
        assert key != "src", f"<{tag} src=...> loads a file"
        if key in ("href", "xlink:href"):
            assert value.startswith("#"), f"<{tag} {key}={value}> leaves the page"
    for tag in ("script", "link", "img", "iframe", "object", "embed"):
        assert tag not in checked.tags, f"<{tag}> in a self-contained report"


def test_html_has_every_section(checked):
    ids = set(checked.ids)
    # reliability appears once a simulation ran; the demo report is built without one
    for key in SECTION_KEYS:
        if key == "reliability":
            continue
        assert f"s-{key}" in ids, f"section {key} missing"


def test_html_charts_are_inline_svg(html_text, checked):
    assert checked.tags.get("svg", 0) >= 1
    assert "<?xml" not in html_text and "<!DOCTYPE svg" not in html_text
    assert 'id="c-supply-demand"' in html_text


def test_html_prints_on_a4_and_letter_and_reads_on_a_phone(html_text):
    assert '<meta name="viewport" content="width=device-width, initial-scale=1">' in html_text
    assert "@page" in html_text and "@media print" in html_text
    # no fixed page size: the browser's paper (A4 or Letter) is used, and margins of 12-16 mm
    # leave 186 mm on A4 and 191 mm on Letter; no element is wider than that in print
    assert not re.search(r"@page\s*{[^}]*size:", html_text)
    m = re.search(r"figure svg \{ max-width: (\d+)mm", html_text)
    assert m and int(m.group(1)) <= 186
    assert "@media (max-width:" in html_text  # the phone layout
    assert "overflow-x: auto" in html_text  # wide tables scroll in their own box


def test_html_states_the_code_deferral(html_text):
    assert "defers to local electrical codes and licensed practice" in html_text


def _quick(csv_path):
    from offgrid.climate.files import load_climate
    from offgrid.project.loads_csv import load_loads_csv
    from offgrid.project.model import ClimateChoice, Project, ProjectInfo, Site

    climate = load_climate("kisanga-ridge-demo")
    return Project(
        info=ProjectInfo(name=f"Demo: {csv_path.stem}", demo=True),
        site=Site(name="Kisanga Ridge (demo)", latitude_deg=climate.latitude_deg),
        climate=ClimateChoice(ref="kisanga-ridge-demo"),
        loads=load_loads_csv(csv_path),
    )


@pytest.mark.parametrize(
    "name", ["household-kit", "primary-school", "radio-repeater", "rural-clinic", "water-pump"]
)
def test_every_demo_load_list_gives_a_complete_report(name):
    from offgrid.paths import load_profiles_dir

    project = _quick(load_profiles_dir() / f"{name}.csv")
    html = make_report(project, None, "html", with_charts=False)
    c = _Checker()
    c.feed(html)
    assert not c.errors and not c.stack
    for key in SECTION_KEYS:
        if key in ("reliability", "variants"):  # no simulation, no variants in these
            continue
        assert f'id="s-{key}"' in html, (name, key)
    text = make_report(project, None, "txt")
    assert max(len(line) for line in text.splitlines()) <= 80


def test_simulated_report_has_reliability_and_its_charts():
    project, base = demo()
    html = make_report(project, base, "html", simulate=True, years=5, with_variants=False)
    c = _Checker()
    c.feed(html)
    assert not c.errors and not c.stack
    for key in SECTION_KEYS:
        if key != "variants":
            assert f'id="s-{key}"' in html, key
    assert 'id="c-soc"' in html and 'id="c-tradeoff"' in html
    assert c.tags.get("svg", 0) >= 3
    assert "http:" not in html and "//" not in html
    assert "synthetic weather" in html  # the simulation's caution is carried over
