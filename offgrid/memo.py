"""Opt-in memo of pure engine steps that do not depend on the demand.

Planning designs thousands of rows on one site with one set of parts: the module fit,
the module's maximum power points over the mean days of the months (the I-V harvest),
the monthly plane-of-array transposition and the mean-day irradiance profile are the
same for every row; the daily harvest of one array layout with its cables
(:func:`offgrid.design.harvest.harvest_wh_day`) and the conductor sizes that carry one
run (:func:`offgrid.design.wiring._candidates`) repeat across thousands of rows.
The electrical sub-steps are memoised on the few figures each reads (the noon operating
point, the string window and layout, the cables and each wire's reasons, the harvest
comparison before the demand, the protection reasons, the cautions), not on the whole
design: a village's ~1,260 distinct designs share a few design months, layouts, banks
and runs.  The load analysis and the inverter step read the loads, not the site, so a
programme's villages share them.  A step that reads a project table takes the table's
figures it needs as arguments (``electrical.operating_point._noon_point``): what it
cannot see cannot be missing from its key (tests/test_plan_memo_keys.py changes each
input in turn inside one memo).
Inside ``with design_memo():`` the functions decorated with :func:`memoised` keep
their results, keyed by their exact inputs (arrays by their bytes, project tables by
their pickle, single values with their type); outside it they run as before.  The
caches are per process and cleared when the last ``with`` block ends, so a single design
never sees stale values.

Only pure functions of their arguments may be decorated; results are returned as they
were first computed (numpy arrays made read-only, so a caller that writes into one
fails loudly instead of corrupting the memo).
"""

from __future__ import annotations

import functools
import itertools
import math
import pickle
from collections.abc import Callable, Iterator
from contextlib import contextmanager
from typing import Any

import numpy as np

_depth = 0
_caches: list[dict] = []
#: Most entries kept per function (a programme of many sites stays bounded in memory).
MAX_ENTRIES = 4096


@contextmanager
def design_memo() -> Iterator[None]:
    """Memoise the decorated engine steps for the duration of the block."""
    global _depth
    _depth += 1
    try:
        yield
    finally:
        _depth -= 1
        if _depth == 0:
            for c in _caches:
                c.clear()


def memo_active() -> bool:
    return _depth > 0


def freeze_key(value: Any) -> Any:
    """A hashable key for plain values, sequences, dataclasses (by pickle, else repr) and
    arrays: equal keys only for equal inputs.  A value on its own is typed: 1, 1.0 and True
    are three keys (a reason prints them apart), and so are -0.0 and 0.0; a hashable
    sequence (the months of a computed figure) is its own key."""
    t = type(value)
    if t is float:
        return value if value != 0.0 else ("zero", math.copysign(1.0, value))
    if t is str or value is None:
        return value
    if t is int or t is bool:
        return (t, value)
    if isinstance(value, np.ndarray):
        return ("nd", value.dtype.str, value.shape, value.tobytes())
    if isinstance(value, list | tuple):
        v = value if t is tuple else tuple(value)
        try:
            hash(v)
            return ("seq", v)  # plain values (the months of a figure): hashable as they are
        except TypeError:
            return tuple(map(freeze_key, v))
    if isinstance(value, dict):
        return tuple(sorted((k, freeze_key(v)) for k, v in value.items()))
    if isinstance(value, float | int | str | bool | np.generic):  # subclasses
        return (t, value)
    params = getattr(t, "__dataclass_params__", None)
    if params is not None:
        if params.frozen:
            try:
                hash(value)
                return value  # a frozen dataclass is its own key
            except TypeError:
                pass
        # a project table or a climate by its pickle: every field, numbers bit for bit
        # and typed (1, 1.0 and True apart), about 4 x quicker than the repr of a climate
        try:
            return ("pickle", t.__qualname__, pickle.dumps(value, 5))
        except (pickle.PicklingError, TypeError, AttributeError):
            pass
    return ("repr", t.__name__, repr(value))


def _readonly(value: Any) -> Any:
    if isinstance(value, np.ndarray):
        value.flags.writeable = False
    elif isinstance(value, tuple):
        for v in value:
            _readonly(v)
    return value


def memoised(func: Callable) -> Callable:
    """Decorator: memoise ``func`` while :func:`design_memo` is active."""
    cache: dict = {}
    _caches.append(cache)

    @functools.wraps(func)
    def wrapper(*args, **kwargs):
        if _depth == 0:
            return func(*args, **kwargs)
        # Hashable arguments (numbers, strings, frozen records) are their own key, with
        # their types (1, 1.0 and True apart); the rest through freeze_key, one by one.
        key = (args, tuple(map(type, args)), freeze_key(kwargs) if kwargs else ())
        try:
            return cache[key]
        except KeyError:
            pass
        except TypeError:  # an array, a list or a project table among them
            key = ("keys", tuple(map(freeze_key, args)), key[2])
            try:
                return cache[key]
            except KeyError:
                pass
        out = _readonly(func(*args, **kwargs))
        if len(cache) >= MAX_ENTRIES:
            # Drop the oldest quarter (a dict keeps insertion order): the village being
            # planned keeps what it has built, where clearing all lost it mid-village.
            for old in list(itertools.islice(cache, MAX_ENTRIES // 4)):
                del cache[old]
        cache[key] = out
        return out

    wrapper.cache = cache  # type: ignore[attr-defined]
    return wrapper
