"""Ground reflectance (albedo) as typed: its check, in plain Python (no numpy).

Shared by the project validation (which must stay light for the text UI's start-up),
the climate files and the engine (:mod:`offgrid.climate.sky`).
"""

from __future__ import annotations

DEFAULT_ALBEDO = 0.2  # grass or bare soil (common practice, no source)
ALBEDO_HINT = (
    "ground reflectance, a fraction 0-1: one value for the year or twelve, January "
    "first (0.2 grass or soil; fresh snow about 0.7-0.8)"
)


def albedo_problems(value, path: str = "site.albedo") -> list[tuple[str, str]]:
    """Problems with a ground reflectance as (dotted path, message with the fix).

    ``value`` is one number for every month or a list of twelve, January first;
    ``None`` (not given) is fine.  Plain Python, no numpy: shared by the project
    validation, the climate files and the engine.
    """
    import math

    if value is None:
        return []
    if isinstance(value, list | tuple):
        if len(value) not in (1, 12):
            return [
                (
                    path,
                    f"has {len(value)} values; give one for the year or twelve, "
                    "January first (ground reflectance, 0-1)",
                )
            ]
        items = [(f"{path}[{i}]", v) for i, v in enumerate(value, start=1)]
    else:
        items = [(path, value)]
    out = []
    for where, v in items:
        if isinstance(v, bool) or not isinstance(v, int | float) or not math.isfinite(v):
            out.append((where, f"'{v}' is not a number; {ALBEDO_HINT}"))
        elif not 0.0 <= v <= 1.0:
            out.append((where, f"{v:g} is outside 0-1; {ALBEDO_HINT}"))
    return out
