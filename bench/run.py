"""Run the benchmark table: each row's median time as a ratio to the floor's.

    python bench/run.py [--runs N]

Rows are run interleaved (floor, then each row, N rounds) so drifts of the
machine hit all of them alike. Times are wall-clock of whole processes
(start-up included); memory is each process's peak resident set (wait4).
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(HERE))

from generate import design, study, system  # noqa: E402

DEMO = ROOT / "input_examples" / "reservoir_fill_si.toml"


def _measure(command: list[str]) -> tuple[float, float]:
    """Wall time [s] and peak RSS [MiB] of one process."""
    start = time.perf_counter()
    process = subprocess.Popen(command, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    _, status, usage = os.wait4(process.pid, 0)
    elapsed = time.perf_counter() - start
    process.returncode = os.waitstatus_to_exitcode(status)
    if process.returncode != 0:
        raise SystemExit(f"{' '.join(command)} failed: {process.stderr.read().decode()}")
    return elapsed, usage.ru_maxrss / 1024.0


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=7, help="rounds (default 7)")
    args = parser.parse_args()
    work = Path(tempfile.mkdtemp(prefix="calcreport-bench-"))
    big40, big500 = work / "system40.toml", work / "system500.toml"
    big40.write_text(system(40), encoding="utf-8")
    big500.write_text(system(500), encoding="utf-8")
    one, offers = work / "design.toml", work / "study.toml"
    one.write_text(design(), encoding="utf-8")
    offers.write_text(study(10, 8), encoding="utf-8")
    py = sys.executable
    rows = {
        "floor": ([py, str(HERE / "floor.py"), str(work / "floor.pdf")], None),
        "build demo": ([py, "-m", "calcreport", "build", str(DEMO), "-o", str(work)], 2.5),
        "solve --json demo": ([py, "-m", "calcreport", "solve", str(DEMO), "--json"], 0.7),
        "build 40 pipes": ([py, "-m", "calcreport", "build", str(big40), "-o", str(work)], 4.0),
        "solve --json 500 pipes": ([py, "-m", "calcreport", "solve", str(big500), "--json"], 1.0),
        "solve --json design": ([py, "-m", "calcreport", "solve", str(one), "--json"], None),
        "solve --json study 10x8": ([py, "-m", "calcreport", "solve", str(offers), "--json"], None),
    }
    times: dict[str, list[float]] = {name: [] for name in rows}
    memory: dict[str, list[float]] = {name: [] for name in rows}
    for _ in range(args.runs):
        for name, (command, _) in rows.items():
            elapsed, rss = _measure(command)
            times[name].append(elapsed)
            memory[name].append(rss)
    floor = statistics.median(times["floor"])
    floor_mem = statistics.median(memory["floor"])
    print(f"{'work':<24}{'median s':>10}{'min–max s':>16}{'ratio':>8}{'target':>8}{'peak MiB':>10}")
    failed = False
    for name, (_, target) in rows.items():
        med = statistics.median(times[name])
        ratio = med / floor
        ok = target is None or ratio <= target
        failed |= not ok
        span = f"{min(times[name]):.2f}–{max(times[name]):.2f}"
        goal = "" if target is None else f"≤{target:g}"
        print(
            f"{name:<24}{med:>10.3f}{span:>16}{ratio:>8.2f}{goal:>8}"
            f"{statistics.median(memory[name]):>10.0f}{'' if ok else '  OVER'}"
        )
    demo_mem = statistics.median(memory["build demo"]) / floor_mem
    print(f"{'peak memory, demo build':<24}{'':>10}{'':>16}{demo_mem:>8.2f}{'≤2':>8}")
    failed |= demo_mem > 2.0
    # A study of 10 offers and 8 main sizes against the one design it studies (not the floor).
    alone = statistics.median(times["solve --json study 10x8"]) / statistics.median(
        times["solve --json design"]
    )
    print(f"{'study 10x8 / design':<24}{'':>10}{'':>16}{alone:>8.2f}{'≤2':>8}"
          f"{'' if alone <= 2.0 else '            OVER'}")  # fmt: skip
    failed |= alone > 2.0
    print(
        f"\n{args.runs} interleaved rounds; ratios are to the floor's median "
        f"({floor:.3f} s, {floor_mem:.0f} MiB)."
    )
    raise SystemExit(1 if failed else 0)


if __name__ == "__main__":
    main()
