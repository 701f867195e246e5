"""The package's layout: stages that import in one direction, a solve stage free of the
report's libraries, and modules of a size a reader takes in."""

from __future__ import annotations

import ast
import subprocess
import sys
from pathlib import Path

PACKAGE = Path(__file__).parents[2] / "calcreport"


def _modules() -> dict[str, Path]:
    found = {}
    for path in PACKAGE.rglob("*.py"):
        name = ".".join(path.relative_to(PACKAGE.parent).with_suffix("").parts)
        found[name.removesuffix(".__init__")] = path
    return found


def _imports(modules: dict[str, Path]) -> dict[str, set[str]]:
    """Module-level imports of calcreport modules (imports inside a function are lazy on
    purpose and do not run at import time)."""
    graph: dict[str, set[str]] = {}
    for name, path in modules.items():
        edges = graph.setdefault(name, set())
        for node in ast.parse(path.read_text(encoding="utf-8")).body:
            if isinstance(node, ast.ImportFrom) and (node.module or "").startswith("calcreport"):
                for alias in node.names:
                    full = f"{node.module}.{alias.name}"
                    edges.add(full if full in modules else str(node.module))
            elif isinstance(node, ast.Import):
                edges |= {a.name for a in node.names if a.name.startswith("calcreport")}
    return graph


def _cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """Import cycles of ``graph``, leaving out a package importing its own modules."""
    state: dict[str, int] = {}
    cycles = []

    def visit(name: str, path: list[str]) -> None:
        state[name] = 1
        path.append(name)
        for dep in sorted(graph.get(name, ())):
            if dep not in graph or dep.startswith(name + ".") or name.startswith(dep + "."):
                continue
            if state.get(dep) == 1:
                cycles.append(path[path.index(dep) :] + [dep])
            elif dep not in state:
                visit(dep, path)
        path.pop()
        state[name] = 2

    for name in sorted(graph):
        if name not in state:
            visit(name, [])
    return cycles


def test_no_module_level_import_cycle():
    assert _cycles(_imports(_modules())) == []


def test_the_cycle_finder_sees_a_cycle(tmp_path, monkeypatch):
    """The test above can fail: two modules importing each other are a cycle; a package
    importing its own module is not."""
    pkg = tmp_path / "calcreport"
    (pkg / "sub").mkdir(parents=True)
    (pkg / "__init__.py").write_text("")
    (pkg / "sub" / "__init__.py").write_text("from calcreport.sub.c import z\n")
    (pkg / "sub" / "c.py").write_text("z = 1\n")
    (pkg / "a.py").write_text("from calcreport.b import x\n")
    (pkg / "b.py").write_text("from calcreport.a import y\n")
    monkeypatch.setattr(sys.modules[__name__], "PACKAGE", pkg)
    assert _cycles(_imports(_modules())) == [["calcreport.a", "calcreport.b", "calcreport.a"]]


def test_solving_imports_neither_the_pdf_nor_the_plotting_library():
    script = (
        "import sys; from calcreport.model.loader import load; from calcreport.solver import "
        f"solve; solve(load({str(PACKAGE.parent / 'input_examples' / 'check_case.toml')!r})); "
        "print(sorted({m.split('.')[0] for m in sys.modules} & {'reportlab', 'matplotlib'}))"
    )
    run = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True)
    assert run.returncode == 0, run.stderr
    assert run.stdout.strip() == "[]"


def test_no_code_module_runs_past_about_six_hundred_lines():
    long = {
        name: n
        for name, path in _modules().items()
        if (n := len(path.read_text(encoding="utf-8").splitlines())) > 650
    }
    assert long == {}
