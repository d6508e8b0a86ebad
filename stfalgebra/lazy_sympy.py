"""sympy, imported on first use.

The derivation pipeline runs on the exact engine (:mod:`stfalgebra.exact`) and never needs
sympy; modules that offer sympy-facing conveniences beside their exact core refer to sympy
through :data:`sp`, which imports sympy the first time one of its attributes is read. A command
served from the exact engine therefore starts without paying for ``import sympy``.
"""

from __future__ import annotations

import importlib
from typing import Any

__all__ = ["sp", "LazyModule"]


class LazyModule:
    """A module proxy that imports the module on the first attribute access.

    Example
    -------
    >>> from stfalgebra.lazy_sympy import LazyModule
    >>> LazyModule("fractions").Fraction(1, 2)
    Fraction(1, 2)
    """

    def __init__(self, name: str) -> None:
        self._name = name
        self._module = None

    def __getattr__(self, attribute: str) -> Any:
        if attribute.startswith("__"):
            raise AttributeError(attribute)
        module = self._module
        if module is None:
            module = self._module = importlib.import_module(self._name)
        return getattr(module, attribute)

    def __repr__(self) -> str:
        return f"<lazily imported module {self._name!r}>"


#: sympy, imported on first use.
sp = LazyModule("sympy")
