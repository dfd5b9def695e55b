"""Where offgrid's files are: the bundled data, and the user's own library.

Bundled data (``climates/`` and ``load_profiles/``, edited at the top of the repository):

1. ``OFFGRID_DATA`` (a folder holding both) when set;
2. inside the installed package (``offgrid/_bundled/``: a wheel or sdist build copies the two
   folders there, see setup.py);
3. the checkout, one folder above the package (an editable install or a plain clone).

The user's own library (imported climates, own load lists) lives in ``$OFFGRID_HOME`` when set,
else ``$XDG_DATA_HOME/offgrid`` (XDG Base Directory Specification 0.8: an unset, empty or
relative value means ``~/.local/share``), on Windows ``%LOCALAPPDATA%\\offgrid``.
"""

from __future__ import annotations

import os
from pathlib import Path

#: The bundled folders inside an installed package (absent in a checkout).
PACKAGE_DATA = Path(__file__).resolve().parent / "_bundled"
#: The repository root of a checkout (where ``climates/`` is edited).
CHECKOUT_ROOT = Path(__file__).resolve().parents[1]
#: Names of the two bundled folders (the build copies exactly these).
BUNDLED_FOLDERS = ("climates", "load_profiles")

LOAD_LIST_SUFFIX = ".csv"


def data_root() -> Path:
    """The folder holding ``climates/`` and ``load_profiles/`` (see the module docstring)."""
    env = os.environ.get("OFFGRID_DATA")
    if env:
        return Path(env).expanduser()
    if (PACKAGE_DATA / "climates").is_dir():
        return PACKAGE_DATA
    return CHECKOUT_ROOT


def climates_dir() -> Path:
    return data_root() / "climates"


def load_profiles_dir() -> Path:
    return data_root() / "load_profiles"


def demo_project_path() -> Path:
    """The bundled demonstration project (invented scenario)."""
    return Path(__file__).resolve().parent / "data" / "demo-project.toml"


def demo_water_path() -> Path:
    """The bundled demonstration pumping project (an invented village water point)."""
    return Path(__file__).resolve().parent / "data" / "demo-water.toml"


# ----------------------------------------------------------------------------- the user's library


def user_data_dir() -> Path:
    """The user's own offgrid folder (created only when something is written there)."""
    env = os.environ.get("OFFGRID_HOME")
    if env:
        return Path(env).expanduser()
    xdg = os.environ.get("XDG_DATA_HOME", "")
    if xdg and os.path.isabs(xdg):
        return Path(xdg) / "offgrid"
    if os.name == "nt" and os.environ.get("LOCALAPPDATA"):
        return Path(os.environ["LOCALAPPDATA"]) / "offgrid"
    return Path.home() / ".local" / "share" / "offgrid"


def user_climates_dir() -> Path:
    """Where ``offgrid climate import`` writes by default."""
    return user_data_dir() / "climates"


def user_load_profiles_dir() -> Path:
    """Where ``offgrid loads add`` keeps the user's own load lists."""
    return user_data_dir() / "load_profiles"


def _named_files(folder: Path, suffix: str) -> dict[str, Path]:
    if not folder.is_dir():
        return {}
    return {p.stem: p for p in sorted(folder.glob(f"*{suffix}")) if p.is_file()}


def load_list_library() -> list[tuple[str, Path, str]]:
    """Every load list known by name: ``(name, path, origin)``, origin ``"bundled"`` or
    ``"yours"``; bundled first, then the user's (a user's list never hides a bundled one)."""
    bundled = _named_files(load_profiles_dir(), LOAD_LIST_SUFFIX)
    out = [(name, path, "bundled") for name, path in bundled.items()]
    out += [
        (name, path, "yours")
        for name, path in _named_files(user_load_profiles_dir(), LOAD_LIST_SUFFIX).items()
        if name not in bundled
    ]
    return out


def find_load_list(name: str) -> Path | None:
    """A load list by name (``household-kit`` or ``household-kit.csv``): bundled, then the
    user's; None when there is none of that name. Paths are not searched."""
    stem = name.removesuffix(LOAD_LIST_SUFFIX)
    if not stem or "/" in stem or "\\" in stem:
        return None
    for known, path, _origin in load_list_library():
        if known == stem:
            return path
    return None


def resolve_load_list(ref: str, base: Path | None = None) -> Path | None:
    """A load list named by the user: a path (relative to ``base``, then the current folder),
    else a library name (:func:`find_load_list`); None when nothing matches."""
    p = Path(ref).expanduser()
    candidates = [p] if p.is_absolute() else [*([base / p] if base else []), Path.cwd() / p]
    for c in candidates:
        if c.is_file():
            return c
    return find_load_list(ref)
