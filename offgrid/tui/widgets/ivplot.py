"""I-V and P-V curves drawn with characters: one string of the array at one condition.

Pure text (a list of lines), so the same drawing works in any terminal; ``plain``
uses ASCII only (vt100, NO_COLOR, a serial console or a screen reader).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

GLYPHS = {
    False: {
        "iv": "\u2022",
        "pv": "\u00b7",
        "mpp": "M",
        "pwm": "P",
        "win": "\u2502",
        "axis_v": "\u2502",
        "axis_h": "\u2500",
        "corner": "\u2514",
    },
    True: {
        "iv": "*",
        "pv": ".",
        "mpp": "M",
        "pwm": "P",
        "win": "|",
        "axis_v": "|",
        "axis_h": "-",
        "corner": "+",
    },
}


@dataclass(frozen=True)
class Curve:
    """One condition of one string: sampled voltage [V], current [A] and its marks."""

    title: str
    voltage_v: np.ndarray
    current_a: np.ndarray
    mpp: tuple[float, float]  # V, A
    pwm: tuple[float, float] | None  # the point at the battery's charging voltage
    window_v: tuple[float, float]  # the controller's usable voltage range


def draw(curve: Curve, width: int = 72, height: int = 14, plain: bool = False) -> list[str]:
    """The curve as ``height`` + 2 lines of at most ``width`` characters."""
    g = GLYPHS[plain]
    v, i = np.asarray(curve.voltage_v, float), np.asarray(curve.current_a, float)
    p = v * i
    left = 7  # the current axis labels
    cols = max(20, width - left - 1)
    v_max = max(float(v[-1]), curve.window_v[1]) * 1.02
    i_max = max(float(i.max()), 1e-9) * 1.08
    p_max = max(float(p.max()), 1e-9) * 1.08
    grid = [[" "] * cols for _ in range(height)]

    def col(volts: float) -> int:
        return round(volts / v_max * (cols - 1))

    def row(frac: float) -> int:
        return height - 1 - round(min(max(frac, 0.0), 1.0) * (height - 1))

    for w in curve.window_v:
        c = col(w)
        if 0 <= c < cols:
            for r in range(height):
                grid[r][c] = g["win"]
    xs = np.linspace(0.0, float(v[-1]), cols * 2)
    for x in xs:
        c = col(x)
        grid[row(float(np.interp(x, v, p)) / p_max)][c] = g["pv"]
    for x in xs:
        c = col(x)
        grid[row(float(np.interp(x, v, i)) / i_max)][c] = g["iv"]
    vm, im = curve.mpp
    grid[row(im / i_max)][col(vm)] = g["mpp"]
    grid[row(vm * im / p_max)][col(vm)] = g["mpp"]
    if curve.pwm is not None:
        vo, io = curve.pwm
        if 0 <= col(vo) < cols:
            grid[row(io / i_max)][col(vo)] = g["pwm"]
            grid[row(vo * io / p_max)][col(vo)] = g["pwm"]
    lines = []
    for r in range(height):
        label = f"{i_max * (height - 1 - r) / (height - 1):5.1f}A" if r % 4 == 0 else ""
        lines.append(f"{label:>{left - 1}} {g['axis_v']}" + "".join(grid[r]).rstrip())
    lines.append(" " * (left - 1) + " " + g["corner"] + g["axis_h"] * cols)
    ticks = [" "] * (cols + 8)
    for k in range(0, 5):
        volts = v_max * k / 4
        text = f"{volts:.0f}V"
        at = min(col(volts), cols - len(text))
        ticks[at : at + len(text)] = list(text)
    lines.append(" " * (left + 1) + "".join(ticks).rstrip())
    return [line[:width] for line in lines]
