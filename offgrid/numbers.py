"""One reader for every number a person types or a file holds as text.

UI fields, load lists, part-price lists, plan price lists and surveys all go through
:func:`read_number`, so ``"1,500"`` means the same thing (nothing: it is refused)
everywhere.  The rules:

* ``12``, ``-0.5``, ``1e3``, ``2.5E-2`` as usual; a leading ``+`` or a Unicode minus is fine.
* One comma and no point, with other than three digits after it (``0,5``, ``12,25``),
  is a decimal comma.
* A comma that may be a thousands separator (``1,500``, ``2,000,000``) and a number with
  both a comma and a point (``1.500,5``, ``1,500.5``) cannot be read without doubt: refused
  with "write 1500 or 1.5".
* ``nan``, ``inf``, ``infinity`` and anything too large for a float (``1e400``) are refused:
  no non-finite number enters a design.
"""

from __future__ import annotations

import argparse
import math
import re

#: A number with a comma that could be a thousands separator: 1-3 digits, then groups
#: of exactly three (``1,500``; ``12,000,000``); ``0,500`` is a decimal comma.
_THOUSANDS = re.compile(r"^[+-]?[1-9]\d{0,2}(,\d{3})+$")
_NUMBER = re.compile(r"[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?")
AMBIGUOUS_HINT = "write 1500 or 1.5 (no thousands separator; a point for decimals)"


class NumberError(ValueError):
    """The text is not a number offgrid reads; the message says what to write instead."""


def read_number(raw: str) -> float:
    """The finite number in ``raw`` (see the module rules); :class:`NumberError` otherwise.

    The message quotes the text; the caller adds the field or line.
    """
    text = str(raw).strip().replace("\u2212", "-")
    if text.isascii() and text.isdigit():  # the usual case, quickly: plain digits
        value = float(text)
        if math.isfinite(value):
            return value
    if not text:
        raise NumberError("is empty: type a number")
    shown = repr(text) if len(text) <= 40 else repr(text[:37] + "...")
    if "," in text:
        if "." in text or text.count(",") > 1 or _THOUSANDS.match(text):
            raise NumberError(f"{shown} cannot be read without doubt: {AMBIGUOUS_HINT}")
        text = text.replace(",", ".")
    if text.lower().lstrip("+-") in ("nan", "inf", "infinity"):
        raise NumberError(f"{shown} is not a finite number: type a number such as 0 or 1.5")
    if not _NUMBER.fullmatch(text):
        raise NumberError(f"{shown} is not a number")
    value = float(text)
    if not math.isfinite(value):
        raise NumberError(
            f"{shown} is not a finite number (too large): type a number such as 0 or 1.5"
        )
    return value


def is_finite_number(value: object) -> bool:
    """A real number (not a bool) that is neither NaN nor infinite."""
    if isinstance(value, bool) or not isinstance(value, int | float):
        return False
    try:
        return math.isfinite(value)
    except OverflowError:  # an int beyond the float range
        return False


def finite_float(text: str) -> float:
    """``argparse`` type: a finite number by :func:`read_number`."""
    try:
        return read_number(text)
    except NumberError as exc:
        raise argparse.ArgumentTypeError(str(exc)) from None


#: The largest unit price taken from any price list or project, in its currency.  Far above
#: any part of a stand-alone system in any currency in use, and small enough that no total
#: or present worth of such prices can overflow (common practice, no source).
MAX_PRICE = 1e9
PRICE_RANGE = "a price must be above zero and at most 1,000,000,000"


def price_problem(value: float) -> str | None:
    """Why ``value`` cannot be a unit price, or None (``0 < value <= MAX_PRICE``)."""
    if not is_finite_number(value):
        return f"'{value}' is not a finite number; {PRICE_RANGE}"
    if not 0 < value <= MAX_PRICE:
        return f"{value:g} is out of range; {PRICE_RANGE}"
    return None
