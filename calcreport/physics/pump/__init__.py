"""Pump performance: curve interpolation, affinity laws, operating point, NPSH margin.

Curves
    head_at, efficiency_at, npsh_required_at, best_efficiency_point, monotone_cubic
Speed
    affinity_flow, affinity_head, specific_speed, lift_speed
Operating point
    operating_point, solved_flow, head_balance
Impeller trim
    trimmed_flow, trimmed_head
Several pumps
    pumps_running, per_pump_flow, series_head
NPSH
    npsh_margin, npsh_margin_ratio

Curves are interpolated by the monotone piecewise-cubic Hermite method of
Fritsch and Carlson (slopes by the weighted harmonic mean of Fritsch and
Butland), which passes through every given point and never overshoots
between them; a curve is never extrapolated past its first or last point.
"""

from __future__ import annotations

from calcreport.physics.pump.arrangement import per_pump_flow, pumps_running, series_head
from calcreport.physics.pump.balance import (
    head_balance,
    operating_point,
    solved_flow,
    throttling_loss,
)
from calcreport.physics.pump.curve import (
    best_efficiency_point,
    curve_max_head,
    efficiency_at,
    efficiency_from_power,
    head_at,
    monotone_cubic,
    npsh_required_at,
)
from calcreport.physics.pump.npsh import npsh_margin, npsh_margin_ratio, npsh_needed
from calcreport.physics.pump.region import flow_ratio, region_flow, temperature_rise, thermal_flow
from calcreport.physics.pump.speed import (
    affinity_flow,
    affinity_head,
    lift_speed,
    solved_speed,
    specific_speed,
)
from calcreport.physics.pump.trim import trimmed_flow, trimmed_head

__all__ = [
    "affinity_flow",
    "affinity_head",
    "best_efficiency_point",
    "curve_max_head",
    "efficiency_at",
    "efficiency_from_power",
    "flow_ratio",
    "head_at",
    "head_balance",
    "lift_speed",
    "monotone_cubic",
    "npsh_margin",
    "npsh_margin_ratio",
    "npsh_needed",
    "npsh_required_at",
    "operating_point",
    "per_pump_flow",
    "pumps_running",
    "region_flow",
    "series_head",
    "solved_flow",
    "solved_speed",
    "specific_speed",
    "temperature_rise",
    "thermal_flow",
    "throttling_loss",
    "trimmed_flow",
    "trimmed_head",
]
