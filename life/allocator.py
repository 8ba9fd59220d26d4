"""The C allocator of a ``bendlife`` process, set for array work.

glibc's malloc maps every block of 128 kB or more from the operating system afresh and hands it back when
freed, so each numpy temporary of that size (a chunk of samples, a block of location × cycle pairs) costs
page faults before its first use: measured here, counting 10⁵ samples took 3.3 ms so and 1.3 ms with the
memory kept for reuse, and a whole run on 10⁷ samples about 0.2 s more. The command line therefore raises
the mapping threshold to 32 MB and keeps up to 128 MB of freed memory (glibc's mallopt, parameters
M_MMAP_THRESHOLD and M_TRIM_THRESHOLD of malloc.h; the same as the environment variables
MALLOC_MMAP_THRESHOLD_ and MALLOC_TRIM_THRESHOLD_ documented in the GNU C Library manual, "Memory Allocation
Tunables"). This only changes when memory is reused; at most 128 MB more stays with the process.
Elsewhere than glibc on Linux nothing is changed. The library never calls this; the command line does.
"""
from __future__ import annotations

import ctypes
import sys

M_TRIM_THRESHOLD = -1  # malloc.h: keep this much freed memory at the top of the heap [bytes]
M_MMAP_THRESHOLD = -3  # malloc.h: blocks at least this large are mapped on their own [bytes]
MAP_ABOVE = 32 << 20  # glibc's largest dynamic threshold on 64-bit systems
KEEP_FREED = 128 << 20


def tune() -> bool:
    """Set the allocator for array work (see the module's notes); True if it was set."""
    if not sys.platform.startswith("linux"):
        return False
    try:
        libc = ctypes.CDLL("libc.so.6")
        return bool(libc.mallopt(M_MMAP_THRESHOLD, MAP_ABOVE)) and bool(libc.mallopt(M_TRIM_THRESHOLD, KEEP_FREED))
    except (OSError, AttributeError):  # no glibc (e.g. musl): left as it is
        return False
