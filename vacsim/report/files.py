"""Writing result files so that nothing is ever half-written or lost on an error."""

from __future__ import annotations

import math
import os
import shutil
import tempfile
from contextlib import contextmanager
from pathlib import Path


def json_safe(obj):
    """A copy of `obj` that json can write: NaN/inf -> None, numpy scalars -> Python numbers."""
    if isinstance(obj, dict):
        return {str(k): json_safe(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [json_safe(v) for v in obj]
    if hasattr(obj, "item") and not isinstance(obj, (str, bytes)):
        obj = obj.item()
    if isinstance(obj, float) and not math.isfinite(obj):
        return None
    return obj


def write_text_atomic(path: Path, text: str) -> Path:
    """Write a text file by writing a temporary file beside it and renaming it into place."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".tmp")
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="") as fh:
            fh.write(text)
        os.chmod(tmp, 0o644)  # mkstemp makes files owner-only; results are for sharing
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
    return path


def save_figure_atomic(fig, path: Path, dpi: int = 120) -> Path:
    """Save a matplotlib figure atomically (temporary file, then rename)."""
    path = Path(path)
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.stem}.", suffix=path.suffix)
    os.close(fd)
    try:
        fig.savefig(tmp, dpi=dpi)
        os.chmod(tmp, 0o644)
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
    return path


def save_figures(figs: dict, out_dir) -> dict:
    """Save {file name: figure} atomically into `out_dir` and close them; returns {name: path}."""
    import matplotlib.pyplot as plt

    paths = {}
    for name, fig in figs.items():
        paths[name] = save_figure_atomic(fig, Path(out_dir) / name)
        plt.close(fig)
    return paths


@contextmanager
def output_directory(final: Path):
    """Build an output folder in a temporary sibling and swap it in only when complete.

    If anything fails inside the block, the previous contents of `final` stay as they were.
    """
    final = Path(final)
    final.parent.mkdir(parents=True, exist_ok=True)
    staging = Path(tempfile.mkdtemp(dir=final.parent, prefix=f".{final.name}.staging."))
    os.chmod(staging, 0o755)  # mkdtemp makes it owner-only; results are for sharing
    try:
        yield staging
    except BaseException:
        shutil.rmtree(staging, ignore_errors=True)
        raise
    old = None
    if final.exists():
        old = final.parent / f".{final.name}.old.{os.getpid()}"
        os.replace(final, old)
    os.replace(staging, final)
    if old is not None:
        shutil.rmtree(old, ignore_errors=True)
