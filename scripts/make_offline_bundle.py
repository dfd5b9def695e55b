#!/usr/bin/env python3
"""Make a folder that installs offgrid on a computer with no network.

Run on a machine with network, from the checkout (or anywhere, naming it with --source):

    python3 scripts/make_offline_bundle.py                 # -> ./offgrid-offline/
    python3 scripts/make_offline_bundle.py OUT --check     # and try an offline install

The folder holds offgrid's wheel and a wheel of every dependency (``pip wheel``), plus
INSTALL.txt and SHA256SUMS. On the laptop, with Python 3.11 or newer:

    python3 -m venv ~/offgrid-venv
    ~/offgrid-venv/bin/pip install --no-index --find-links OUT offgrid
    ~/offgrid-venv/bin/offgrid size --demo

The wheels are for this machine's Python and operating system. For another one, give its
pip platform tag and Python version (``--platform win_amd64 --python-version 3.12``): the
dependencies are then fetched as ready-made wheels only (``pip download --only-binary``).
"""

from __future__ import annotations

import argparse
import hashlib
import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

INSTALL = """offgrid offline bundle
======================

{count} wheels for {target}: offgrid {version} and every package it needs.
Made with scripts/make_offline_bundle.py; SHA256SUMS lists a checksum of each file.

Install (Python 3.11 or newer; no network needed):

  Linux, macOS:
    python3 -m venv ~/offgrid-venv
    ~/offgrid-venv/bin/pip install --no-index --find-links THIS_FOLDER offgrid
    ~/offgrid-venv/bin/offgrid size --demo

  Windows (PowerShell):
    py -m venv $HOME\\offgrid-venv
    $HOME\\offgrid-venv\\Scripts\\pip install --no-index --find-links THIS_FOLDER offgrid
    $HOME\\offgrid-venv\\Scripts\\offgrid size --demo

(`pipx install --pip-args="--no-index --find-links THIS_FOLDER" offgrid` works too.)
Designs defer to local electrical codes and licensed practice.
"""


def pip(*args: str, dry_run: bool = False) -> None:
    command = [sys.executable, "-m", "pip", *args]
    print("+", " ".join(command), flush=True)
    if not dry_run:
        subprocess.run(command, check=True)


def version_of(source: Path) -> str:
    import tomllib

    return tomllib.loads((source / "pyproject.toml").read_text())["project"]["version"]


def make_bundle(
    out: Path, source: Path, platform: str | None, python_version: str | None, dry_run: bool = False
) -> None:
    out.mkdir(parents=True, exist_ok=True)
    if platform or python_version:
        # offgrid itself is pure Python: one wheel fits every platform
        pip("wheel", "--no-deps", "--wheel-dir", str(out), str(source), dry_run=dry_run)
        target = ["--only-binary=:all:"]
        if platform:
            target += ["--platform", platform]
        if python_version:
            target += ["--python-version", python_version]
        with tempfile.TemporaryDirectory() as tmp:
            requirements = Path(tmp) / "requirements.txt"
            requirements.write_text("\n".join(dependencies(source)) + "\n")
            pip("download", *target, "--dest", str(out), "-r", str(requirements), dry_run=dry_run)
    else:
        pip("wheel", "--wheel-dir", str(out), str(source), dry_run=dry_run)
    if dry_run:
        return
    wheels = sorted(out.glob("*.whl"))
    sums = [f"{hashlib.sha256(w.read_bytes()).hexdigest()}  {w.name}" for w in wheels]
    (out / "SHA256SUMS").write_text("\n".join(sums) + "\n")
    where = " ".join(x for x in (platform, python_version and f"Python {python_version}") if x)
    (out / "INSTALL.txt").write_text(
        INSTALL.format(
            count=len(wheels),
            version=version_of(source),
            target=where
            or f"this machine's platform, Python {sys.version_info[0]}.{sys.version_info[1]}",
        )
    )
    size_mb = sum(w.stat().st_size for w in wheels) / 1e6
    print(f"{out}: {len(wheels)} wheels, {size_mb:.0f} MB; see {out / 'INSTALL.txt'}")


def dependencies(source: Path) -> list[str]:
    import tomllib

    return tomllib.loads((source / "pyproject.toml").read_text())["project"]["dependencies"]


def check_bundle(out: Path) -> None:
    """Install from the folder alone into a throw-away venv and size the demo."""
    with tempfile.TemporaryDirectory(prefix="offgrid-check-") as tmp:
        venv = Path(tmp) / "venv"
        subprocess.run([sys.executable, "-m", "venv", str(venv)], check=True)
        bindir = venv / ("Scripts" if sys.platform == "win32" else "bin")
        subprocess.run(
            [
                str(bindir / "python"),
                "-m",
                "pip",
                "install",
                "-q",
                "--no-index",
                "--find-links",
                str(out),
                "offgrid",
            ],
            check=True,
        )
        subprocess.run(
            [str(bindir / "offgrid"), "size", "--demo"],
            check=True,
            cwd=tmp,
            stdout=subprocess.DEVNULL,
        )
    print(f"{out}: checked, it installs with --no-index and sizes the demo")


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(
        description=__doc__.split("\n\n")[0],
        epilog="Example:\n  python3 scripts/make_offline_bundle.py offgrid-offline --check",
        formatter_class=argparse.RawDescriptionHelpFormatter,
    )
    parser.add_argument(
        "out",
        nargs="?",
        default="offgrid-offline",
        type=Path,
        help="folder to fill (default: offgrid-offline)",
    )
    parser.add_argument(
        "--source",
        type=Path,
        default=ROOT,
        help="offgrid checkout or sdist folder (default: this checkout)",
    )
    parser.add_argument(
        "--platform",
        help="pip platform tag of the target, e.g. win_amd64, "
        "macosx_11_0_arm64, manylinux2014_x86_64",
    )
    parser.add_argument("--python-version", help="Python of the target, e.g. 3.12")
    parser.add_argument(
        "--check",
        action="store_true",
        help="then install from the folder into a temporary venv, offline, "
        "and size the demo (this machine's platform only)",
    )
    parser.add_argument("--dry-run", action="store_true", help="print the pip commands only")
    args = parser.parse_args(argv)
    if shutil.which("git") and (args.source / ".git").exists():
        status = subprocess.run(
            ["git", "-C", str(args.source), "status", "--porcelain"], capture_output=True, text=True
        ).stdout
        if status.strip():
            print(
                "note: the checkout has uncommitted changes; they go into the bundle",
                file=sys.stderr,
            )
    make_bundle(args.out, args.source, args.platform, args.python_version, args.dry_run)
    if args.check and not args.dry_run:
        if args.platform or args.python_version:
            print("--check skipped: the bundle is for another platform", file=sys.stderr)
        else:
            check_bundle(args.out)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
