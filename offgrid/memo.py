"""Opt-in memo of pure engine steps that do not depend on the demand.

Planning designs thousands of rows on one site with one set of parts: the module fit,
the module's maximum power points over the mean days of the months (the I-V harvest),
the monthly plane-of-array transposition and the mean-day irradiance profile are the
same for every row; the daily harvest of one array layout with its cables
(:func:`offgrid.design.harvest.harvest_wh_day`) and the conductor sizes that carry one
run (:func:`offgrid.design.wiring._candidates`) repeat across thousands of rows.
Inside ``with design_memo():`` the functions decorated with :func:`memoised` keep
their results, keyed by their exact inputs (arrays by their bytes); outside it they run
as before.  The caches are per process and cleared when the last
``with`` block ends, so a single design never sees stale values.

Only pure functions of their arguments may be decorated; results are returned as they
were first computed (numpy arrays made read-only, so a caller that writes into one
fails loudly instead of corrupting the memo).
"""

from __future__ import annotations

import functools
import marshal
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
    arrays: equal keys only for equal inputs."""
    if isinstance(value, np.ndarray):
        return ("nd", value.dtype.str, value.shape, value.tobytes())
    if isinstance(value, list | tuple):
        t = tuple(value)
        try:
            hash(t)
            return ("seq", t)  # plain values: hashable as they are
        except TypeError:
            return tuple(freeze_key(v) for v in value)
    if isinstance(value, dict):
        return tuple(sorted((k, freeze_key(v)) for k, v in value.items()))
    if isinstance(value, float | int | str | bool | type(None) | np.generic):
        return value
    params = getattr(type(value), "__dataclass_params__", None)
    if params is not None:
        if params.frozen:
            try:
                hash(value)
                return value  # a frozen dataclass is its own key
            except TypeError:
                pass
        # a project table or a climate by its fields' marshal bytes: every field, numbers
        # bit for bit and typed (1, 1.0 and True apart, -0.0 and 0.0 too), 2-3 x quicker
        # than its pickle; what marshal refuses (numpy values, subclasses) by the pickle
        try:
            return _table_key(value)
        except (ValueError, TypeError):
            pass
        try:
            return ("pickle", type(value).__qualname__, pickle.dumps(value, 5))
        except (pickle.PicklingError, TypeError, AttributeError):
            pass
    return ("repr", type(value).__name__, repr(value))


def _table_key(value: Any) -> tuple:
    """A dataclass instance's key: its class, its field names and the marshal bytes
    (version 2: no back-references, so equal values give equal bytes) of their values,
    nested dataclasses (``choices.derates``) by their own key.  Raises ValueError or
    TypeError for what marshal cannot write."""
    d = vars(value)
    values = tuple(d.values())
    cls = type(value)
    if cls not in _NESTED:
        try:
            return (cls, tuple(d), marshal.dumps(values, 2))
        except ValueError:
            pass
    nested = tuple(
        _table_key(v) if hasattr(type(v), "__dataclass_fields__") else None for v in values
    )
    if not any(nested):
        return (cls, tuple(d), marshal.dumps(values, 2))
    _NESTED.add(cls)  # next time straight here (the failed marshal costs as much)
    plain = tuple(v if k is None else None for v, k in zip(values, nested, strict=True))
    return (cls, tuple(d), nested, marshal.dumps(plain, 2))


#: Classes whose instances were seen holding a dataclass (``DesignChoices.derates``).
_NESTED: set[type] = set()


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
        key = (freeze_key(args), freeze_key(kwargs))
        try:
            return cache[key]
        except KeyError:
            pass
        out = _readonly(func(*args, **kwargs))
        if len(cache) >= MAX_ENTRIES:
            cache.clear()
        cache[key] = out
        return out

    wrapper.cache = cache  # type: ignore[attr-defined]
    return wrapper
