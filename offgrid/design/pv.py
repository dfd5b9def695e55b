"""PV module electrical model: single-diode fit from datasheet values, I-V curves.

The module is the five-parameter single-diode model of De Soto, Klein and
Beckman (2006) [1]_:

    I = IL - I0 [exp((V + I Rs) / a) - 1] - (V + I Rs) / Rsh

Its five reference parameters are fitted to the datasheet values at STC
(Isc, Voc, Vmp, Imp and the Voc temperature coefficient, [1]_ eqs. 4-7) by
Newton's method started from the explicit extraction of Batzelis (2017) [2]_.
Curves are computed in the diode-voltage parametrisation of Bishop (1988)
[3]_: with Vd = V + I Rs the current is explicit, so every point is exact and
the maximum power point follows from a safeguarded Newton search on dP/dVd.
pvlib is only a fallback for the fit (imported lazily: it costs ~0.7 s) and the
reference in the tests.

All functions take numpy arrays and broadcast; units are in the names.

References
----------
.. [1] W. De Soto, S. A. Klein and W. A. Beckman, "Improvement and validation
   of a model for photovoltaic array performance", Solar Energy 80 (2006)
   78-88.
.. [2] E. I. Batzelis, "Simple PV performance equations theoretically well
   founded on the single-diode model", IEEE J. Photovoltaics 7 (2017)
   1400-1409, sec. II.C, eqs. 9-15.
.. [3] J. W. Bishop, "Computer simulation of the effects of electrical
   mismatches in photovoltaic cell interconnection circuits", Solar Cells 25
   (1988) 73-89.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from offgrid.design.result import DesignError
from offgrid.memo import memoised

T_REF_C = 25.0
T_REF_K = 298.15
G_REF_W_M2 = 1000.0
EG_REF_EV = 1.121  # band gap of crystalline silicon at STC, De Soto et al. [1]
DEG_DT_PER_K = -0.0002677  # band-gap temperature dependence, De Soto et al. [1]
BOLTZMANN_EV_PER_K = 8.617333262e-5  # CODATA 2018
FIT_TOLERANCE = 0.005  # the fit must reproduce Vmp, Imp, Voc and Isc within 0.5 %


@dataclass(frozen=True)
class DiodeParams:
    """Reference (STC) parameters of the De Soto single-diode model."""

    photocurrent_a: float  # IL_ref
    saturation_current_a: float  # I0_ref
    series_resistance_ohm: float  # Rs
    shunt_resistance_ohm: float  # Rsh_ref
    modified_ideality_v: float  # a_ref = n Ns k T / q
    alpha_isc_a_per_c: float
    method: str  # name of the published fit used
    stc_error_pct: tuple[float, float, float, float]  # Vmp, Imp, Voc, Isc: fit vs datasheet


@dataclass(frozen=True)
class OperatingPoint:
    """Key points of one I-V curve (one module)."""

    irradiance_w_m2: float
    cell_temp_c: float
    isc_a: float
    voc_v: float
    imp_a: float
    vmp_v: float
    pmp_w: float
    fill_factor: float
    efficiency: float  # Pmp / (G x area)


@dataclass(frozen=True)
class IVCurve:
    """Sampled I-V and P-V curve of one module at one condition."""

    point: OperatingPoint
    voltage_v: tuple[float, ...]
    current_a: tuple[float, ...]
    power_w: tuple[float, ...]


# --------------------------------------------------------------------------- checks


def validate_module(module) -> list[str]:
    """Check datasheet values; raise DesignError naming the field, return soft warnings.

    ``module`` is an :class:`offgrid.project.model.ModuleSpec`.
    """

    def bad(field: str, message: str) -> DesignError:
        return DesignError("module-datasheet", message, field=f"module.{field}")

    for name in ("pmax_w", "vmp_v", "imp_a", "voc_v", "isc_a", "area_m2"):
        value = float(getattr(module, name))
        if not math.isfinite(value) or value <= 0:
            raise bad(name, f"Module {name} must be a positive number (got {value:g}).")
    if module.cells_in_series < 1:
        raise bad("cells_in_series", "Module cells in series must be at least 1.")
    if module.vmp_v >= module.voc_v:
        raise bad(
            "vmp_v",
            f"Module Vmp ({module.vmp_v:g} V) must be below Voc "
            f"({module.voc_v:g} V): check the datasheet, the two may be swapped.",
        )
    if module.imp_a >= module.isc_a:
        raise bad(
            "imp_a",
            f"Module Imp ({module.imp_a:g} A) must be below Isc "
            f"({module.isc_a:g} A): check the datasheet, the two may be swapped.",
        )
    p = module.vmp_v * module.imp_a
    if abs(p - module.pmax_w) > 0.02 * module.pmax_w:
        raise bad(
            "pmax_w",
            f"Module Pmax ({module.pmax_w:g} W) differs from Vmp x Imp "
            f"({p:.1f} W) by more than 2 %: check Pmax, Vmp and Imp on the datasheet.",
        )
    ff = p / (module.voc_v * module.isc_a)
    if not 0.5 <= ff <= 0.9:
        raise bad(
            "vmp_v",
            f"Module fill factor Vmp Imp / (Voc Isc) = {ff:.2f} is outside "
            "0.5-0.9, which no crystalline module has: check Vmp, Imp, Voc and Isc.",
        )
    beta = module.beta_voc_pct_per_c
    if beta is not None and not -1.0 < beta < 0.0:
        raise bad(
            "beta_voc_pct_per_c",
            f"The Voc temperature coefficient must be negative, "
            f"about -0.25 to -0.40 %/C (got {beta:g} %/C): Voc rises in the cold.",
        )
    alpha = module.alpha_isc_pct_per_c
    if not 0.0 <= alpha < 0.2:
        raise bad(
            "alpha_isc_pct_per_c",
            f"The Isc temperature coefficient must be small and "
            f"positive, about +0.03 to +0.07 %/C (got {alpha:g} %/C).",
        )
    gamma = module.gamma_pmax_pct_per_c
    if gamma is not None and not -1.0 < gamma < 0.0:
        raise bad(
            "gamma_pmax_pct_per_c",
            f"The Pmax temperature coefficient must be negative, "
            f"about -0.3 to -0.5 %/C (got {gamma:g} %/C).",
        )
    eff = module.pmax_w / (G_REF_W_M2 * module.area_m2)
    if not 0.03 <= eff <= 0.30:
        raise bad(
            "area_m2",
            f"Pmax / (1000 W/m2 x area) = {eff:.1%} is not a module "
            "efficiency: check the area (m2, not cm2 or mm2) and Pmax.",
        )
    warnings = []
    voc_cell = module.voc_v / module.cells_in_series
    if not 0.45 <= voc_cell <= 0.85:
        warnings.append(
            f"Voc per cell is {voc_cell:.2f} V: {module.cells_in_series} cells in series looks "
            "wrong for crystalline silicon (half-cut modules of 144 cells have 72 in series)."
        )
    return warnings


# ------------------------------------------------------------------------ the fit


def _lambertw_of_exp(x):
    """W(exp(x)) for x > 1 by Newton on w + ln w = x."""
    x = np.asarray(x, dtype=float)
    w = x - np.log(x)
    for _ in range(30):
        step = (w + np.log(w) - x) / (1.0 + 1.0 / w)
        w = w - step
        if np.all(np.abs(step) < 1e-14 * np.abs(w)):
            break
    return w


def fit_batzelis2017(vmp_v, imp_a, voc_v, isc_a, alpha_isc_a_per_c, beta_voc_v_per_c):
    """Explicit De Soto parameters from datasheet values, Batzelis (2017) [2]_ eqs. 9-15.

    Returns a dict with ``IL``, ``I0``, ``Rs``, ``Rsh``, ``a`` [A, A, ohm, ohm, V].
    """
    alpha = alpha_isc_a_per_c / isc_a  # 1/K
    beta = beta_voc_v_per_c / voc_v
    delta = (1.0 - beta * T_REF_K) / (50.1 - alpha * T_REF_K)  # eq. 9
    w = _lambertw_of_exp(1.0 / delta + 1.0)
    a = delta * voc_v
    rs = (a * (w - 1.0) - vmp_v) / imp_a
    rsh = a * (w - 1.0) / (isc_a * (1.0 - 1.0 / w) - imp_a)
    il = (1.0 + rs / rsh) * isc_a
    i0 = il * np.exp(-1.0 / delta)
    return {"IL": float(il), "I0": float(i0), "Rs": float(rs), "Rsh": float(rsh), "a": float(a)}


def _desoto_residuals(x, specs):
    """The five equations of De Soto et al. [1]_ (eqs. 4-7 at STC and at STC + 2 K)."""
    isc, voc, imp, vmp, beta, alpha = specs
    il, ln_i0, rs, rsh, a = x
    i0 = math.exp(ln_i0)
    e_mp = math.exp((vmp + imp * rs) / a)
    t2 = T_REF_K + 2.0
    voc2 = voc + 2.0 * beta
    a2 = a * t2 / T_REF_K
    il2 = il + 2.0 * alpha
    eg2 = EG_REF_EV * (1.0 + DEG_DT_PER_K * 2.0)
    i02 = i0 * (t2 / T_REF_K) ** 3 * math.exp((EG_REF_EV / T_REF_K - eg2 / t2) / BOLTZMANN_EV_PER_K)
    return np.array(
        [
            isc - il + i0 * math.expm1(isc * rs / a) + isc * rs / rsh,
            -il + i0 * math.expm1(voc / a) + voc / rsh,
            imp - il + i0 * (e_mp - 1.0) + (vmp + imp * rs) / rsh,
            imp - vmp * (i0 / a * e_mp + 1.0 / rsh) / (1.0 + i0 * rs / a * e_mp + rs / rsh),
            -il2 + i02 * math.expm1(voc2 / a2) + voc2 / rsh,
        ]
    )


def fit_desoto2006(
    vmp_v, imp_a, voc_v, isc_a, alpha_isc_a_per_c, beta_voc_v_per_c, start=None, max_iter=60
):
    """Fit the De Soto et al. (2006) [1]_ reference parameters to datasheet values.

    Damped Newton iteration on the five equations of [1]_ (unknowns IL, ln I0,
    Rs, Rsh, a), started from :func:`fit_batzelis2017`.  Returns a dict like
    that function, or None when the iteration does not converge to physical
    (positive) parameters.
    """
    s = start or fit_batzelis2017(vmp_v, imp_a, voc_v, isc_a, alpha_isc_a_per_c, beta_voc_v_per_c)
    if not (s["I0"] > 0 and s["a"] > 0 and s["Rsh"] > 0):
        return None
    specs = (isc_a, voc_v, imp_a, vmp_v, beta_voc_v_per_c, alpha_isc_a_per_c)
    x = np.array([s["IL"], math.log(s["I0"]), max(s["Rs"], 1e-4), s["Rsh"], s["a"]])
    try:
        f = _desoto_residuals(x, specs)
        norm = float(np.linalg.norm(f))
        for _ in range(max_iter):
            if norm < 1e-12:
                break
            jac = np.empty((5, 5))
            for j in range(5):
                h = 1e-7 * max(abs(x[j]), 1e-3)
                xh = x.copy()
                xh[j] += h
                jac[:, j] = (_desoto_residuals(xh, specs) - f) / h
            step = np.linalg.solve(jac, -f)
            lam = 1.0
            while lam > 1e-6:
                xn = x + lam * step
                if xn[2] >= 0 and xn[3] > 0 and xn[4] > 0:
                    fn = _desoto_residuals(xn, specs)
                    nn = float(np.linalg.norm(fn))
                    if math.isfinite(nn) and nn < norm:
                        break
                lam *= 0.5
            else:
                return None
            x, f, norm = xn, fn, nn
    except (OverflowError, np.linalg.LinAlgError, ValueError):
        return None
    if not norm < 1e-9:
        return None
    return {
        "IL": float(x[0]),
        "I0": math.exp(x[1]),
        "Rs": float(x[2]),
        "Rsh": float(x[3]),
        "a": float(x[4]),
    }


def _fit_desoto_pvlib(module, alpha_a, beta_v):
    """Fallback: pvlib.ivtools.sdm.fit_desoto with the Levenberg-Marquardt solver."""
    try:
        from pvlib.ivtools.sdm import fit_desoto  # lazy: pvlib costs ~0.7 s to import
    except ImportError:  # pragma: no cover - pvlib is a dependency
        return None
    try:
        p, _ = fit_desoto(
            module.vmp_v,
            module.imp_a,
            module.voc_v,
            module.isc_a,
            alpha_a,
            beta_v,
            module.cells_in_series,
            root_kwargs={"method": "lm"},
        )
    except RuntimeError:
        return None
    return {
        "IL": float(p["I_L_ref"]),
        "I0": float(p["I_o_ref"]),
        "Rs": float(p["R_s"]),
        "Rsh": float(p["R_sh_ref"]),
        "a": float(p["a_ref"]),
    }


def _stc_errors(p: dict, module) -> tuple[float, float, float, float] | None:
    if not all(math.isfinite(v) for v in p.values()):
        return None
    if not (p["I0"] > 0 and p["a"] > 0 and p["Rsh"] > 0 and p["Rs"] >= 0 and p["IL"] > 0):
        return None
    isc = float(current_at_voltage(0.0, p["IL"], p["I0"], p["Rs"], p["Rsh"], p["a"]))
    voc = float(open_circuit_voltage(p["IL"], p["I0"], p["Rsh"], p["a"]))
    vmp, imp, _ = (float(v) for v in max_power_point(p["IL"], p["I0"], p["Rs"], p["Rsh"], p["a"]))
    errs = (
        vmp / module.vmp_v - 1,
        imp / module.imp_a - 1,
        voc / module.voc_v - 1,
        isc / module.isc_a - 1,
    )
    if not all(math.isfinite(e) for e in errs):
        return None
    return tuple(100.0 * e for e in errs)


@memoised
def fit_module(module) -> DiodeParams:
    """Fit the single-diode model to a datasheet and check it reproduces STC.

    Tries, in order: De Soto (2006) by Newton from the Batzelis start; pvlib's
    ``fit_desoto`` (Levenberg-Marquardt); the Batzelis (2017) explicit values
    alone.  The first whose Vmp, Imp, Voc and Isc at STC are all within 0.5 %
    of the datasheet wins; if none is, DesignError says what to check.
    When no Voc coefficient is given, -0.30 %/C is assumed for the fit only
    (the string window then uses NEC Table 690.7(A)).
    """
    validate_module(module)
    alpha_a = module.alpha_isc_pct_per_c / 100.0 * module.isc_a
    beta_pct = module.beta_voc_pct_per_c if module.beta_voc_pct_per_c is not None else -0.30
    beta_v = beta_pct / 100.0 * module.voc_v
    args = (module.vmp_v, module.imp_a, module.voc_v, module.isc_a, alpha_a, beta_v)
    start = fit_batzelis2017(*args)
    tries = (
        (
            "De Soto et al. (2006) five-parameter fit, Newton from the Batzelis (2017) start",
            lambda: fit_desoto2006(*args, start=start),
        ),
        (
            "De Soto et al. (2006) five-parameter fit (pvlib fit_desoto, Levenberg-Marquardt)",
            lambda: _fit_desoto_pvlib(module, alpha_a, beta_v),
        ),
        ("Batzelis (2017) explicit single-diode parameters", lambda: start),
    )
    worst = None
    for method, attempt in tries:
        p = attempt()
        if p is None:
            continue
        errs = _stc_errors(p, module)
        if errs is None:
            continue
        if max(abs(e) for e in errs) <= 100 * FIT_TOLERANCE:
            return DiodeParams(p["IL"], p["I0"], p["Rs"], p["Rsh"], p["a"], alpha_a, method, errs)
        worst = errs if worst is None else worst
    detail = (
        ""
        if worst is None
        else (
            " (best try: Vmp {:+.2f} %, Imp {:+.2f} %, Voc {:+.2f} %, Isc {:+.2f} %)".format(*worst)
        )
    )
    raise DesignError(
        "module-fit",
        "The single-diode model could not be fitted to this datasheet within 0.5 % at STC"
        f"{detail}: check Vmp, Imp, Voc, Isc and the Voc temperature coefficient.",
        field="module.vmp_v",
    )


# --------------------------------------------------------------- operating conditions


def calcparams_desoto(params: DiodeParams, irradiance_w_m2, cell_temp_c):
    """Translate the reference parameters to irradiance and cell temperature, De Soto [1]_.

    Returns (IL, I0, Rs, Rsh, a) arrays [A, A, ohm, ohm, V]; the air-mass
    modifier is taken as 1 (irradiance is effective irradiance).  Irradiance
    is floored at 1e-3 W/m2 so that Rsh stays finite; callers zero the
    results in the dark.
    """
    g = np.maximum(np.asarray(irradiance_w_m2, dtype=float), 1e-3)
    tk = np.asarray(cell_temp_c, dtype=float) + 273.15
    il = g / G_REF_W_M2 * (params.photocurrent_a + params.alpha_isc_a_per_c * (tk - T_REF_K))
    eg = EG_REF_EV * (1.0 + DEG_DT_PER_K * (tk - T_REF_K))
    i0 = (
        params.saturation_current_a
        * (tk / T_REF_K) ** 3
        * np.exp(EG_REF_EV / (BOLTZMANN_EV_PER_K * T_REF_K) - eg / (BOLTZMANN_EV_PER_K * tk))
    )
    rsh = params.shunt_resistance_ohm * G_REF_W_M2 / g
    a = params.modified_ideality_v * tk / T_REF_K
    rs = np.full(np.broadcast(g, tk).shape, params.series_resistance_ohm)
    return il, i0, rs, rsh, a


def bishop88(diode_voltage_v, il, i0, rs, rsh, a):
    """Current, voltage and power at a diode voltage Vd = V + I Rs, Bishop (1988) [3]_."""
    vd = np.asarray(diode_voltage_v, dtype=float)
    i = il - i0 * np.expm1(vd / a) - vd / rsh
    v = vd - i * rs
    return i, v, i * v


def open_circuit_voltage(il, i0, rsh, a, tol_v=1e-10, max_iter=100):
    """Voc [V]: root of IL - I0 (exp(V/a) - 1) - V/Rsh = 0.

    Newton from the ideal-diode Voc a ln(IL/I0 + 1), where the function is
    negative; it is concave and decreasing, so the iterates fall monotonically
    onto the root.
    """
    il, i0, rsh, a = np.broadcast_arrays(*(np.asarray(x, dtype=float) for x in (il, i0, rsh, a)))
    vd = a * np.log1p(np.maximum(il, 0.0) / i0)
    for _ in range(max_iter):
        e = np.exp(vd / a)
        f = il - i0 * (e - 1.0) - vd / rsh
        step = f / (i0 / a * e + 1.0 / rsh)
        vd = vd + step
        if np.all(np.abs(step) < tol_v):
            break
    return np.maximum(vd, 0.0)


def current_at_voltage(voltage_v, il, i0, rs, rsh, a, tol_v=1e-10, max_iter=200):
    """Module current [A] at terminal voltage V [V] (negative above Voc).

    Solves Vd - I(Vd) Rs = V for the diode voltage by Newton from
    Vd = V + IL Rs, where the function is non-negative; it is convex and
    increasing, so the iterates fall monotonically onto the root.  Add any
    external series resistance (wiring) to ``rs``.
    """
    v, il, i0, rs, rsh, a = np.broadcast_arrays(
        *(np.asarray(x, dtype=float) for x in (voltage_v, il, i0, rs, rsh, a))
    )
    vd = v + np.maximum(il, 0.0) * rs
    for _ in range(max_iter):
        e = np.exp(vd / a)
        i = il - i0 * (e - 1.0) - vd / rsh
        g = i0 / a * e + 1.0 / rsh
        step = (vd - i * rs - v) / (1.0 + rs * g)
        vd = vd - step
        if np.all(np.abs(step) < tol_v):
            break
    i, _, _ = bishop88(vd, il, i0, rs, rsh, a)
    return i


def max_power_point(il, i0, rs, rsh, a, tol_v=1e-10, max_iter=100):
    """Maximum power point (Vmp [V], Imp [A], Pmp [W]).

    Safeguarded Newton on dP/dVd = 0 in the Bishop (1988) parametrisation,
    bracketed by Vd = 0 (dP/dVd > 0) and Vd = Voc (dP/dVd < 0).
    """
    il, i0, rs, rsh, a = np.broadcast_arrays(
        *(np.asarray(x, dtype=float) for x in (il, i0, rs, rsh, a))
    )
    lo = np.zeros_like(il)
    hi = open_circuit_voltage(il, i0, rsh, a)
    vd = 0.8 * hi
    for _ in range(max_iter):
        e = np.exp(vd / a)
        i = il - i0 * (e - 1.0) - vd / rsh
        v = vd - i * rs
        g = i0 / a * e + 1.0 / rsh
        dg = i0 / (a * a) * e
        dp = i * (1.0 + rs * g) - v * g
        d2p = -2.0 * g * (1.0 + rs * g) + dg * (i * rs - v)
        lo = np.where(dp > 0, vd, lo)
        hi = np.where(dp > 0, hi, vd)
        new = vd - dp / d2p
        outside = ~((new > lo) & (new < hi)) | ~np.isfinite(new)
        new = np.where(outside, 0.5 * (lo + hi), new)
        step = np.abs(new - vd)
        vd = new
        if np.all(step < tol_v):
            break
    i, v, p = bishop88(vd, il, i0, rs, rsh, a)
    return v, i, p


def cell_temperature_ross(ambient_c, irradiance_w_m2, noct_c):
    r"""Cell temperature from Ross's model in its NOCT form [1]_ [2]_.

    .. math:: T_c = T_a + \frac{NOCT - 20}{800} G

    The rise over the air is proportional to the irradiance on the plane, with
    the constant k = (NOCT - 20 C) / 800 W/m2 fixed by the nominal operating cell
    temperature (800 W/m2, 20 C air, 1 m/s wind, open rack); the efficiency
    term of [2]_ eq. 23.3.3 is left out.  Same as ``pvlib.temperature.ross``
    with ``noct``.

    Parameters
    ----------
    ambient_c : float or array
        Air temperature [C].
    irradiance_w_m2 : float or array
        Irradiance on the plane of the array [W/m2]; broadcast against ``ambient_c``.
    noct_c : float
        Nominal operating cell temperature of the module [C].

    Returns
    -------
    numpy.ndarray
        Cell temperature [C].

    References
    ----------
    .. [1] Ross, R. G., "Interface design considerations for terrestrial solar cell
       modules", Proc. 12th IEEE Photovoltaic Specialists Conference, 1976, 801-806.
    .. [2] Duffie, J. A. and Beckman, W. A., Solar Engineering of Thermal Processes,
       4th ed., Wiley, 2013, eq. 23.3.3.
    """
    k = (noct_c - 20.0) / 800.0
    return np.asarray(ambient_c, dtype=float) + k * np.asarray(irradiance_w_m2, dtype=float)


@memoised
def module_mpp(params: DiodeParams, irradiance_w_m2, cell_temp_c):
    """(Vmp, Imp, Pmp) of one module at the conditions, zero in the dark."""
    g = np.asarray(irradiance_w_m2, dtype=float)
    v, i, p = max_power_point(*calcparams_desoto(params, g, cell_temp_c))
    lit = g > 0.5
    return np.where(lit, v, 0.0), np.where(lit, i, 0.0), np.where(lit, p, 0.0)


@memoised
def module_current(
    params: DiodeParams, voltage_v, irradiance_w_m2, cell_temp_c, extra_series_ohm=0.0
):
    """Current of one module held at ``voltage_v`` [A], clipped at zero, zero in the dark."""
    g = np.asarray(irradiance_w_m2, dtype=float)
    il, i0, rs, rsh, a = calcparams_desoto(params, g, cell_temp_c)
    i = current_at_voltage(voltage_v, il, i0, rs + extra_series_ohm, rsh, a)
    return np.where(g > 0.5, np.maximum(i, 0.0), 0.0)


def operating_point(
    params: DiodeParams, irradiance_w_m2: float, cell_temp_c: float, area_m2: float
) -> OperatingPoint:
    """Isc, Voc, MPP, fill factor and efficiency of one module at one condition."""
    if not irradiance_w_m2 > 0:
        raise DesignError("no-irradiance", "The design condition has no sunlight on the array.")
    il, i0, rs, rsh, a = calcparams_desoto(params, irradiance_w_m2, cell_temp_c)
    isc = float(current_at_voltage(0.0, il, i0, rs, rsh, a))
    voc = float(open_circuit_voltage(il, i0, rsh, a))
    vmp, imp, pmp = (float(x) for x in max_power_point(il, i0, rs, rsh, a))
    return OperatingPoint(
        float(irradiance_w_m2),
        float(cell_temp_c),
        isc,
        voc,
        imp,
        vmp,
        pmp,
        pmp / (isc * voc),
        pmp / (irradiance_w_m2 * area_m2),
    )


@memoised
def iv_curve(
    params: DiodeParams,
    irradiance_w_m2: float,
    cell_temp_c: float,
    area_m2: float,
    points: int = 61,
) -> IVCurve:
    """I-V and P-V curve of one module from 0 V to Voc at evenly spaced voltages."""
    op = operating_point(params, irradiance_w_m2, cell_temp_c, area_m2)
    il, i0, rs, rsh, a = calcparams_desoto(params, irradiance_w_m2, cell_temp_c)
    v = np.linspace(0.0, op.voc_v, points)
    i = np.maximum(current_at_voltage(v, il, i0, rs, rsh, a), 0.0)
    i[-1] = 0.0
    return IVCurve(op, tuple(v.tolist()), tuple(i.tolist()), tuple((v * i).tolist()))
