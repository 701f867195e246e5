"""The command line: ``calcreport new | check | solve | build | recheck | diff``.

Exit status: 0 success, 2 bad input or usage, 1 internal failure (``recheck`` and ``diff``
also exit 1 for a mismatch or a difference). Only this
module prints and exits; everything below it raises.
"""

from __future__ import annotations

import argparse
import gc
import hashlib
import json
import os
import re
import sys
import time
import warnings
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

from calcreport import __version__
from calcreport.errors import CalcreportError, ConvergenceError, InputError

__all__ = ["main"]

EXIT_OK = 0
EXIT_INTERNAL = 1
EXIT_INPUT = 2
EXIT_INTERRUPTED = 130  # 128 + SIGINT, as shells report an interrupted command

STARTER = Path(__file__).with_name("templates") / "starter.toml"
_ANYWHERE = "read a curve file the input names from outside the input's folder"


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> None:  # type: ignore[override]
        self.print_usage(sys.stderr)
        sys.stderr.write(f"calcreport: error: {message}\n")
        raise SystemExit(EXIT_INPUT)


def _parser() -> argparse.ArgumentParser:
    parser = _Parser(
        prog="calcreport",
        description="Pump-system calculations a reviewer can check: a TOML description of "
        "the system in, a solved step-by-step trace (and PDF report) out.",
    )
    parser.add_argument("--version", action="version", version=f"calcreport {__version__}")
    commands = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    commands.required = True

    new = commands.add_parser("new", help="write a commented starter input file")
    new.add_argument(
        "path",
        nargs="?",
        default="pump-system.toml",
        help="file to write (default: pump-system.toml)",
    )
    new.add_argument("--force", action="store_true", help="overwrite an existing file")

    check = commands.add_parser("check", help="validate an input file (exit 0 or 2)")
    check.add_argument("input", help="the input TOML file")
    check.add_argument("--files-anywhere", action="store_true", help=_ANYWHERE)

    solve = commands.add_parser("solve", help="solve and print a summary, or the trace JSON")
    solve.add_argument("input", help="the input TOML file")
    solve.add_argument("--files-anywhere", action="store_true", help=_ANYWHERE)
    solve.add_argument(
        "--json",
        action="store_true",
        help="print the trace JSON (format calcreport-trace/1) instead",
    )
    build = commands.add_parser("build", help="write the PDF report and the trace JSON")
    build.add_argument("input", help="the input TOML file")
    build.add_argument("--files-anywhere", action="store_true", help=_ANYWHERE)
    build.add_argument(
        "-o",
        "--output",
        metavar="DIR",
        help="folder for <input>.pdf, <input>.trace.json and <input>.pages.json (default: "
        "beside the input)",
    )
    build.add_argument(
        "--previous",
        metavar="TRACE",
        help="the previous revision's trace: adds a page of changes and marks every step "
        "whose value moved",
    )
    build.add_argument(
        "--listing",
        choices=("attached", "full"),
        default="attached",
        help="the full step listing of every state: attached to the PDF as a text file "
        "(default), or also printed as Appendix C",
    )
    study = commands.add_parser(
        "study",
        help="rank the offers and pipe sizes of the input's [study]: the report, the trace "
        "and a CSV of the table",
        description="Solve each offer and each pipe size of the input's [study] in full, "
        "rank them by life-cycle cost among those that pass, and write the report of the "
        "selected design (its Choice chapter holds the study), the trace, the page map and "
        "<input>.study.csv, the table of every offer and size.",
    )
    study.add_argument("input", help="the input TOML file, with a [study] table")
    study.add_argument("--files-anywhere", action="store_true", help=_ANYWHERE)
    study.add_argument(
        "-o",
        "--output",
        metavar="DIR",
        help="folder for the files (default: beside the input)",
    )
    study.set_defaults(previous=None, listing="attached")  # a build's, with no revision
    from calcreport.recheck import SCOPE as RECHECK_SCOPE

    recheck = commands.add_parser(
        "recheck",
        help="recompute every step of a trace JSON from its recorded arguments (exit 0, 1 or 2)",
        description="Recompute every step of a trace JSON from its recorded arguments. "
        f"{RECHECK_SCOPE} Exit status: 0 every step confirmed, 1 a step does not match, "
        "2 the file is not a readable trace.",
    )
    recheck.add_argument("trace", metavar="TRACE.json", help="a trace JSON file")
    recheck.add_argument(
        "--tolerance",
        metavar="REL",
        type=_tolerance,
        default=1e-9,
        help="relative tolerance of each comparison (default 1e-9; values within 1e-12 of "
        "each other always agree)",
    )
    recheck.add_argument(
        "--json", action="store_true", help="print the structured report as JSON instead"
    )
    diff = commands.add_parser(
        "diff",
        help="compare two trace JSON files: inputs, results, checks, steps (exit 0, 1 or 2)",
        description="Compare two trace JSON files of one system and list what changed: "
        "inputs added, removed or changed; results that moved; checks whose status or value "
        "changed; steps added or removed; project details such as the revision and date. "
        "Exit status: 0 no differences, 1 differences, 2 a file is not a readable trace.",
    )
    diff.add_argument("old", metavar="OLD.trace.json", help="the earlier trace JSON")
    diff.add_argument("new", metavar="NEW.trace.json", help="the later trace JSON")
    diff.add_argument("--json", action="store_true", help="print the differences as JSON")
    return parser


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit status."""
    args = _parser().parse_args(argv)
    try:
        with warnings.catch_warnings():
            # Array sweeps meet 0/0 at zero flow and mask it; numpy's notice of it is noise.
            warnings.simplefilter("ignore", RuntimeWarning)
            return int(_COMMANDS[args.command](args))
    except KeyboardInterrupt:
        sys.stderr.write("calcreport: interrupted; nothing was written.\n")
        return EXIT_INTERRUPTED
    except InputError as exc:
        sys.stderr.write(terminal_safe(f"{exc}\n"))
        return EXIT_INPUT
    except ConvergenceError as exc:
        sys.stderr.write(terminal_safe(f"calcreport: {exc}\n"))
        return EXIT_INTERNAL
    except CalcreportError as exc:
        sys.stderr.write(terminal_safe(f"calcreport: {exc}\n"))
        return EXIT_INPUT
    except OSError as exc:
        where = f" {exc.filename}" if exc.filename else ""
        sys.stderr.write(f"calcreport: cannot write or read{where}: {exc.strerror or exc}.\n")
        return EXIT_INPUT
    except Exception as exc:  # a defect of ours, not the user's: say so in one line
        if os.environ.get("CALCREPORT_DEBUG"):
            raise
        sys.stderr.write(
            f"calcreport: internal error ({type(exc).__name__}: {exc}). Nothing was written. "
            "This is a defect in calcreport; set CALCREPORT_DEBUG=1 for the details and "
            "report it with the input file.\n"
        )
        return EXIT_INTERNAL


_CONTROL = re.compile(r"[\x00-\x08\x0b-\x1f\x7f-\x9f]")


def terminal_safe(text: str) -> str:
    """``text`` with every control character but the line break and tab shown as an escape
    (``\\x1b``), so that no value read from a file can move the cursor or repaint a line."""
    return _CONTROL.sub(lambda m: f"\\x{ord(m.group(0)):02x}", text)


def _new(args: argparse.Namespace) -> int:
    target = Path(args.path)
    if target.is_symlink():
        sys.stderr.write(
            f"calcreport: {target} is a symbolic link; new writes a file of its own, not "
            "through a link: choose another name\n"
        )
        return EXIT_INPUT
    if target.exists() and not args.force:
        sys.stderr.write(f"calcreport: {target} exists; choose another name or use --force\n")
        return EXIT_INPUT
    target.write_text(STARTER.read_text(encoding="utf-8"), encoding="utf-8")
    print(f"wrote {target}: edit it, then run `calcreport solve {target}`")
    return EXIT_OK


def _check(args: argparse.Namespace) -> int:
    from calcreport.model.loader import load

    model = load(args.input, args.files_anywhere)
    print(f"{args.input}: valid ({len(model.pipes)} pipes)")
    return EXIT_OK


def _solve(args: argparse.Namespace) -> int:
    from calcreport.model.loader import load
    from calcreport.solver import solve

    trace = solve(load(args.input, args.files_anywhere))
    if args.json:
        sys.stdout.write(trace.dumps())
    else:
        sys.stdout.write(terminal_safe(summary(trace.to_json())))
    return EXIT_OK


def _build(args: argparse.Namespace) -> int:
    tell = _progress(sys.stderr)
    try:
        return _build_with(args, tell)
    finally:
        tell("")  # the status line goes before any message that follows it


def _study(args: argparse.Namespace) -> int:
    tell = _progress(sys.stderr)
    try:
        return _build_with(args, tell, study=True)
    finally:
        tell("")


def _build_with(args: argparse.Namespace, tell: Callable[[str], None], study: bool = False) -> int:
    from calcreport.model.loader import load
    from calcreport.output import write_all
    from calcreport.report import render
    from calcreport.solver import solve

    source = Path(args.input)
    tell("reading the input")
    model = load(source, args.files_anywhere)
    if study and model.study is None:
        sys.stderr.write(
            f"{source}: the input has no [study] table: give [[study.candidate]] offers or "
            "[[study.pipe_size]] sizes to compare (calcreport build reports one design)\n"
        )
        return EXIT_INPUT
    tell(f"solving {len(model.pipes)} pipe{'s' if len(model.pipes) != 1 else ''}")
    trace = solve(model, tell)
    folder = Path(args.output) if args.output else source.parent
    if folder.exists() and not folder.is_dir():
        sys.stderr.write(f"calcreport: the output {folder} exists and is not a folder\n")
        return EXIT_INPUT
    previous = None
    if args.previous:
        from calcreport.tracefile import read_trace

        previous = read_trace(args.previous)
    pdf = folder / f"{source.stem}.pdf"
    trace_file = folder / f"{source.stem}.trace.json"
    pages_file = folder / f"{source.stem}.pages.json"
    data = trace.to_json()
    text = trace.dumps()
    # The imported stack and the trace live to the end of the run: frozen, they are not
    # rescanned by every collection the rendering triggers (about a tenth of a build).
    gc.freeze()
    rendered = render(
        data,
        model.text,
        previous,
        _attachments(model, trace_file.name, text),
        args.listing,
        tell,
    )
    pages = {
        "format": "calcreport-pages/1",
        "trace_sha256": _sha256(text),
        "pdf_sha256": hashlib.sha256(rendered.pdf).hexdigest(),
        "steps": rendered.step_pages,
        "links": rendered.links,
    }
    files = {
        pdf: rendered.pdf,
        trace_file: text.encode("utf-8"),
        pages_file: (json.dumps(pages, indent=1) + "\n").encode("utf-8"),
    }
    if study:
        from calcreport.report.study_table import study_csv

        files[folder / f"{source.stem}.study.csv"] = study_csv(data).encode("utf-8")
    write_all(files, protect=source)
    tell("")
    *first, last = [str(path) for path in files]
    print(f"wrote {', '.join(first)} and {last}")
    return EXIT_OK


def _progress(stream: Any) -> Callable[[str], None]:
    """A reporter of a build's stages: on an interactive terminal one status line, each
    stage overwriting the last and the empty stage clearing it; elsewhere (a pipe, a file,
    CI) nothing, so that scripted output stays clean."""
    if not (hasattr(stream, "isatty") and stream.isatty()):
        return lambda stage: None
    started = time.monotonic()

    def tell(stage: str) -> None:
        line = f"calcreport: {stage}… ({time.monotonic() - started:.1f} s)" if stage else ""
        stream.write("\r\x1b[K" + line)
        stream.flush()

    return tell


def _attachments(model: Any, trace_name: str, trace_text: str) -> tuple[Any, ...]:
    """The files the report carries: the input and the curve files as read (the bytes
    whose SHA-256 the trace records) and the trace itself."""
    from calcreport.report.archive import Attachment

    name = Path(model.path).name or "input.toml"
    items = [Attachment(name, model.raw, "text/plain", "Source", "The input (TOML) as read")]
    taken = {name, trace_name}
    for record, data in zip(model.files, model.file_bytes, strict=True):
        base = Path(record["path"]).name
        attached_as, n = base, 1
        while attached_as in taken:  # two curve files of one name from different folders
            n += 1
            attached_as = f"{Path(base).stem}-{n}{Path(base).suffix}"
        taken.add(attached_as)
        items.append(
            Attachment(attached_as, data, "text/csv", "Source", f"The {record['role']} as read")
        )
    items.append(
        Attachment(
            trace_name,
            trace_text.encode("utf-8"),
            "application/json",
            "Data",
            "The trace: every step's equation, arguments and result",
        )
    )
    return tuple(items)


def _sha256(text: str) -> str:
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _tolerance(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"{text!r} is not a number") from None
    if not (0 <= value < 1):
        raise argparse.ArgumentTypeError(f"{text!r} is not a relative tolerance from 0 to 1")
    return value


def _recheck(args: argparse.Namespace) -> int:
    import json

    from calcreport.recheck import recheck_file, render_text

    report = recheck_file(args.trace, args.tolerance)
    if args.json:
        sys.stdout.write(json.dumps(report.to_json(), indent=1, ensure_ascii=False) + "\n")
    else:
        sys.stdout.write(terminal_safe(render_text(report)))
    return EXIT_OK if report.ok else EXIT_INTERNAL


def _diff(args: argparse.Namespace) -> int:
    import json

    from calcreport.diff import diff_files, render_text

    report = diff_files(args.old, args.new)
    if args.json:
        sys.stdout.write(json.dumps(report.to_json(), indent=1, ensure_ascii=False) + "\n")
    else:
        sys.stdout.write(terminal_safe(render_text(report)))
    return EXIT_OK if report.identical else EXIT_INTERNAL


_COMMANDS = {
    "new": _new,
    "check": _check,
    "solve": _solve,
    "build": _build,
    "study": _study,
    "recheck": _recheck,
    "diff": _diff,
}

# Result key → (label, kind of quantity for display).
_SUMMARY_ROWS = (
    ("flow", "Flow (operating point when a curve is given)", "flow"),
    ("static_head", "Static head", "length"),
    ("pressure_head", "Pressure head", "length"),
    ("friction_loss", "Friction loss", "length"),
    ("minor_loss", "Minor and equipment losses", "length"),
    ("outlet_velocity_head", "Outlet velocity head", "length"),
    ("total_dynamic_head", "Total dynamic head (TDH)", "length"),
    ("npsh_available", "NPSH available", "length"),
    ("barometric_pressure", "Barometric pressure (absolute)", "pressure"),
    ("hydraulic_power", "Hydraulic power", "power"),
    ("shaft_power", "Shaft power", "power"),
    ("electrical_power", "Electrical input power", "power"),
)


def summary(trace: dict[str, Any]) -> str:
    """A readable summary of a trace in the report's unit system."""
    from calcreport.units import display_unit, fmt, pretty_unit, show, to_display

    system = trace["project"]["units"]
    results = trace["results"]

    lines = [trace["project"]["title"], ""]
    width = max(len(label) for _, label, _ in _SUMMARY_ROWS) + 2
    for key, label, kind in _SUMMARY_ROWS:
        if key in results:
            lines.append(f"  {label:<{width}}{show(results[key], kind, system)}")
    point = results.get("operating_point", {})
    for key, label, kind in (
        ("efficiency", "Pump efficiency", None),
        ("npsh_required", "NPSH required", "length"),
        ("npsh_margin_ratio", "NPSH margin ratio NPSHa/NPSHr", None),
    ):
        if key in point:
            shown = show(point[key], kind, system) if kind else fmt(point[key]["value"], 4)
            lines.append(f"  {label:<{width}}{shown}")
    motor = results.get("motor", {})
    if "rated_power" in motor:
        lines.append(
            f"  {'Motor rating (' + motor['series'] + ')':<{width}}"
            f"{show(motor['rated_power'], 'power', system)}"
        )
    energy = results.get("energy", {})
    if "annual_energy" in energy:
        lines.append(
            f"  {'Annual energy':<{width}}{show(energy['annual_energy'], 'energy', system)}"
        )
    if "annual_cost" in energy:
        cost = energy["annual_cost"]
        lines.append(f"  {'Annual energy cost':<{width}}{cost['value']:,.0f} {cost['unit']}")
    route = results.get("route", {})
    if "min_pressure_head" in route:
        lines.append(
            f"  {'Lowest pressure head (gauge)':<{width}}"
            f"{show(route['min_pressure_head'], 'length', system)} at "
            f"{route['min_pressure_node']} ({route['min_pressure_case']})"
        )
    if "max_pressure" in route:
        lines.append(
            f"  {'Highest pressure (gauge)':<{width}}"
            f"{show(route['max_pressure'], 'pressure', system)} at {route['max_pressure_node']}"
        )
    if "verdict" in results.get("surge", {}):
        lines.append(f"  {'Surge':<{width}}{results['surge']['verdict']}")
    lines += ["", "  Pipes:"]
    header = f"    {'id':<8}{'v':>10}{'Re':>10}{'f':>9}{'ΣK':>8}{'h_f':>10}{'h_m':>10}"
    lines.append(header)
    vel, length = display_unit("velocity", system), display_unit("length", system)
    for ident, p in results["pipes"].items():
        lines.append(
            f"    {ident:<8}"
            f"{fmt(to_display(p['velocity']['value'], 'm/s', vel), 3):>10}"
            f"{p['reynolds']['value']:>10.3g}"
            f"{p['friction_factor']['value']:>9.4f}"
            f"{p['k_total']['value']:>8.3g}"
            f"{fmt(to_display(p['friction_loss']['value'], 'm', length), 3):>10}"
            f"{fmt(to_display(p['minor_loss']['value'], 'm', length), 3):>10}"
        )
    lines.append(f"    (v in {pretty_unit(vel)}, heads in {length})")
    lines += ["", "  Checks:"]
    for check in trace["checks"]:
        message = f" — {check['message']}" if check["message"] else ""
        lines.append(f"    [{check['status']:<6}] {check['title']} ({check['case']}){message}")
    for note in trace["notes"]:
        lines.append(f"  Note: {note}")
    status = trace["status"]
    lines += ["", f"  Status: {status['value']} — {status['reason']}", ""]
    return "\n".join(lines)
