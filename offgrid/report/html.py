"""HTML rendering of the report: one self-contained file.

No external reference of any kind: the style sheet is inline, charts are inline
SVG, links are in-page anchors only.  The page prints on A4 and on Letter
(``@page`` margins that suit both; tables, charts and figure blocks are kept whole
across pages) and reads on a phone (viewport meta, fluid width, wide tables scroll
sideways in their own box).
"""

from __future__ import annotations

from html import escape

from offgrid.report.document import Bullets, Cell, Chart, Figures, Paragraph, Report, Table

CSS = """
:root { --ink: #1b1b1b; --muted: #555; --rule: #c9c9c9; --band: #f3f5f7; --warn: #8a4b00;
        --caution: #9b1c1c; --mark: #fff1b8; }
* { box-sizing: border-box; }
html { -webkit-text-size-adjust: 100%; text-size-adjust: 100%; }
body { margin: 0; color: var(--ink); background: #fff;
       font: 15px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial,
             sans-serif; }
main { max-width: 60rem; margin: 0 auto; padding: 1rem 1.25rem 3rem; }
h1 { font-size: 1.7rem; margin: .4rem 0 .2rem; }
h2 { font-size: 1.25rem; margin: 2rem 0 .6rem; padding-bottom: .2rem;
     border-bottom: 2px solid var(--ink); }
h3 { font-size: 1.05rem; margin: 1.2rem 0 .4rem; }
p { margin: .5rem 0; }
.subtitle { color: var(--muted); margin: 0 0 .5rem; }
.demo { display: inline-block; background: var(--mark); padding: .15rem .5rem;
        border: 1px solid #d8c36a; font-weight: 600; }
.meta { color: var(--muted); margin: .2rem 0; }
nav ol { columns: 2; padding-left: 1.4rem; margin: .4rem 0; }
nav a { color: inherit; }
.scroll { overflow-x: auto; -webkit-overflow-scrolling: touch; margin: .5rem 0; }
table { border-collapse: collapse; width: 100%; font-size: .9rem; }
th, td { padding: .25rem .45rem; border-bottom: 1px solid var(--rule); vertical-align: top;
         text-align: left; }
th { background: var(--band); font-weight: 600; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
td.nw { white-space: nowrap; }
#t-energy-by-month td:first-child, #t-supply-demand td:first-child { min-width: 9rem; }
td.diff { background: var(--mark); font-weight: 600; }
caption { caption-side: bottom; text-align: left; color: var(--muted); font-size: .82rem;
          padding-top: .3rem; }
.figs td.how { color: var(--muted); font-size: .84rem; }
.figs td.how b { color: var(--ink); font-weight: 600; }
.figs td.val { white-space: nowrap; text-align: right; font-weight: 600; }
figure { margin: 1rem 0; }
figure svg { display: block; width: 100%; max-width: 44rem; height: auto; }
figcaption { color: var(--muted); font-size: .84rem; }
pre { background: var(--band); padding: .5rem .7rem; overflow-x: auto; font-size: .8rem;
      line-height: 1.3; }
ul { padding-left: 1.3rem; }
ul.warning li { color: var(--warn); }
ul.caution li { color: var(--caution); font-weight: 600; }
footer { margin-top: 2.5rem; color: var(--muted); font-size: .8rem; }
@media (max-width: 40rem) {
  body { font-size: 14px; }
  main { padding: .6rem .7rem 2rem; }
  nav ol { columns: 1; }
  th, td { padding: .2rem .3rem; }
}
@page { margin: 14mm 12mm 16mm 12mm; }
@media print {
  body { font-size: 10pt; }
  main { max-width: none; padding: 0; }
  nav { display: none; }
  h2 { break-after: avoid; page-break-after: avoid; }
  h3 { break-after: avoid; page-break-after: avoid; }
  tr, figure, pre { break-inside: avoid; page-break-inside: avoid; }
  thead { display: table-header-group; }
  .scroll { overflow: visible; }
  section { break-before: auto; }
  figure svg { max-width: 170mm; }
  a { color: inherit; text-decoration: none; }
}
"""


def _e(text: str) -> str:
    return escape(text, quote=True)


def _td(cell: Cell, align: str, header: bool = False) -> str:
    cls = []
    if align == "r":
        cls.append("num")
        if len(cell.text) <= 16:
            cls.append("nw")
    if cell.mark:
        cls.append("diff")
    attrs = f' class="{" ".join(cls)}"' if cls else ""
    if cell.path:
        attrs += f' data-path="{_e(cell.path)}"'
    tag = "th" if header else "td"
    return f"<{tag}{attrs}>{_e(cell.text)}</{tag}>"


def _table(t: Table) -> str:
    num = ' class="num"'
    head = "".join(
        f'<th{num if t.alignment(i) == "r" else ""} scope="col">{_e(c)}</th>'
        for i, c in enumerate(t.columns)
    )
    body = []
    for row in t.rows:
        body.append("<tr>" + "".join(_td(c, t.alignment(i)) for i, c in enumerate(row)) + "</tr>")
    cap = f"<caption>{_e(t.caption)}</caption>" if t.caption else ""
    return (
        f'<div class="scroll"><table id="t-{_e(t.key)}">{cap}<thead><tr>{head}</tr></thead>'
        f"<tbody>{''.join(body)}</tbody></table></div>"
    )


def _figures(f: Figures) -> str:
    out = []
    if f.title:
        out.append(f"<h3>{_e(f.title)}</h3>")
    rows = []
    for item in f.items:
        how = []
        if item.formula:
            how.append(f"= {_e(item.formula)}")
        if item.inputs and item.listed:
            how.append(
                "<b>Inputs:</b><br>" + "<br>".join(f"{_e(k)}: {_e(v)}" for k, v in item.inputs)
            )
        elif item.inputs:
            how.append(
                "<b>Inputs:</b> "
                + "; ".join(f"{_e(k.replace('_', ' '))} {_e(v)}" for k, v in item.inputs)
            )
        if item.source:
            how.append(f"<b>Source:</b> {_e(item.source)}")
        path = f' data-path="{_e(item.cell.path)}"' if item.cell.path else ""
        rows.append(
            f'<tr><th scope="row">{_e(item.label)}</th>'
            f'<td class="val"{path}>{_e(item.cell.text)}</td>'
            f'<td class="how">{"<br>".join(how)}</td></tr>'
        )
    out.append(
        '<div class="scroll"><table class="figs"><thead><tr><th scope="col">Figure</th>'
        '<th class="num" scope="col">Value</th><th scope="col">How it follows</th></tr>'
        f"</thead><tbody>{''.join(rows)}</tbody></table></div>"
    )
    return "".join(out)


def _chart(c: Chart) -> str:
    cap = f"<figcaption>{_e(c.caption)}</figcaption>" if c.caption else ""
    if c.svg:
        return f'<figure id="c-{_e(c.key)}"><h3>{_e(c.title)}</h3>{c.svg}{cap}</figure>'
    text = _e("\n".join(c.text))
    return f'<figure id="c-{_e(c.key)}"><h3>{_e(c.title)}</h3><pre>{text}</pre>{cap}</figure>'


def render_html(report: Report) -> str:
    """The report as one self-contained HTML5 document."""
    parts = [
        "<!DOCTYPE html>",
        '<html lang="en">',
        "<head>",
        '<meta charset="utf-8">',
        '<meta name="viewport" content="width=device-width, initial-scale=1">',
        f"<title>{_e(report.title)}: design report</title>",
        f"<style>{CSS}</style>",
        "</head>",
        "<body>",
        "<main>",
        "<header>",
        f"<h1>{_e(report.title)}</h1>",
        f'<p class="subtitle">{_e(report.subtitle)}</p>',
    ]
    if report.demo:
        parts.append('<p class="demo">Demonstration data (invented scenario)</p>')
    for k, v in report.meta:
        parts.append(f'<p class="meta">{_e(k)}: {_e(v)}</p>')
    parts.append("</header>")
    parts.append('<nav aria-label="Contents"><h2>Contents</h2><ol>')
    for sec in report.sections:
        parts.append(f'<li><a href="#s-{_e(sec.key)}">{_e(sec.title)}</a></li>')
    parts.append("</ol></nav>")
    for n, sec in enumerate(report.sections, start=1):
        parts.append(f'<section id="s-{_e(sec.key)}"><h2>{n}. {_e(sec.title)}</h2>')
        for block in sec.blocks:
            if isinstance(block, Paragraph):
                parts.append(f"<p>{_e(block.text)}</p>")
            elif isinstance(block, Bullets):
                cls = f' class="{block.kind}"' if block.kind != "plain" else ""
                parts.append(
                    f"<ul{cls}>" + "".join(f"<li>{_e(i)}</li>" for i in block.items) + "</ul>"
                )
            elif isinstance(block, Table):
                parts.append(_table(block))
            elif isinstance(block, Figures):
                parts.append(_figures(block))
            elif isinstance(block, Chart):
                parts.append(_chart(block))
        parts.append("</section>")
    parts.append(
        "<footer>Made with offgrid. This design defers to local electrical codes and "
        "licensed practice.</footer>"
    )
    parts += ["</main>", "</body>", "</html>", ""]
    return "\n".join(parts)
