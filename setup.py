"""Build hook: copy the top-level ``climates/`` and ``load_profiles/`` into the package.

The two folders are edited at the top of the repository; a wheel (and so ``pip install .``,
``pipx install`` or an sdist install) carries them as ``offgrid/_bundled/``, where
``offgrid.paths`` looks first. An editable install skips the copy and reads the checkout.
Everything else about the build is in pyproject.toml.
"""

from __future__ import annotations

import shutil
from pathlib import Path

from setuptools import setup
from setuptools.command.build_py import build_py

HERE = Path(__file__).resolve().parent
BUNDLED = ("climates", "load_profiles")  # the same names as offgrid.paths.BUNDLED_FOLDERS
SKIP = shutil.ignore_patterns("*.bak", "*.tmp", ".*", "__pycache__")


class BuildWithData(build_py):
    """``build_py`` that also copies the bundled data folders into ``offgrid/_bundled``."""

    def run(self) -> None:
        super().run()
        if getattr(self, "editable_mode", False):
            return  # an editable install reads the checkout's folders directly
        target = Path(self.build_lib) / "offgrid" / "_bundled"
        for name in BUNDLED:
            source = HERE / name
            if not source.is_dir():
                raise SystemExit(f"setup.py: {source} is missing; the package needs it")
            shutil.rmtree(target / name, ignore_errors=True)
            shutil.copytree(source, target / name, ignore=SKIP)

    def get_outputs(self, include_bytecode: bool = True) -> list[str]:
        outputs = list(super().get_outputs(include_bytecode))
        target = Path(self.build_lib) / "offgrid" / "_bundled"
        outputs += [str(p) for p in target.rglob("*") if p.is_file()] if target.is_dir() else []
        return outputs


setup(cmdclass={"build_py": BuildWithData})
