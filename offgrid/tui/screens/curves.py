"""The array's I-V and P-V curves at three conditions, for choosing PWM or MPPT and the string.

One string of the design's layout at the design month's noon, at the record low
(cold: the highest voltage) and in the hottest month (the lowest voltage), with the
maximum power point (M), the point where a PWM controller holds the string at the
battery's charging voltage (P) and the controller's voltage window (two lines: the
charging voltage and the controller's maximum PV input voltage).
"""

from __future__ import annotations

import numpy as np
from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.widgets import Static

from offgrid.tui.screens.dialogs import Dialog
from offgrid.tui.text import plain_terminal
from offgrid.tui.widgets.ivplot import Curve, draw

COLD_IRRADIANCE_W_M2 = 1000.0  # full sun on a cold clear day (common practice, no source)


def array_curves(project, design) -> list[Curve]:
    """The three conditions as string curves; [] when the design has no electrical part."""
    from offgrid.design.electrical import HOT_IRRADIANCE_W_M2
    from offgrid.design.pv import iv_curve

    er = design.electrical
    if er is None:
        return []
    series = int(er.strings.layout.series)
    v_chg = float(er.harvest.charging_voltage_v)
    window = (v_chg or 0.0, float(project.controller.max_pv_voltage_v))
    area = float(project.module.area_m2)
    months = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"]
    conditions = (
        (
            f"design month ({months[design.site.design_month - 1]}) at noon",
            er.mpp.irradiance_w_m2,
            er.mpp.cell_temp_c,
        ),
        (
            f"cold: record low {er.strings.record_low_c:.0f} C, full sun",
            COLD_IRRADIANCE_W_M2,
            er.strings.record_low_c,
        ),
        (
            f"hot: hottest month, cell {er.strings.hot_cell_temp_c:.0f} C",
            HOT_IRRADIANCE_W_M2,
            er.strings.hot_cell_temp_c,
        ),
    )
    out = []
    for title, g, tc in conditions:
        c = iv_curve(er.fit, float(g), float(tc), area)
        v = np.asarray(c.voltage_v) * series
        i = np.asarray(c.current_a)
        pwm = None
        if v_chg and v_chg <= v[-1]:
            pwm = (v_chg, float(np.interp(v_chg, v, i)))
        out.append(
            Curve(
                f"one string of {series}, {title}",
                v,
                i,
                (c.point.vmp_v * series, c.point.imp_a),
                pwm,
                window,
            )
        )
    return out


def curve_facts(curve: Curve) -> str:
    vm, im = curve.mpp
    text = (
        f"M  maximum power {vm * im:,.0f} W at {vm:.1f} V, {im:.2f} A;  "
        f"open circuit {curve.voltage_v[-1]:.1f} V"
    )
    if curve.pwm is not None:
        vo, io = curve.pwm
        text += (
            f"\nP  PWM at the charging voltage {vo:.1f} V: {vo * io:,.0f} W "
            f"({vo * io / (vm * im):.0%} of maximum power)"
        )
    else:
        text += "\nP  the charging voltage is above this curve's open circuit: PWM gives nothing"
    lo, hi = curve.window_v
    text += f"\n   controller window: {lo:.1f} V (charging) to {hi:.0f} V (max PV input)"
    if curve.voltage_v[-1] > hi:
        text += "  -- OPEN CIRCUIT ABOVE THE CONTROLLER'S MAXIMUM"
    return text


class CurvesDialog(Dialog):
    """The curves, one condition at a time: 1 2 3 or the arrow keys change it."""

    BINDINGS = [
        Binding("1", "show(0)", "Design month", id="curves.design"),
        Binding("2", "show(1)", "Cold (record low)", id="curves.cold"),
        Binding("3", "show(2)", "Hot (hottest month)", id="curves.hot"),
        Binding("right,tab", "step(1)", "Next condition", id="curves.next"),
        Binding("left,shift+tab", "step(-1)", "Previous condition", id="curves.previous"),
        Binding("enter,v", "close", "Close", id="curves.close"),
    ]

    def __init__(self, curves: list[Curve]) -> None:
        super().__init__()
        self.curves = curves
        self.index = 0
        self.plain = plain_terminal()

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog wide", id="curves"):
            yield Static(id="curves-title", classes="dialog-title")
            yield Static(id="curves-plot")
            yield Static(id="curves-facts")
            yield Static(
                Text(
                    "1 design  2 cold  3 hot  (or left/right)   Enter, v or Esc: close", style="dim"
                )
            )

    def on_mount(self) -> None:
        self._draw()

    def on_resize(self) -> None:
        self._draw()

    def _draw(self) -> None:
        c = self.curves[self.index]
        g = "*" if self.plain else "\u2022"
        d = "." if self.plain else "\u00b7"
        self.query_one("#curves-title", Static).update(
            Text.assemble((f"{self.index + 1}/3 I-V ({g}) and P-V ({d}): ", "bold"), c.title)
        )
        width = max(40, min(100, (self.size.width or 80) - 8))
        height = max(6, min(16, (self.size.height or 24) - 14))
        self.query_one("#curves-plot", Static).update(
            Text("\n".join(draw(c, width, height, self.plain)))
        )
        self.query_one("#curves-facts", Static).update(Text(curve_facts(c)))

    def action_show(self, index: int) -> None:
        self.index = index
        self._draw()

    def action_step(self, step: int) -> None:
        self.action_show((self.index + step) % len(self.curves))
