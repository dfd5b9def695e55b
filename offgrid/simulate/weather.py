"""Synthetic daily insolation from twelve monthly means.

The generator is the Markov transition matrix model of Aguiar, Collares-Pereira
and Conde (1988): the daily clearness index KT is a first-order Markov chain
over 10 states; the matrix is chosen by the month's mean KT from a library of
10 matrices, and within the chosen state interval KT follows by linear
interpolation of a uniform draw.

How the monthly means are kept: the chain's stationary mean sits within the
matrix's 0.05-wide KT bin, not on the site's exact mean.  We therefore rescale
each *calendar* month as a whole (all years together) by one factor so that the
long-run mean of daily insolation equals the monthly mean exactly, keeping
year-to-year differences of the monthly means (a bad June stays bad) and the
day-to-day persistence (a constant factor leaves the autocorrelation of KT
unchanged).  Daily KT is then capped at a clear-sky bound and the rescaling
repeated, which converges in a few passes.

References
----------
.. [1] Aguiar, R. J., Collares-Pereira, M. and Conde, J. P., "Simple procedure
   for generating sequences of daily radiation values using a library of
   Markov transition matrices", Solar Energy 40(3) (1988) 269-279.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

import numpy as np

from offgrid.climate.sky import DAYS_IN_MONTH, clearness_index, extraterrestrial_daily_kwh_m2

#: Upper bound on daily KT after rescaling (common practice, no source: clear days rarely
#: exceed 0.8-0.85 at sea level; the matrix library tops out at 0.865).
KT_CAP = 0.90
#: Monthly mean KT bin edges that pick matrix 0..9 (Aguiar et al. 1988, table 1).
MATRIX_BIN_EDGES = np.array([0.30, 0.35, 0.40, 0.45, 0.50, 0.55, 0.60, 0.65, 0.70])
DAYS_PER_YEAR = 365
MATRIX_FILE = Path(__file__).resolve().parents[1] / "data" / "aguiar1988_markov_matrices.csv"
#: Month (0-11) of each day of a 365-day year.
MONTH_OF_DAY = np.repeat(np.arange(12), DAYS_IN_MONTH)
MAX_YEARS = 1000
SOURCE = (
    "Aguiar, Collares-Pereira & Conde (1988), Solar Energy 40(3) 269-279: "
    "library of daily-KT Markov transition matrices"
)


@dataclass(frozen=True)
class MarkovLibrary:
    """The matrix library: ``p[m, i, j]`` row-stochastic, state bounds per matrix."""

    p: np.ndarray  # (10, 10, 10)
    kt_min: np.ndarray  # (10,)
    kt_max: np.ndarray  # (10,)

    @property
    def width(self) -> np.ndarray:
        return (self.kt_max - self.kt_min) / 10.0


@lru_cache(maxsize=1)
def aguiar1988_library() -> MarkovLibrary:
    """Read the shipped copy of the Aguiar et al. (1988) matrices.

    Rows as transcribed sum to 1 within 0.003; each row is normalised to 1.
    """
    text = MATRIX_FILE.read_text(encoding="utf-8")
    kt_min = kt_max = None
    rows = []
    for line in text.splitlines():
        if line.startswith("# KT_min:"):
            kt_min = np.array([float(v) for v in line.split(":")[1].split()])
        elif line.startswith("# KT_max:"):
            kt_max = np.array([float(v) for v in line.split(":")[1].split()])
        elif line and not line.startswith("#") and not line.startswith("matrix"):
            rows.append([float(v) for v in line.split(",")])
    a = np.array(rows)
    if a.shape != (100, 12) or kt_min is None or kt_max is None:
        raise RuntimeError("offgrid/data/aguiar1988_markov_matrices.csv is damaged")
    p = a[:, 2:].reshape(10, 10, 10)
    p = p / p.sum(axis=2, keepdims=True)
    return MarkovLibrary(p=p, kt_min=kt_min, kt_max=kt_max)


def aguiar1988_matrix_index(kt_monthly) -> np.ndarray:
    """Index 0-9 of the library matrix for each monthly mean KT (Aguiar et al. 1988)."""
    kt = np.asarray(kt_monthly, dtype=float)
    return np.searchsorted(MATRIX_BIN_EDGES, kt, side="left")


def stationary_distribution(p: np.ndarray) -> np.ndarray:
    """Stationary distribution pi (pi P = pi) of a row-stochastic matrix."""
    n = p.shape[0]
    a = np.vstack([p.T - np.eye(n), np.ones(n)])
    b = np.zeros(n + 1)
    b[-1] = 1.0
    pi, *_ = np.linalg.lstsq(a, b, rcond=None)
    pi = np.clip(pi, 0.0, None)
    return pi / pi.sum()


def aguiar1988_model_moments(matrix: int) -> dict[str, float]:
    """Mean, standard deviation and lag-1 autocorrelation of KT implied by one matrix.

    KT is uniform within each state interval, so Var = sum pi_i (c_i^2 + w^2/12) - mu^2 and
    Cov(KT_t, KT_t+1) = sum_ij pi_i P_ij c_i c_j - mu^2 with c the interval centres.
    """
    lib = aguiar1988_library()
    p = lib.p[matrix]
    w = lib.width[matrix]
    c = lib.kt_min[matrix] + w * (np.arange(10) + 0.5)
    pi = stationary_distribution(p)
    mu = float(pi @ c)
    var = float(pi @ (c**2) + w**2 / 12.0 - mu**2)
    cov = float(pi @ (p * np.outer(c, c)).sum(axis=1) - mu**2)
    return {"mean": mu, "std": math.sqrt(var), "lag1": cov / var}


def check_years(years) -> int:
    """Validate a number of years; the message names the field and the fix."""
    if isinstance(years, bool) or not isinstance(years, int | np.integer):
        try:
            f = float(years)
        except (TypeError, ValueError):
            raise ValueError(f"years: {years!r} is not a whole number; give e.g. 30") from None
        if not f.is_integer():
            raise ValueError(f"years: {years!r} is not a whole number; give e.g. 30")
        years = int(f)
    if years < 1:
        raise ValueError(f"years: {years} must be at least 1 (30 is usual)")
    if years > MAX_YEARS:
        raise ValueError(f"years: {years} is more than {MAX_YEARS}; use fewer years")
    return int(years)


def check_seed(seed) -> int | None:
    """Validate a seed: a whole number 0 or more, or None for fresh entropy."""
    if seed is None:
        return None
    if isinstance(seed, bool):
        raise ValueError(f"seed: {seed!r} is not a number; give a whole number such as 1")
    try:
        value = int(str(seed).strip()) if not isinstance(seed, int | np.integer) else int(seed)
    except ValueError:
        raise ValueError(f"seed: {seed!r} is not a number; give a whole number such as 1") from None
    if value < 0:
        raise ValueError(f"seed: {value} is negative; give a whole number 0 or more")
    return value


def make_rng(seed) -> np.random.Generator:
    """numpy Generator from an integer seed (None: fresh entropy)."""
    if isinstance(seed, np.random.Generator):
        return seed
    return np.random.default_rng(check_seed(seed))


def aguiar1988_daily_kt(kt_monthly, years: int, rng: np.random.Generator) -> np.ndarray:
    """Daily clearness index from the Aguiar et al. (1988) Markov chain, unscaled.

    Parameters
    ----------
    kt_monthly : array of 12
        Monthly mean clearness index [-].
    years : int
        Number of 365-day years.
    rng : numpy.random.Generator

    Returns
    -------
    numpy.ndarray, shape (years, 365)
        Daily KT [-].  Each year is its own chain, started from the stationary
        distribution of January's matrix; the state carries over at month ends.
    """
    lib = aguiar1988_library()
    kt_monthly = np.asarray(kt_monthly, dtype=float)
    mi = aguiar1988_matrix_index(kt_monthly)
    cum = np.cumsum(lib.p, axis=2)
    cum[:, :, -1] = 1.0 + 1e-12
    u_state = rng.random((DAYS_PER_YEAR, years))
    u_kt = rng.random((DAYS_PER_YEAR, years))
    pi0 = stationary_distribution(lib.p[mi[0]])
    state = np.minimum(np.searchsorted(np.cumsum(pi0), rng.random(years)), 9)
    states = np.empty((DAYS_PER_YEAR, years), dtype=np.int64)
    day_matrix = mi[MONTH_OF_DAY]
    for d in range(DAYS_PER_YEAR):
        rows = cum[day_matrix[d], state]  # (years, 10)
        state = (u_state[d][:, None] > rows).sum(axis=1)
        states[d] = state
    lo = lib.kt_min[day_matrix][:, None] + lib.width[day_matrix][:, None] * states
    kt = lo + u_kt * lib.width[day_matrix][:, None]
    return kt.T


@dataclass(frozen=True)
class WeatherSeries:
    """Daily horizontal insolation for a run of 365-day years."""

    insolation_kwh_m2_day: np.ndarray  # (years, 365)
    measured_years: int  # the first this many years are real days from a weather file
    target_kwh_m2_day: np.ndarray  # (12,) monthly means the synthetic years reproduce
    scale_factor: np.ndarray  # (12,) rescaling applied to the synthetic months
    seed: int | None
    source: str

    @property
    def years(self) -> int:
        return int(self.insolation_kwh_m2_day.shape[0])

    @property
    def days(self) -> int:
        return self.years * DAYS_PER_YEAR

    @property
    def month_of_day(self) -> np.ndarray:
        """Month 0-11 of every day of the flattened series."""
        return np.tile(MONTH_OF_DAY, self.years)

    def flat(self) -> np.ndarray:
        return self.insolation_kwh_m2_day.reshape(-1)


def check_monthly(values, name: str) -> np.ndarray:
    a = np.asarray(values, dtype=float)
    if a.shape != (12,):
        raise ValueError(f"{name}: need 12 monthly values, got shape {a.shape}")
    if not np.all(np.isfinite(a)) or np.any(a < 0):
        raise ValueError(f"{name}: every monthly value must be a number 0 or more")
    return a


def check_measured(measured) -> np.ndarray:
    """Real daily totals: a multiple of 365 values, 1 January first, 29 February left out."""
    a = np.asarray(measured, dtype=float).reshape(-1)
    if a.size == 0 or a.size % DAYS_PER_YEAR:
        raise ValueError(
            f"daily insolation: need 365 values per year (1 January first, "
            f"29 February left out), got {a.size}"
        )
    if not np.all(np.isfinite(a)) or np.any(a < 0) or np.any(a > 15):
        raise ValueError("daily insolation: values must be 0-15 kWh/m2/day; check the units")
    return a.reshape(-1, DAYS_PER_YEAR)


def synthetic_daily_insolation(
    insolation_kwh_m2_day, latitude_deg: float, years: int = 30, seed=None, measured_kwh_m2_day=None
) -> WeatherSeries:
    """Years of daily horizontal insolation reproducing the monthly means.

    Parameters
    ----------
    insolation_kwh_m2_day : array of 12
        Monthly mean daily horizontal insolation [kWh/m2/day].
    latitude_deg : float
        Site latitude [deg], north positive.
    years : int
        Synthetic years (1-1000).
    seed : int or None
        Seed of the numpy Generator; the same seed gives the same series.
    measured_kwh_m2_day : array, optional
        Real daily totals from an imported weather file (365 per year); these
        years come first in the series, unchanged, ahead of the synthetic ones.

    Returns
    -------
    WeatherSeries

    References
    ----------
    Aguiar, Collares-Pereira & Conde (1988) [1]; rescaling as in the module notes.
    """
    years = check_years(years)
    target = check_monthly(insolation_kwh_m2_day, "monthly insolation")
    if not -90.0 <= float(latitude_deg) <= 90.0:
        raise ValueError(f"latitude: {latitude_deg} is outside -90..90 degrees")
    seed_value = None if isinstance(seed, np.random.Generator) else check_seed(seed)
    rng = make_rng(seed)
    kt_m = clearness_index(target, latitude_deg)
    h0 = extraterrestrial_daily_kwh_m2(latitude_deg, np.arange(1, DAYS_PER_YEAR + 1))  # (365,)
    kt = aguiar1988_daily_kt(kt_m, years, rng)
    h = kt * h0[None, :]
    factor = np.ones(12)
    cap = np.maximum(KT_CAP * h0[None, :], 0.0)
    for it in range(8):
        if it:
            h = np.minimum(h, cap)
        for m in range(12):
            sel = m == MONTH_OF_DAY
            mean = h[:, sel].mean()
            if target[m] <= 0:
                h[:, sel] = 0.0
                continue
            if mean <= 1e-12:  # polar twilight: no extraterrestrial share, spread evenly
                h[:, sel] = target[m]
                continue
            f = target[m] / mean
            factor[m] *= f
            h[:, sel] *= f
        if np.all(h <= cap + 1e-9):
            break
    h = np.maximum(h, 0.0)
    measured_years = 0
    if measured_kwh_m2_day is not None:
        real = check_measured(measured_kwh_m2_day)
        measured_years = real.shape[0]
        h = np.vstack([real, h])
    source = SOURCE + (f"; first {measured_years} year(s) measured" if measured_years else "")
    return WeatherSeries(
        insolation_kwh_m2_day=h,
        measured_years=measured_years,
        target_kwh_m2_day=target,
        scale_factor=factor,
        seed=seed_value,
        source=source,
    )
