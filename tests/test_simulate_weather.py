"""Synthetic weather: Aguiar, Collares-Pereira & Conde (1988), Solar Energy 40(3) 269-279."""

import numpy as np
import pytest

from offgrid.climate.sky import extraterrestrial_daily_kwh_m2
from offgrid.simulate.weather import (
    MONTH_OF_DAY,
    aguiar1988_daily_kt,
    aguiar1988_library,
    aguiar1988_matrix_index,
    aguiar1988_model_moments,
    check_seed,
    check_years,
    synthetic_daily_insolation,
)

# Invented demonstration climate (monthly mean daily horizontal insolation, kWh/m2/day).
DEMO_H = [6.1, 6.3, 5.8, 4.9, 4.6, 4.5, 4.4, 4.9, 5.8, 6.0, 5.4, 5.7]


def lag1(x: np.ndarray) -> float:
    """Lag-1 autocorrelation within each row (no pairs across rows), pooled."""
    a, b = x[:, :-1].ravel(), x[:, 1:].ravel()
    return float(np.corrcoef(a, b)[0, 1])


def test_library_is_row_stochastic_and_bins_follow_the_paper():
    # Aguiar et al. (1988) table of matrices: 10 matrices of 10 x 10; the shipped
    # copy of the published matrices' rows sum to 1 within 0.003 and are normalised on reading.
    lib = aguiar1988_library()
    assert lib.p.shape == (10, 10, 10)
    np.testing.assert_allclose(lib.p.sum(axis=2), 1.0, atol=1e-12)
    # Matrix choice by monthly KT: <=0.30 -> 0, 0.30-0.35 -> 1, ..., >0.70 -> 9 (paper's bins).
    idx = aguiar1988_matrix_index([0.25, 0.30, 0.31, 0.52, 0.69, 0.71, 0.9])
    assert idx.tolist() == [0, 0, 1, 5, 8, 9, 9]


@pytest.mark.parametrize("matrix", [2, 5, 8])
def test_chain_reproduces_model_mean_std_and_lag1(matrix):
    # The model's own moments (stationary distribution, uniform KT within a state) are the
    # reference: sample of 200 years x 365 days, tolerance 0.02 on lag-1 (standard error
    # about 0.004), 0.01 on mean and standard deviation.
    kt_month = [0.275 + 0.05 * matrix] * 12  # centre of bin `matrix`
    assert aguiar1988_matrix_index(kt_month)[0] == matrix
    kt = aguiar1988_daily_kt(kt_month, 200, np.random.default_rng(7))
    mom = aguiar1988_model_moments(matrix)
    assert kt.mean() == pytest.approx(mom["mean"], abs=0.01)
    assert kt.std() == pytest.approx(mom["std"], abs=0.01)
    assert lag1(kt) == pytest.approx(mom["lag1"], abs=0.02)
    assert lag1(kt) > 0.15  # persistence of clear and cloudy spells


def test_synthetic_series_reproduces_monthly_means():
    w = synthetic_daily_insolation(DEMO_H, -3.4, years=30, seed=3)
    assert w.insolation_kwh_m2_day.shape == (30, 365)
    for m in range(12):
        # Rescaling per calendar month makes the long-run mean exact (stated tolerance 1e-9
        # relative); each factor stays within the matrix bin's half-width (~ +/-10 %).
        mean = w.insolation_kwh_m2_day[:, m == MONTH_OF_DAY].mean()
        assert mean == pytest.approx(DEMO_H[m], rel=1e-9)
    assert np.all(np.abs(w.scale_factor - 1) < 0.12)
    assert np.all(w.insolation_kwh_m2_day >= 0)
    # Year-to-year spread of a month's mean is kept (not forced equal every year).
    jan = w.insolation_kwh_m2_day[:, MONTH_OF_DAY == 0].mean(axis=1)
    assert jan.std() > 0.05


def test_rescaled_series_keeps_the_model_persistence():
    # Lag-1 of daily KT after rescaling, against the model value of the matrix used
    # (Aguiar et al. 1988), tolerance 0.03 over 100 years of one month.
    lat = -3.4
    w = synthetic_daily_insolation(DEMO_H, lat, years=100, seed=11)
    h0 = extraterrestrial_daily_kwh_m2(lat, np.arange(1, 366))
    kt = w.insolation_kwh_m2_day / h0
    from offgrid.climate.sky import clearness_index

    mi = aguiar1988_matrix_index(clearness_index(DEMO_H, lat))
    for m in (0, 6):
        sel = m == MONTH_OF_DAY
        assert lag1(kt[:, sel]) == pytest.approx(
            aguiar1988_model_moments(int(mi[m]))["lag1"], abs=0.03
        )


def test_seed_gives_the_same_series():
    a = synthetic_daily_insolation(DEMO_H, 10, years=2, seed=5)
    b = synthetic_daily_insolation(DEMO_H, 10, years=2, seed="5")
    c = synthetic_daily_insolation(DEMO_H, 10, years=2, seed=6)
    np.testing.assert_array_equal(a.insolation_kwh_m2_day, b.insolation_kwh_m2_day)
    assert not np.array_equal(a.insolation_kwh_m2_day, c.insolation_kwh_m2_day)
    assert a.seed == 5


def test_measured_days_come_first_unchanged():
    real = np.linspace(3, 7, 365)
    w = synthetic_daily_insolation(DEMO_H, 10, years=3, seed=1, measured_kwh_m2_day=real)
    assert w.years == 4 and w.measured_years == 1
    np.testing.assert_array_equal(w.insolation_kwh_m2_day[0], real)
    with pytest.raises(ValueError, match="365 values per year"):
        synthetic_daily_insolation(DEMO_H, 10, years=3, measured_kwh_m2_day=real[:100])


@pytest.mark.parametrize("years", [0, -3, "abc", 2.5, None])
def test_bad_years(years):
    with pytest.raises(ValueError, match="years"):
        check_years(years)


@pytest.mark.parametrize("seed", ["abc", "1.5", -1, True])
def test_bad_seed(seed):
    with pytest.raises(ValueError, match="seed"):
        check_seed(seed)
    with pytest.raises(ValueError, match="seed"):
        synthetic_daily_insolation(DEMO_H, 10, years=1, seed=seed)


def test_bad_monthly_values():
    with pytest.raises(ValueError, match="12 monthly values"):
        synthetic_daily_insolation(DEMO_H[:11], 10, years=1)
    with pytest.raises(ValueError, match="monthly insolation"):
        synthetic_daily_insolation([-1.0] * 12, 10, years=1)
