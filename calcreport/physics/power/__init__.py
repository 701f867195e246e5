"""Power and energy of a pump: hydraulic, shaft and electrical; energy and cost.

Power
    hydraulic_power, shaft_power, electrical_power, wire_to_water_power, peak_shaft_power,
    per_pump_power
Energy
    hours_to_seconds, fill_time, annual_energy, specific_energy
Duty profile
    profile_energy, profile_volume, energy_per_volume, throttling_power, peak_power, time_sum,
    energy_saving
Cost
    annual_cost, demand_cost, cost_sum, present_value, life_cycle_cost, length_cost
"""

from __future__ import annotations

from calcreport.physics.power.chain import (
    electrical_power,
    hydraulic_power,
    peak_power,
    peak_shaft_power,
    per_pump_power,
    shaft_power,
    wire_to_water_power,
)
from calcreport.physics.power.cost import (
    annual_cost,
    cost_sum,
    demand_cost,
    length_cost,
    life_cycle_cost,
    present_value,
)
from calcreport.physics.power.energy import (
    annual_energy,
    energy_per_volume,
    energy_saving,
    fill_time,
    hours_to_seconds,
    profile_energy,
    profile_volume,
    specific_energy,
    throttling_power,
    time_sum,
)

__all__ = [
    "annual_cost",
    "annual_energy",
    "cost_sum",
    "demand_cost",
    "electrical_power",
    "energy_per_volume",
    "energy_saving",
    "fill_time",
    "hours_to_seconds",
    "hydraulic_power",
    "length_cost",
    "life_cycle_cost",
    "peak_power",
    "peak_shaft_power",
    "per_pump_power",
    "present_value",
    "profile_energy",
    "profile_volume",
    "shaft_power",
    "specific_energy",
    "throttling_power",
    "time_sum",
    "wire_to_water_power",
]
