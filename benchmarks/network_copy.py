"""Load another copy of the network build (the code before a change) beside the installed one.

``path`` is either a copy of ``extract/network.py`` alone (its relative imports then use
the installed package: ``git show <commit>:extract/network.py > /tmp/network_before.py``)
or a copy of the whole ``extract/`` folder (``git archive <commit> extract | tar -x -C DIR``,
then ``DIR/extract``): its ``network*.py`` and ``guard.py`` are loaded from the copy as the
package ``cablewright.extract._before`` and every other module of the folder is the
installed one (so the model's classes are shared), which measures a build split over
several modules, or with its guard, as it was.
"""

from __future__ import annotations

import importlib
import importlib.util
import sys
from pathlib import Path
from types import ModuleType

__all__ = ["load_network"]

#: Modules of the build taken from a folder copy; the rest of the folder is the installed one.
COPIED = ("network*.py", "guard.py")


def load_network(path: str, name: str = "_network_before") -> ModuleType:
    """The ``network`` module of the copy at ``path`` (a file or an ``extract/`` folder)."""
    import cablewright.extract  # noqa: F401  (the package the copy's relative imports use)

    p = Path(path)
    if p.is_dir():
        pkg = "cablewright.extract._before"
        package = ModuleType(pkg)
        package.__path__ = [str(p)]
        sys.modules[pkg] = package
        copied = {f.stem for pattern in COPIED for f in p.glob(pattern)}
        for f in p.glob("*.py"):
            if f.stem not in copied and f.stem != "__init__":
                sys.modules[f"{pkg}.{f.stem}"] = importlib.import_module(f"cablewright.extract.{f.stem}")
        return importlib.import_module(f"{pkg}.network")
    spec = importlib.util.spec_from_file_location(f"cablewright.extract.{name}", p)
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = module
    spec.loader.exec_module(module)
    return module
