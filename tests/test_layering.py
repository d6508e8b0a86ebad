"""Each layer imports only from the layers below it (DEVELOPERS.md), and only
stfalgebra/stf/backend.py imports symengine. Walks the import statements of every module."""

from __future__ import annotations

import ast
from pathlib import Path

import stfalgebra

PACKAGE = Path(stfalgebra.__file__).parent
RANK = {"errors": 0, "orders": 0, "exact": 0, "lazy_sympy": 0, "limits": 0, "pnseries": 0, "symbols": 0, "scalars": 0, "stf": 1, "binary": 2, "mpm": 2, "moments": 3,
        "radiative": 4, "codegen": 5, "checking": 5, "cli": 6}


def _layer(module_path: Path) -> str:
    parts = module_path.relative_to(PACKAGE).with_suffix("").parts
    return parts[0]


def _imports(path: Path):
    tree = ast.parse(path.read_text(encoding="utf-8"))
    package_parts = path.relative_to(PACKAGE.parent).with_suffix("").parts[:-1]
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            for alias in node.names:
                yield alias.name
        elif isinstance(node, ast.ImportFrom):
            if node.level:
                base = package_parts[: len(package_parts) - node.level + 1]
                yield ".".join(base + ((node.module,) if node.module else ()))
            else:
                yield node.module or ""


def _modules():
    for path in sorted(PACKAGE.rglob("*.py")):
        if path.name in ("__init__.py", "__main__.py") and path.parent == PACKAGE:
            continue
        yield path


def test_layers_import_only_downward():
    offences = []
    for path in _modules():
        own = _layer(path)
        for name in _imports(path):
            if not name.startswith("stfalgebra."):
                continue
            target = name.split(".")[1]
            if target not in RANK or own not in RANK:
                offences.append(f"{path.relative_to(PACKAGE)}: layer of {name} unknown (add it to RANK)")
            elif RANK[target] > RANK[own]:
                offences.append(f"{path.relative_to(PACKAGE)} imports {name}")
    assert offences == []


def test_only_the_backend_imports_symengine():
    users = [str(path.relative_to(PACKAGE)) for path in _modules()
             if any(name.split(".")[0] == "symengine" for name in _imports(path))]
    assert users in ([], [str(Path("stf") / "backend.py")])
