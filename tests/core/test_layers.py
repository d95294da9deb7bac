"""The core's layers import only downward: api → calculators → methods → materials → foundation."""

import ast
from pathlib import Path

import pytest

CORE = Path(__file__).resolve().parents[2] / "core" / "noblegap"

# Higher number = higher layer. A module may import only from its own layer or below.
LAYER = {"foundation": 0, "materials": 1, "methods": 2, "calculators": 3, "interface": 4}
INTERFACE = {"api", "__main__", "engine_hooks", "schedule", "sheet", "compare"}


def layer_of(module):
    """Layer of a dotted module name inside noblegap (``noblegap.methods.nernst``)."""
    parts = module.split(".")
    if len(parts) > 1 and parts[1] in ("materials", "methods", "calculators"):
        return parts[1]
    if len(parts) > 1 and parts[1] in INTERFACE:
        return "interface"
    return "foundation"


def imported_modules(path):
    """Absolute noblegap module names a file imports (relative imports resolved)."""
    rel = path.relative_to(CORE.parent).with_suffix("")
    pkg = list(rel.parts[:-1]) if rel.name != "__init__" else list(rel.parts[:-1])
    tree = ast.parse(path.read_text(encoding="utf-8"))
    out = []
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                base = pkg[: len(pkg) - node.level + 1]
                mod = ".".join(base + ([node.module] if node.module else []))
                names = [mod + "." + a.name for a in node.names] if not node.module else [mod]
                out += names if not node.module else [mod]
            elif node.module and node.module.startswith("noblegap"):
                out.append(node.module)
        elif isinstance(node, ast.Import):
            out += [a.name for a in node.names if a.name.startswith("noblegap")]
    return out


FILES = sorted(p for p in CORE.rglob("*.py") if "__pycache__" not in p.parts)


@pytest.mark.parametrize("path", FILES, ids=lambda p: str(p.relative_to(CORE)))
def test_imports_only_downward(path):
    here = layer_of(".".join(path.relative_to(CORE.parent).with_suffix("").parts))
    for mod in imported_modules(path):
        there = layer_of(mod)
        assert LAYER[there] <= LAYER[here], f"{path.name} ({here}) imports {mod} ({there})"


def test_layer_of_reads_the_folders():
    assert layer_of("noblegap.methods.nernst") == "methods"
    assert layer_of("noblegap.calculators.fastener") == "calculators"
    assert layer_of("noblegap.units") == "foundation"
    assert layer_of("noblegap.api") == "interface"


def test_an_upward_import_is_caught(tmp_path):
    bad = CORE / "materials" / "_probe_upward.py"
    bad.write_text("from ..calculators import fastener\n", encoding="utf-8")
    try:
        with pytest.raises(AssertionError, match="imports noblegap.calculators"):
            test_imports_only_downward(bad)
    finally:
        bad.unlink()
