"""mypy on the package as it is installed: ``cablewright`` and the folders mapped under it.

setuptools maps the design card's top-level folders (``core/``, ``extract/``,
``sizing/``, ``annotate/``) into the one import namespace ``cablewright.`` by
``[tool.setuptools.package-dir]``; mypy knows no such mapping and would see
them as top-level packages of their own.  This script lays a throwaway tree of
symbolic links, ``build/typecheck/cablewright/``, in which each mapped folder
appears under the name it is imported by, and runs mypy on it with the
``[tool.mypy]`` settings of ``pyproject.toml`` (cache in ``build/``).

The tree is laid anew on every run from ``package-dir`` itself: a new module in
a mapped folder, a new file in ``cablewright/`` or a new mapped folder is type
checked without a change here (``tests/test_typecheck_layout.py`` holds it).
mypy's messages are printed with the real paths (``sizing/select.py:12``).

Usage: ``python tools/typecheck.py [mypy options]``; exit code is mypy's.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from pathlib import Path

try:
    import tomllib
except ModuleNotFoundError:  # Python 3.10
    import tomli as tomllib

ROOT = Path(__file__).resolve().parents[1]
TREE = ROOT / "build" / "typecheck"
PACKAGE = "cablewright"

__all__ = ["lay_tree", "main", "mapped_folders"]


def mapped_folders(pyproject: Path = ROOT / "pyproject.toml") -> dict[str, Path]:
    """Module name -> real folder, for each folder ``package-dir`` maps under another name.

    A sub-package lying inside its parent's folder under its own name (such as
    ``cablewright.sizing.nec`` = ``sizing/nec``) comes with its parent and is left out.
    """
    config = tomllib.loads(pyproject.read_text(encoding="utf-8"))
    package_dir: dict[str, str] = config["tool"]["setuptools"]["package-dir"]
    folders: dict[str, Path] = {}
    for name, folder in sorted(package_dir.items()):
        parent, _, last = name.rpartition(".")
        if parent in package_dir and Path(folder) == Path(package_dir[parent]) / last:
            continue
        folders[name] = ROOT / folder
    return folders


def lay_tree(tree: Path = TREE) -> Path:
    """Lay ``tree/cablewright/`` anew: links to the package's files and its mapped folders.

    Returns the package folder in the tree.
    """
    folders = mapped_folders()
    top = tree / PACKAGE
    if top.exists():
        shutil.rmtree(top)
    top.mkdir(parents=True)
    for entry in sorted(folders[PACKAGE].iterdir()):
        if entry.name != "__pycache__":
            (top / entry.name).symlink_to(entry)
    for name, folder in folders.items():
        if name == PACKAGE:
            continue
        link = tree.joinpath(*name.split("."))
        if link.exists() or link.is_symlink():
            raise SystemExit(f"typecheck: {name} is both a file of {folders[PACKAGE]} and a mapped folder")
        link.symlink_to(folder, target_is_directory=True)
    return top


def main(argv: list[str]) -> int:
    """Lay the tree, run mypy on it, print its messages with the real paths."""
    top = lay_tree()
    command = [sys.executable, "-m", "mypy", "--config-file", str(ROOT / "pyproject.toml"),
               *argv, os.path.relpath(top, ROOT)]
    done = subprocess.run(command, cwd=ROOT, capture_output=True, text=True)
    prefixes = {os.path.relpath(TREE.joinpath(*n.split(".")), ROOT) + os.sep: os.path.relpath(f, ROOT) + os.sep
                for n, f in mapped_folders().items()}
    for stream, text in ((sys.stdout, done.stdout), (sys.stderr, done.stderr)):
        for line in text.splitlines():
            for tree_prefix, real_prefix in sorted(prefixes.items(), key=lambda p: -len(p[0])):
                if line.startswith(tree_prefix):
                    line = real_prefix + line[len(tree_prefix):]
                    break
            print(line, file=stream)
    return done.returncode


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
