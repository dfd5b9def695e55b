"""How a reason prints a number: significant digits that never grow past ``digits`` and
float noise that never shows (a reason is read on screen and in the client's report)."""

from __future__ import annotations

import pytest

from offgrid.design.electrical.operating_point import module_fit_step
from offgrid.design.result import fmt


@pytest.mark.parametrize(
    ("value", "text"),
    [
        (12.345, "12.3 V"),
        (99.99999999, "100 V"),  # a hair under 100 printed "100.0": four digits
        (0.99951, "1.00 V"),  # rounding across a decade keeps three significant digits
        (0.0123456, "0.0123 V"),
        (100.0, "100 V"),
        (1234.5, "1234 V"),  # whole numbers keep every digit
        (-7.3751, "-7.38 V"),
        (0.0, "0 V"),
    ],
)
def test_three_significant_digits(value, text):
    assert fmt(value, "V") == text


def test_fit_errors_at_float_noise_read_zero():
    # A fit that reproduces the datasheet exactly leaves errors of ~1e-14 %: the reason
    # printed "0.0000000000000222 %", and one ulp of difference between two processors
    # changed the text.  Fit errors are shown to 0.001 % (the fit's tolerance is 0.5 %).
    from offgrid.design.pv import fit_module
    from tests.conftest import hand_project

    module = hand_project().module
    step = module_fit_step(module, fit_module(module))
    inputs = dict(step.reasons["module.fit"].inputs)
    for key in ("vmp_error", "imp_error", "voc_error", "isc_error"):
        assert len(inputs[key]) <= len("-0.499 %"), inputs[key]
