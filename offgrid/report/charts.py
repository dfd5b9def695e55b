"""Report charts drawn with matplotlib as inline SVG (no external reference).

matplotlib is imported only here and only when a chart is drawn (it costs about
0.3 s to import), with the Agg backend so no display is needed.  Text stays text
(``svg.fonttype = 'none'``) and ids are salted with a fixed string, so the same
design gives the same SVG.  The XML prolog, the DOCTYPE, the namespace
declarations and the metadata block (which all carry web addresses) are removed:
HTML5 inline SVG needs none of them.
"""

from __future__ import annotations

import io
import itertools
import re
from collections.abc import Sequence
from typing import Any

MONTHS = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
#: Colours (colour-blind safe pair from the Okabe-Ito set, plus greys).
DEMAND = "#d55e00"
SUPPLY = "#0072b2"
ACCENT = "#009e73"
GREY = "#666666"

_pyplot = None


def _plt():
    """matplotlib.pyplot on the Agg backend, imported on first use (late import: start-up)."""
    global _pyplot
    if _pyplot is None:
        import matplotlib

        matplotlib.use("Agg", force=True)
        import matplotlib.pyplot as plt

        _pyplot = plt
    return _pyplot


_STYLE = {
    "svg.fonttype": "none",
    "svg.hashsalt": "offgrid-report",
    "font.family": "sans-serif",
    "font.size": 9.0,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "axes.grid": True,
    "grid.color": "#dddddd",
    "grid.linewidth": 0.6,
    "axes.axisbelow": True,
    "legend.frameon": False,
}


def _slug(text: str) -> str:
    """A short id prefix from a chart title: the initials of its words."""
    return "g" + "".join(w[0] for w in re.findall(r"[a-z0-9]+", text.lower()))


def clean_svg(svg: str) -> str:
    """SVG text fit to sit inside HTML: no prolog, DOCTYPE, metadata or namespace addresses."""
    svg = re.sub(r"<\?xml[^>]*\?>\s*", "", svg)
    svg = re.sub(r"<!DOCTYPE[^>]*>\s*", "", svg)
    svg = re.sub(r"<metadata>.*?</metadata>\s*", "", svg, flags=re.S)
    svg = re.sub(r'\s+xmlns(:\w+)?="[^"]*"', "", svg)
    svg = re.sub(r"<!--.*?-->\s*", "", svg, flags=re.S)
    # fixed pixel size -> scalable: keep the viewBox, let CSS set the width
    svg = re.sub(r'(<svg[^>]*?)\s+width="[^"]*"\s+height="[^"]*"', r"\1", svg, count=1)
    if re.search(r"https?:|//|url\((?!#)|href=\"(?!#)", svg):
        raise ValueError("a chart still holds an external reference")
    return svg.strip()


def prefix_ids(svg: str, prefix: str) -> str:
    """Give every id of one chart a prefix (and every reference to it), so several charts
    can share a page without their clip paths and glyphs colliding."""
    ids = set(re.findall(r'\bid="([^"]+)"', svg))
    if not ids:
        return svg

    def ref(m: re.Match) -> str:
        name = m.group(2)
        return f"{m.group(1)}{prefix}-{name}" if name in ids else m.group(0)

    svg = re.sub(r'(\bid=")([^"]+)', lambda m: f"{m.group(1)}{prefix}-{m.group(2)}", svg)
    return re.sub(r'(url\(#|href="#)([^)"]+)', ref, svg)


def _to_svg(fig: Any, title: str) -> str:
    plt = _plt()
    buf = io.StringIO()
    fig.savefig(
        buf,
        format="svg",
        bbox_inches="tight",
        metadata={"Creator": None, "Date": None, "Format": None, "Type": None},
    )
    plt.close(fig)
    svg = prefix_ids(clean_svg(buf.getvalue()), _slug(title))
    label = title.replace("&", "and").replace("<", "").replace(">", "").replace('"', "")
    return svg.replace("<svg", f'<svg role="img" aria-label="{label}"', 1)


def supply_demand_svg(
    demand_wh_day: Sequence[float],
    supply_wh_day: Sequence[float],
    design_month: int,
    title: str = "Supply and demand by month",
    others: Sequence[tuple[str, Sequence[float]]] = (),
) -> str:
    """Bars of daily demand at the battery, line of array supply; the design month marked."""
    plt = _plt()
    with plt.rc_context(_STYLE):
        fig, ax = plt.subplots(figsize=(6.4, 2.9))
        x = range(12)
        bars = ax.bar(
            x,
            [v / 1000.0 for v in demand_wh_day],
            color=DEMAND,
            alpha=0.75,
            width=0.6,
            label="Demand at the battery",
        )
        bars[design_month - 1].set_edgecolor("black")
        bars[design_month - 1].set_linewidth(1.2)
        ax.plot(
            list(x),
            [v / 1000.0 for v in supply_wh_day],
            color=SUPPLY,
            marker="o",
            linewidth=1.8,
            markersize=4,
            label="Array supply to the battery",
        )
        for (label, values), colour, style in zip(
            others, (ACCENT, GREY), ("--", ":"), strict=False
        ):
            ax.plot(
                list(x),
                [v / 1000.0 for v in values],
                color=colour,
                linestyle=style,
                linewidth=1.4,
                label=label,
            )
        ax.set_xticks(list(x), MONTHS)
        ax.set_ylabel("kWh per day")
        ax.set_ylim(bottom=0)
        top = (
            max(max(demand_wh_day), max(supply_wh_day), *(max(vals) for _, vals in others)) / 1000.0
        )
        ax.annotate(
            "design month",
            (design_month - 1, demand_wh_day[design_month - 1] / 1000.0 + top * 0.03),
            ha="center",
            fontsize=8,
            color=GREY,
        )
        ax.set_ylim(0, top * 1.15)
        ax.legend(loc="upper center", bbox_to_anchor=(0.5, -0.1), ncols=2, fontsize=8)
        return _to_svg(fig, title)


def iv_pv_svg(
    voltage_v: Sequence[float],
    current_a: Sequence[float],
    mpp: tuple[float, float],
    operating: tuple[float, float] | None,
    operating_label: str = "PWM operating point",
    title: str = "I-V and P-V curves in the design month",
) -> str:
    """Current and power against voltage, with the maximum power point and an operating point."""
    plt = _plt()
    v = [float(a) for a in voltage_v]
    i = [max(0.0, float(a)) for a in current_a]
    p = [a * b for a, b in zip(v, i, strict=True)]
    with plt.rc_context(_STYLE):
        fig, ax = plt.subplots(figsize=(6.4, 3.0))
        ax.plot(v, i, color=SUPPLY, linewidth=1.8, label="current")
        ax.set_xlabel("voltage (V)")
        ax.set_ylabel("current (A)", color=SUPPLY)
        ax.set_xlim(0, max(v) * 1.02)
        ax.set_ylim(0, max(i) * 1.12)
        ax2 = ax.twinx()
        ax2.spines["right"].set_visible(True)
        ax2.grid(False)
        ax2.plot(v, p, color=DEMAND, linewidth=1.5, linestyle="--", label="power")
        ax2.set_ylabel("power (W)", color=DEMAND)
        ax2.set_ylim(0, max(p) * 1.12)
        vm, im = mpp
        handles = [
            ax.plot(
                [vm],
                [im],
                "o",
                color="black",
                markersize=5,
                label=f"MPP {vm:.1f} V, {vm * im:.0f} W",
            )[0]
        ]
        ax2.plot([vm], [vm * im], "o", color="black", markersize=5)
        if operating is not None:
            vo, io_ = operating
            handles.append(
                ax.plot(
                    [vo],
                    [io_],
                    "s",
                    color=ACCENT,
                    markersize=5,
                    label=f"{operating_label} {vo:.1f} V, {vo * io_:.0f} W",
                )[0]
            )
            ax2.plot([vo], [vo * io_], "s", color=ACCENT, markersize=5)
        ax.legend(
            handles=handles,
            loc="center left",
            bbox_to_anchor=(0.02, 0.6),
            fontsize=8,
            framealpha=0.9,
            frameon=True,
        )
        return _to_svg(fig, title)


def histogram_svg(
    edges: Sequence[float],
    share: Sequence[float],
    xlabel: str,
    title: str = "State-of-charge distribution",
) -> str:
    """Bars of the share of time [%] in each bin between ``edges``."""
    plt = _plt()
    with plt.rc_context(_STYLE):
        fig, ax = plt.subplots(figsize=(6.4, 2.6))
        widths = [b - a for a, b in itertools.pairwise(edges)]
        ax.bar(
            list(edges[:-1]),
            list(share),
            width=widths,
            align="edge",
            color=SUPPLY,
            alpha=0.8,
            edgecolor="white",
        )
        ax.set_xlabel(xlabel)
        ax.set_ylabel("share of time (%)")
        return _to_svg(fig, title)


def soc_by_month_svg(
    p5: Sequence[float],
    p50: Sequence[float],
    p95: Sequence[float],
    worst_year: Sequence[float],
    max_dod: float | None = None,
    title: str = "State of charge through the year",
) -> str:
    """Band of the day's lowest state of charge by month, its median, and the worst year."""
    plt = _plt()
    with plt.rc_context(_STYLE):
        fig, ax = plt.subplots(figsize=(6.4, 2.8))
        x = [k + 0.5 for k in range(12)]
        ax.fill_between(
            x,
            [100 * v for v in p5],
            [100 * v for v in p95],
            color=SUPPLY,
            alpha=0.25,
            step="mid",
            label="5th-95th percentile",
        )
        ax.step(x, [100 * v for v in p50], where="mid", color=SUPPLY, linewidth=1.6, label="median")
        if len(worst_year) > 1:
            n = len(worst_year)
            ax.plot(
                [12.0 * k / n for k in range(n)],
                [100 * v for v in worst_year],
                color=DEMAND,
                linewidth=0.7,
                label="year with most shedding",
            )
        if max_dod is not None:
            ax.axhline(
                100 * (1 - max_dod), color=GREY, linestyle=":", linewidth=1, label="lowest allowed"
            )
        ax.set_xlim(0, 12)
        ax.set_xticks(x, MONTHS)
        ax.set_ylim(0, 100)
        ax.set_ylabel("lowest SoC of the day (%)")
        ax.legend(loc="upper center", bbox_to_anchor=(0.5, -0.1), ncols=4, fontsize=7)
        return _to_svg(fig, title)


def tradeoff_svg(
    curves: Sequence[tuple[str, Sequence[float], Sequence[float]]],
    design_point: tuple[float, float] | None,
    xlabel: str,
    ylabel: str,
    title: str = "Array and battery size for the target LOLP",
) -> str:
    """One line per target (label, x, y), the chosen design marked."""
    plt = _plt()
    colours = (SUPPLY, DEMAND, ACCENT, GREY)
    with plt.rc_context(_STYLE):
        fig, ax = plt.subplots(figsize=(6.4, 3.0))
        for k, (label, xs, ys) in enumerate(curves):
            ax.plot(list(xs), list(ys), marker=".", color=colours[k % 4], label=label)
        if design_point is not None:
            ax.plot(
                [design_point[0]],
                [design_point[1]],
                "*",
                color="black",
                markersize=9,
                label="this design",
            )
        ax.set_xlabel(xlabel)
        ax.set_ylabel(ylabel)
        ax.legend(fontsize=8)
        return _to_svg(fig, title)


def text_bars(
    labels: Sequence[str],
    series: Sequence[tuple[str, str, Sequence[float]]],
    width: int = 80,
    unit: str = "",
) -> list[str]:
    """Horizontal bars in plain text: one line per label and series, scaled to ``width``.

    ``series`` is (name, fill character, values).  Used by the text and Markdown reports.
    """
    top = max((max(vals) for _, _, vals in series if len(vals)), default=0.0)
    name_w = max(len(n) for n, _, _ in series)
    lab_w = max(len(x) for x in labels)
    num_w = max(len(f"{v:,.0f}") for _, _, vals in series for v in vals)
    bar_w = max(10, width - lab_w - name_w - num_w - len(unit) - 5)
    lines = []
    for k, lab in enumerate(labels):
        for j, (name, char, vals) in enumerate(series):
            v = float(vals[k])
            n = round(v / top * bar_w) if top > 0 else 0
            head = lab if j == 0 else ""
            lines.append(
                f"{head:<{lab_w}} {name:<{name_w}} {char * n:<{bar_w}} "
                f"{v:>{num_w},.0f}{(' ' + unit) if unit else ''}".rstrip()
            )
    return lines


def day_flow_svg(
    hour: Sequence[float],
    irradiance_w_m2: Sequence[float],
    flow_m3_h: Sequence[float],
    start_irradiance_w_m2: float,
    title: str = "Flow through the day against the sunshine",
) -> str:
    """A pump's flow over a mean day (left axis) against the array's irradiance (right)."""
    plt = _plt()
    h = [float(x) for x in hour]
    with plt.rc_context(_STYLE):
        fig, ax = plt.subplots(figsize=(6.4, 3.0))
        ax.plot(h, [float(q) for q in flow_m3_h], color=SUPPLY, linewidth=1.8, label="flow")
        ax.set_xlabel("solar time (h)")
        ax.set_ylabel("flow (m3/h)", color=SUPPLY)
        ax.set_ylim(0, max(max(float(q) for q in flow_m3_h), 0.1) * 1.15)
        ax2 = ax.twinx()
        ax2.spines["right"].set_visible(True)
        ax2.grid(False)
        ax2.plot(h, [float(g) for g in irradiance_w_m2], color=DEMAND, linewidth=1.5,
                 linestyle="--", label="irradiance on the array")  # fmt: skip
        ax2.axhline(start_irradiance_w_m2, color=GREY, linewidth=0.8, linestyle=":")
        ax2.set_ylabel("irradiance (W/m2)", color=DEMAND)
        ax2.set_ylim(0, max(max(float(g) for g in irradiance_w_m2), 1.0) * 1.15)
        return _to_svg(fig, title)
