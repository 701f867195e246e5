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


EXAMPLE = Path(__file__).resolve().parent.parent / "input_examples" / "pump_offers.toml"
_SIZES = ("4", "5", "6", "8", "10", "12", "14", "16")


def design() -> str:
    """The offers example's system with no study: the single design a study is timed against
    (a three-point variable-speed profile)."""
    text = EXAMPLE.read_text(encoding="utf-8")
    head, _, rest = text.partition("\n[study]")
    return head + "\n[surge]" + rest.partition("\n[surge]")[2]


def study(candidates: int = 10, sizes: int = 8) -> str:
    """That design with ``candidates`` offers (the [pump] curve scaled in flow and head)
    and ``sizes`` sizes of its discharge main."""
    parts = [design(), "\n[study]\n"]
    for n in range(candidates):
        q, h = 0.9 + 0.04 * n, 0.97 + 0.02 * n  # from a small pump to a large one
        flows = ", ".join(f"{v * q:.3f}" for v in (0, 10, 20, 30, 40, 50))
        heads = ", ".join(f"{v * h:.3f}" for v in (36.0, 35.4, 33.6, 30.4, 25.8, 19.6))
        parts.append(
            f'\n[[study.candidate]]\nid = "K{n + 1}"\ncapital_cost = {9000 + 1200 * n}\n'
            f'[study.candidate.curve]\nspeed = "1480 rpm"\n'
            f'flow = {{ unit = "L/s", values = [{flows}] }}\n'
            f'head = {{ unit = "m", values = [{heads}] }}\n'
            "efficiency = [0.0, 0.52, 0.72, 0.80, 0.78, 0.66]\n"
            'npsh_required = { unit = "m", values = [1.6, 1.8, 2.3, 3.1, 4.3, 6.0] }\n'
        )
    rows = ",\n".join(
        f'  {{ nominal_size = "{s}", schedule = "40", cost_per_length = {60 + 25 * i} }}'
        for i, s in enumerate(_SIZES[:sizes])
    )
    parts.append(f'\n[[study.pipe_size]]\npipes = ["D1", "D2"]\nsizes = [\n{rows},\n]\n')
    return "".join(parts)
