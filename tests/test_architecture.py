"""The tree shows the pipeline, and data flows one way (DEVELOPERS.md, "Architecture").

The stages of batch/, in order: model, reading, loads, validating, engine, rating,
running, writing, interface, reporting, command. A module may import its own stage
and earlier ones, never a later one; no stage imports batch.demo (demo and benchmark
data live apart). Checked on the source (every import statement, including those
inside functions and under TYPE_CHECKING), and by importing the early stages in a
fresh interpreter and looking at what got loaded: reading and validating an input
never loads numba, the engine or the writers (so `spanfleet check` starts fast).
Common practice of layered architectures; no external source.
"""

from __future__ import annotations

import ast
import subprocess
import sys
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parents[1] / "batch"

#: The stages in pipeline order; a module of stage k may import stages 0..k.
STAGES = (
    "model",
    "reading",
    "loads",
    "validating",
    "engine",
    "rating",
    "running",
    "writing",
    "interface",
    "reporting",
    "command",
)


def _stage(module: str) -> str:
    """The stage (or top-level module) of a dotted module name inside batch."""
    parts = module.split(".")
    return parts[1] if len(parts) > 1 else ""


def _imports(path: Path) -> list[tuple[int, str]]:
    """(line, module) of every import of a batch module in the file."""
    tree = ast.parse(path.read_text("utf-8"))
    found = []
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            if node.module == "batch":
                found += [(node.lineno, f"batch.{a.name}") for a in node.names]
            elif node.module.startswith("batch."):
                found.append((node.lineno, node.module))
        elif isinstance(node, ast.Import):
            found += [(node.lineno, a.name) for a in node.names if a.name.startswith("batch.")]
    return found


def _modules() -> list[tuple[str, Path]]:
    out = []
    for path in sorted(PACKAGE.rglob("*.py")):
        rel = path.relative_to(PACKAGE.parent).with_suffix("")
        out.append((".".join(rel.parts).removesuffix(".__init__"), path))
    return out


def test_every_module_belongs_to_a_stage_or_apart() -> None:
    top_level = {"batch", "batch.__main__"}
    for module, _ in _modules():
        assert module in top_level or _stage(module) in (*STAGES, "demo"), module


@pytest.mark.parametrize(("module", "path"), _modules(), ids=lambda v: str(v))
def test_no_stage_imports_a_later_one(module: str, path: Path) -> None:
    own = _stage(module)
    rank = STAGES.index(own) if own in STAGES else len(STAGES)
    for line, imported in _imports(path):
        target = _stage(imported)
        if own != "demo":
            assert target != "demo", f"{path.name}:{line} imports demo data ({imported})"
        if target in STAGES:
            assert STAGES.index(target) <= rank, (
                f"{module} (stage {own or 'top'}) imports the later stage {imported} at line {line}"
            )


def _loaded_after(statement: str) -> set[str]:
    code = f"{statement}\nimport sys\nprint('\\n'.join(sorted(sys.modules)))"
    done = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=True, timeout=120
    )
    return set(done.stdout.split())


def test_reading_and_validating_load_no_engine_numba_or_writers() -> None:
    loaded = _loaded_after("import batch.validating; import batch.reading")
    for heavy in ("numba", "batch.engine", "batch.rating", "batch.running", "batch.writing"):
        assert heavy not in loaded, f"checking an input loads {heavy}"


def test_the_check_command_loads_no_numba() -> None:
    # `spanfleet check` on a clean workbook: the command, reading and validation only.
    sample = PACKAGE.parent / "sample_workbooks" / "kvha-inventory.xlsx"
    loaded = _loaded_after(
        "from batch.command.cli import main; import io, contextlib\n"
        "out = io.StringIO()\n"
        "with contextlib.redirect_stdout(out), contextlib.redirect_stderr(out):\n"
        f"    assert main(['check', {str(sample)!r}]) == 0, out.getvalue()"
    )
    assert "numba" not in loaded
    assert "batch.engine.kernel" not in loaded
