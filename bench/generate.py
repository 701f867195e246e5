"""Synthetic systems for the benchmark: a long rising main as many profile segments."""

from __future__ import annotations

import sys
from pathlib import Path

HEAD = """format = 1

[project]
title = "Benchmark: rising main of {n} segments"
calc_id = "BENCH-{n}"
revision = "A"
date = 2026-12-01
units = "SI"

[fluid]
kind = "water"
temperature = "15 degC"

[duty]
flow = "45 L/s"

[site]
elevation = "120 m"

[source]
level = "121.0 m"
level_low = "120.2 m"

[destination]
level = "{top:.1f} m"

[pump]
elevation = "119.5 m"
efficiency = 0.76

[motor]
efficiency = 0.94

[operation]
hours_per_year = 5000
energy_price = 0.12
currency = "USD"

[[pipe]]
id = "S1"
side = "suction"
length = "8 m"
inner_diameter = "254.5 mm"
roughness = "0.045 mm"
fittings = [{{ K = 0.5, note = "entrance" }}, {{ K = 0.2, note = "elbow" }}]
"""

SEGMENT = """
[[pipe]]
id = "D{i}"
side = "discharge"
length = "{length:.1f} m"
inner_diameter = "202.7 mm"
roughness = "0.1 mm"
elevation_start = "{z0:.2f} m"
elevation_end = "{z1:.2f} m"
fittings = [{{ K = 0.15, note = "joint and bend allowance" }}{exit}]
"""


def system(segments: int, segment_length: float = 60.0) -> str:
    """An input of ``segments`` discharge pipes of ``segment_length`` each."""
    rise = 0.04 * segment_length
    parts = [HEAD.format(n=segments, top=119.7 + rise * segments + 2.0)]
    for i in range(1, segments + 1):
        last = i == segments
        parts.append(
            SEGMENT.format(
                i=i,
                length=segment_length,
                z0=119.7 + rise * (i - 1),
                z1=119.7 + rise * i,
                exit=', { K = 1.0, note = "exit" }' if last else "",
            )
        )
    return "".join(parts)


if __name__ == "__main__":
    count = int(sys.argv[1])
    Path(sys.argv[2]).write_text(system(count), encoding="utf-8")
