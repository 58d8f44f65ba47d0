"""Pinned third-party packages from PyPI, npm and Debian, downloaded once into a cache outside the
repository (~/.cache/cognomen-bench) for the tests on real code and the benchmarks."""

from __future__ import annotations

import shutil
import subprocess
import sys
import tarfile
import zipfile
from pathlib import Path

CACHE = Path.home() / ".cache" / "cognomen-bench"


def fetch_pypi(name: str, version: str) -> Path:
    """A wheel's files, unpacked."""
    def unpack(downloads: Path, target: Path) -> None:
        _run([sys.executable, "-m", "pip", "download", "--quiet", "--no-deps", "--only-binary", ":all:",
              "-d", str(downloads), f"{name}=={version}"])
        wheel = next(w for w in downloads.glob("*.whl") if w.name.lower().startswith(f"{name}-{version}-".lower()))
        with zipfile.ZipFile(wheel) as archive:
            archive.extractall(target)

    return _cached(f"{name}-{version}", unpack)


def fetch_pypi_source(name: str, version: str) -> Path:
    """A source distribution's files, unpacked (its top folder is `name-version`)."""
    def unpack(downloads: Path, target: Path) -> None:
        _run([sys.executable, "-m", "pip", "download", "--quiet", "--no-deps", "--no-binary", ":all:",
              "-d", str(downloads), f"{name}=={version}"])
        archive_path = next(a for a in downloads.glob("*.tar.gz")
                            if a.name.lower().replace("_", "-").startswith(f"{name}-{version}.".lower()))
        with tarfile.open(archive_path) as archive:
            archive.extractall(target, filter="data")

    return _cached(f"sdist-{name}-{version}", unpack)


def fetch_npm(name: str, version: str) -> Path:
    """An npm package's files (under `package/`)."""
    def unpack(downloads: Path, target: Path) -> None:
        _run(["npm", "pack", f"{name}@{version}", "--silent", "--pack-destination", str(downloads)])
        with tarfile.open(downloads / f"{name}-{version}.tgz") as archive:
            archive.extractall(target, filter="data")

    return _cached(f"npm-{name}-{version}", unpack)


def fetch_debian(package: str, version: str) -> Path:
    """A Debian package's files, unpacked as they would be installed (`usr/...`)."""
    def unpack(downloads: Path, target: Path) -> None:
        _run(["apt-get", "download", f"{package}={version}"], cwd=downloads)
        deb = next(downloads.glob(f"{package}_*.deb"))
        _run(["dpkg-deb", "-x", str(deb), str(target)])

    return _cached(f"deb-{package}-{version.replace(':', '_')}", unpack)


def _cached(folder: str, unpack) -> Path:
    """The cache folder, made by `unpack(downloads, target)` when missing; a half-made one never counts."""
    target = CACHE / folder
    if target.exists():
        return target
    partial = CACHE / f"{folder}.partial"
    downloads = CACHE / "downloads" / folder
    for leftover in (partial, downloads):
        shutil.rmtree(leftover, ignore_errors=True)
    downloads.mkdir(parents=True)
    unpack(downloads, partial)
    partial.rename(target)
    shutil.rmtree(downloads, ignore_errors=True)
    return target


def _run(command: list[str], cwd: Path | None = None) -> None:
    result = subprocess.run(command, cwd=cwd, capture_output=True, text=True, timeout=600)
    if result.returncode != 0:
        raise RuntimeError(f"{' '.join(command)} failed: {(result.stderr or result.stdout).strip()[-500:]}")
