"""Process-wide memory policy: keep freed memory for reuse instead of handing it back at once.

Scoring a file builds several (variables x candidates) float matrices, a few megabytes each.
By default glibc serves every such block with a fresh mmap and unmaps it when freed, so each
batch pays a page fault for every 4 KiB it touches again; that was more than half the time of
`check` on a 2,000-line file. Raising the mmap and trim thresholds lets these blocks come from
the heap and be reused. Resident memory then stays at its high-water mark, which for this
program is the loaded model plus at most 64 MiB kept free for the next file (about 30 MB in
practice). The language server does without it: it re-scores only what an edit touched.
Elsewhere than glibc this does nothing.
"""

from __future__ import annotations

import ctypes
import ctypes.util

_M_TRIM_THRESHOLD = -1
_M_MMAP_THRESHOLD = -3


def keep_freed_memory(mmap_threshold: int = 32 << 20, trim_threshold: int = 64 << 20) -> bool:
    """Ask glibc to keep large freed blocks; True when it agreed."""
    name = ctypes.util.find_library("c")
    if not name:
        return False
    try:
        libc = ctypes.CDLL(name)
        mallopt = libc.mallopt
    except (OSError, AttributeError):
        return False
    mallopt.argtypes = (ctypes.c_int, ctypes.c_int)
    mallopt.restype = ctypes.c_int
    return bool(mallopt(_M_MMAP_THRESHOLD, mmap_threshold)) and bool(mallopt(_M_TRIM_THRESHOLD, trim_threshold))
