"""Pipe hydraulics: friction head, minor losses, velocity, total dynamic head, energy.

Vectorised over flow.  References:

* Darcy-Weisbach head loss hf = f (L/D) v^2 / (2 g), with the Swamee & Jain (1976)
  explicit friction factor f = 0.25 / log10(e/(3.7 D) + 5.74 / Re^0.9)^2 in turbulent flow
  (P. K. Swamee and A. K. Jain, "Explicit equations for pipe-flow problems", J. Hydraulics
  Div. ASCE 102 (1976) 657-664, eq. 5) and f = 64/Re in laminar flow (Re < 2000); between
  2000 and 4000 the turbulent value is used (conservative; common practice, no source).
* Hazen-Williams (SI): hf = 10.67 L Q^1.852 / (C^1.852 D^4.8704) (from memory; widely
  published form for water near room temperature).
* Minor losses hm = K v^2 / (2 g).
* Hydraulic energy E = rho g V H: 2.725 Wh per m3 per m with rho = 1000 kg/m3, g = 9.81.
"""

from __future__ import annotations

import numpy as np

RHO_WATER_KG_M3 = 1000.0
G_M_S2 = 9.81
NU_WATER_M2_S = 1.004e-6  # kinematic viscosity of water at 20 C (from memory)
# Absolute roughness [m] (Moody's chart values, from memory) and Hazen-Williams C (from memory)
ROUGHNESS_M = {"pvc": 1.5e-6, "hdpe": 1.5e-6, "steel": 4.5e-5, "galvanised": 1.5e-4}
HAZEN_WILLIAMS_C = {"pvc": 150.0, "hdpe": 150.0, "steel": 130.0, "galvanised": 100.0}
VELOCITY_LOW_M_S = 0.5  # delivery-main velocity band (common practice, no source)
VELOCITY_HIGH_M_S = 2.0
WH_PER_M3_M = RHO_WATER_KG_M3 * G_M_S2 / 3600.0  # 2.725 Wh per m3 lifted 1 m


def velocity_m_s(flow_m3_h, diameter_m):
    """Mean velocity in a full round pipe [m/s]."""
    q = np.asarray(flow_m3_h, dtype=float) / 3600.0
    return q / (np.pi * diameter_m**2 / 4.0)


def reynolds(velocity, diameter_m, nu_m2_s=NU_WATER_M2_S):
    """Reynolds number v D / nu."""
    return np.asarray(velocity, dtype=float) * diameter_m / nu_m2_s


def friction_factor_swamee_jain(re, relative_roughness):
    """Darcy friction factor: 64/Re below Re 2000, Swamee & Jain (1976) eq. 5 above."""
    re = np.maximum(np.asarray(re, dtype=float), 1e-9)
    turb = 0.25 / np.log10(relative_roughness / 3.7 + 5.74 / re**0.9) ** 2
    return np.where(re < 2000.0, 64.0 / re, turb)


def darcy_weisbach_head_m(flow_m3_h, length_m, diameter_m, roughness_m, nu_m2_s=NU_WATER_M2_S):
    """Friction head hf = f (L/D) v^2 / (2 g) [m]; 0 at no flow."""
    v = velocity_m_s(flow_m3_h, diameter_m)
    f = friction_factor_swamee_jain(reynolds(v, diameter_m, nu_m2_s), roughness_m / diameter_m)
    return np.where(v > 0, f * length_m / diameter_m * v**2 / (2.0 * G_M_S2), 0.0)


def hazen_williams_head_m(flow_m3_h, length_m, diameter_m, c):
    """Friction head, Hazen-Williams SI form [m]."""
    q = np.maximum(np.asarray(flow_m3_h, dtype=float), 0.0) / 3600.0
    return 10.67 * length_m * q**1.852 / (c**1.852 * diameter_m**4.8704)


def minor_loss_head_m(flow_m3_h, diameter_m, k_sum):
    """Fittings loss K v^2 / (2 g) [m]."""
    return k_sum * velocity_m_s(flow_m3_h, diameter_m) ** 2 / (2.0 * G_M_S2)


def hydraulic_energy_wh(volume_m3, head_m):
    """Energy given to the water, rho g V H / 3600 [Wh]."""
    return WH_PER_M3_M * np.asarray(volume_m3, dtype=float) * np.asarray(head_m, dtype=float)


def drawdown_at_m(flow_m3_h, drawdown_m, test_rate_m3_h):
    """Drawdown at a pumping rate, linear in the rate from the test point (common practice,
    no source: a confined-aquifer first estimate; the borehole's step test is better)."""
    return drawdown_m * np.asarray(flow_m3_h, dtype=float) / test_rate_m3_h


def friction_head_m(supply, flow_m3_h):
    """Pipe friction head of a supply at the flows [m], by its chosen method."""
    d = supply.pipe_diameter_mm / 1000.0
    if supply.friction_method == "hazen_williams":
        return hazen_williams_head_m(
            flow_m3_h, supply.pipe_length_m, d, HAZEN_WILLIAMS_C[supply.pipe_material]
        )
    return darcy_weisbach_head_m(
        flow_m3_h, supply.pipe_length_m, d, ROUGHNESS_M[supply.pipe_material]
    )


def total_dynamic_head_m(supply, flow_m3_h):
    """Static level + drawdown + tank height + friction + minor losses [m] at the flows."""
    q = np.asarray(flow_m3_h, dtype=float)
    d = supply.pipe_diameter_mm / 1000.0
    return (
        supply.static_level_m
        + drawdown_at_m(q, supply.drawdown_m, supply.drawdown_test_m3_h)
        + supply.tank_height_m
        + friction_head_m(supply, q)
        + minor_loss_head_m(q, d, supply.minor_loss_k)
    )
