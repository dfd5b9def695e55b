"""A site whose position was never set, or a climate from somewhere else, is said out loud.

The tilted-plane sun (Liu & Jordan 1962 with Klein's Rb, offgrid.climate.poa) is worked out
at the site's latitude; a blank project left at 0, 0 or a climate picked for another place
gives a wrong array with no sign of it.  Warned when both coordinates are exactly 0 (a
point in the sea, the value of a site never set) or when the climate's own coordinates
lie more than 2 degrees from the site's (common practice, no source).
"""

from __future__ import annotations

from dataclasses import replace

from offgrid.design.sizing import design
from tests.test_worst_month import _bundled


def _codes(d) -> dict[str, str]:
    return {n.code: n.message for n in d.warnings}


def test_a_site_at_its_climates_position_gets_no_warning():
    p = _bundled("household-kit.csv", "dalli-wells-demo")
    assert not {"site-position-unset", "climate-elsewhere"} & set(_codes(design(p)))


def test_a_site_never_set_is_warned_with_the_climates_position():
    p = _bundled("household-kit.csv", "dalli-wells-demo")
    p.site = replace(p.site, latitude_deg=0.0, longitude_deg=0.0)
    codes = _codes(design(p))
    assert "site-position-unset" in codes and "climate-elsewhere" not in codes
    text = codes["site-position-unset"]
    assert "latitude and longitude are both 0" in text and "Place" in text


def test_a_climate_from_elsewhere_is_warned():
    p = _bundled("household-kit.csv", "dalli-wells-demo")
    p.site = replace(p.site, latitude_deg=p.site.latitude_deg - 15.0)
    d = design(p)
    codes = _codes(d)
    assert "climate-elsewhere" in codes
    assert (
        "dalli-wells-demo" in codes["climate-elsewhere"]
        or "deg from the site" in codes["climate-elsewhere"]
    )
    assert next(n for n in d.warnings if n.code == "climate-elsewhere").figure == (
        "site.latitude_deg"
    )
