"""Long time histories: a CSV column read in chunks, counted as it is read, and kept as an envelope.

A measured duty can be far larger than memory (a day at 500 Hz is over 4·10⁷ samples). Here
the drive column of a CSV file is read chunk by chunk (pandas' C parser, one column, float),
each chunk is rainflow-counted with the residue carried to the next
(`flexcycle.spectra.chunked.count_chunk`), and the history is kept only as a min/max envelope for
plots. A history of at most ``keep_signal`` samples is also kept whole, and counted at once
with `flexcycle.spectra.rainflow.rainflow_cycles`;
a longer one is counted in chunks, its identical cycles merged while merging pays
(`flexcycle.spectra.chunked.HeldCycles`; the same cycles as counting at once, as a multiset:
the tests check it).

The file format and every error message are those of `flexcycle.spectra.profiles.read_time_history`:
when the fast reader meets anything it does not accept (a missing file or column, a cell
that is not a finite number, a ragged row, a repeated column name, fewer than 2 samples),
the file is read again by `read_time_history`, which raises the message with the file's
line number. This layer knows no units: ``to_si`` (a factor) turns the file's numbers into SI.
"""
from __future__ import annotations

import csv
import hashlib
import io
import math
import mmap
import queue
import threading
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from pathlib import Path

import numpy as np

from .chunked import CAPACITY_CAP, OPEN, HeldCycles, close_count, count_chunk
from .cycles import Cycles
from .errors import InputError
from .profiles import COMMENT, file_dialect, read_time_history
from .rainflow import rainflow_cycles

CHUNK_SAMPLES = 1 << 18  # samples per chunk read and counted: 2 MB of floats, whose temporaries stay in cache
ENVELOPE_BIN = 1 << 10  # samples per envelope bin while reading; CHUNK_SAMPLES is a multiple of it
ENVELOPE_BINS = 2000  # bins of the envelope kept for plots (a line plot of this many points is light)
KEEP_SIGNAL = 1_000_000  # histories up to this many samples are also kept whole (8 MB) and counted at once


@dataclass(frozen=True, eq=False)  # eq=False: `==` on arrays has no single truth value
class Envelope:
    """A history decimated for plots: the smallest and largest sample of each bin of samples.

    Attributes
    ----------
    start : np.ndarray — index of the first sample of each bin [-]
    lo : np.ndarray — smallest sample in the bin [unit of the drive, SI]
    hi : np.ndarray — largest sample in the bin [unit of the drive, SI]
    samples : int — samples of the whole history [-]
    """

    start: np.ndarray
    lo: np.ndarray
    hi: np.ndarray
    samples: int


@dataclass(frozen=True, eq=False)
class CountedHistory:
    """A time history read and rainflow-counted.

    Attributes
    ----------
    cycles : Cycles — the history's cycles [unit of the drive, SI]: for a kept history those of
        `rainflow_cycles` in its order; for a longer one the same cycles (a multiset), identical ones
        merged where that paid (``HeldCycles``)
    samples : int — samples read [-]
    signal : np.ndarray | None — the whole history [unit of the drive, SI], or None when it has
        more than ``keep_signal`` samples
    envelope : Envelope — min/max per bin, at most ENVELOPE_BINS bins
    source : str — name of the file read
    column : str — name of the column read
    sha256 : str — SHA-256 of the file's bytes as they were read (hex)
    """

    cycles: Cycles
    samples: int
    signal: np.ndarray | None
    envelope: Envelope
    source: str
    column: str
    sha256: str = ""


def _refuse(path: Path, column: str, to_si: float, where: str) -> None:
    """Raise the exact message of `read_time_history` for a file the fast reader did not accept."""
    read_time_history(path, column, to_si, where)  # raises with the file's line number
    raise InputError(f"{where}: profile file '{path}' could not be read as a CSV table of numbers")


def _header(path: Path, sep: str = ",") -> tuple[int, list[str]] | None:
    """Bytes up to the end of the header line, and the header's names; None if there is none or it is not text."""
    try:
        with open(path, "rb") as fh:
            offset = 0
            for raw in fh:
                line = raw.decode("utf-8-sig" if offset == 0 else "utf-8")
                offset += len(raw)
                if line.startswith(COMMENT) or not line.strip():
                    continue
                return offset, [name.strip() for name in next(csv.reader([line.rstrip("\r\n")], delimiter=sep))]
    except (OSError, UnicodeDecodeError):
        return None
    return None


class _Hashing(io.RawIOBase):
    """A file read through, its bytes added to a hash (or none) as they pass, and counted (hashlib leaves the
    interpreter lock to other threads while it hashes a large block, so the reading thread hashes alongside
    the counting)."""

    def __init__(self, fh, digest) -> None:
        super().__init__()
        self._fh, self.digest, self.position = fh, digest, fh.tell()

    def readable(self) -> bool:
        return True

    def readinto(self, buffer) -> int:
        n = self._fh.readinto(buffer)
        if n:
            if self.digest is not None:
                self.digest.update(memoryview(buffer)[:n])
            self.position += n
        return n


def history_chunks(
    path: Path,
    column: str,
    to_si: float,
    where: str,
    chunk_samples: int = CHUNK_SAMPLES,
    on_bytes: Callable[[int, int], None] | None = None,
    digest=None,
) -> Iterator[np.ndarray]:
    """Read one column of a CSV file as a drive signal in SI, chunk by chunk.

    Parameters
    ----------
    path : Path — CSV file, the format of `flexcycle.spectra.profiles.read_time_history`
    column : str — name of the column holding the drive
    to_si : float — factor from the file's numbers to SI [SI unit per file unit]
    where : str — what asked for the file; every error message starts with it
    chunk_samples : int — samples per chunk (> 0)
    on_bytes : Callable[[int, int], None] | None — called after each chunk with the bytes of the
        file read so far and the file's size (for a progress display)
    digest : a hashlib hash (e.g. ``hashlib.sha256()``) or None — given, every byte of the file is added
        to it as read: once the chunks are all read, it holds the file's digest

    Yields
    ------
    np.ndarray — the next samples × ``to_si`` [SI], read-only; every chunk but the last has
    ``chunk_samples`` samples

    Raises
    ------
    InputError — as `read_time_history`, with the same messages, when the first bad cell is met.

    Notes
    -----
    Apache Arrow's streaming CSV reader reads a file without comment lines (``_arrow_chunks``); a
    file with a ``#`` in it is read by pandas' C parser, which skips the lines starting with ``#``. Both
    read all the fields of every row (a ragged row is refused) and the drive column as float64, the
    same doubles as Python's float() (correctly rounded: pandas' "round_trip" converter, Arrow's own;
    checked in the tests). Blank lines are skipped, as by `read_time_history`. The delimiter (comma, semicolon or tab) and the decimal mark are those
    `flexcycle.spectra.profiles.detect_dialect` finds in the first lines; pandas is told them (its C parser
    then stays as fast as for commas).
    """
    import pandas as pd  # here: the command line starts without pandas (lean start)

    path = Path(path)
    if not math.isfinite(to_si) or to_si == 0.0:
        raise InputError(f"{where}: the factor to SI must be a finite non-zero number, got {to_si}")
    dialect = file_dialect(path, f"{where}: profile file '{path}'")  # comma, semicolon or tab; decimal mark
    head = _header(path, dialect.sep)
    if head is None:
        _refuse(path, column, to_si, where)
    offset, names = head
    if column not in names or len(set(names)) != len(names):
        _refuse(path, column, to_si, where)
    size = path.stat().st_size
    read = 0
    with open(path, "rb", buffering=0) as raw:
        commented = _has_comment(raw, offset, size)
    if not commented:  # Arrow's reader (no comment lines to skip), the file hashed alongside
        yield from _arrow_history(path, offset, names, column, to_si, dialect, chunk_samples, on_bytes, digest,
                                  where)
        return
    with open(path, "rb", buffering=0) as raw:
        if digest is not None:
            digest.update(raw.read(offset))  # the header and the lines before it
        raw.seek(offset)
        fh = _Hashing(raw, digest)
        try:
            reader = pd.read_csv(
                io.BufferedReader(fh, buffer_size=1 << 20), header=None, names=names, dtype={column: np.float64}, engine="c",
                float_precision="round_trip",  # correctly rounded, as float() and Arrow
                sep=dialect.sep, decimal=dialect.decimal,  # all columns: a ragged row is refused
                comment=COMMENT, skip_blank_lines=True,
                chunksize=chunk_samples, encoding="utf-8",
            )
            for frame in reader:
                with np.errstate(over="ignore"):  # an overflow is refused just below
                    values = frame[column].to_numpy(dtype=np.float64) * to_si
                if not np.all(np.isfinite(values)):
                    raise ValueError("a cell that is not a finite number")
                read += values.size
                values.flags.writeable = False
                if on_bytes is not None:
                    on_bytes(min(fh.position, size), size)
                yield values
        except (ValueError, pd.errors.ParserError, UnicodeDecodeError):
            _refuse(path, column, to_si, where)
    if read < 2:
        _refuse(path, column, to_si, where)


ARROW_BLOCK = 1 << 20  # bytes Arrow's CSV reader parses at once: its arrays (1 MB) stay below numpy's huge-page size


def _arrow_history(path: Path, offset: int, names: list[str], column: str, to_si: float, dialect, chunk_samples: int,
                   on_bytes, digest, where: str) -> Iterator[np.ndarray]:
    """``history_chunks`` for a file without comment lines: Arrow's reader from ``offset`` (past the header),
    the file hashed by a second thread meanwhile (``_hash_file``: hashlib leaves the interpreter lock to the
    others while it hashes), so that no byte passes through Python on its way to the parser."""
    import pyarrow as pa

    hashing = None
    if digest is not None:
        hashing = threading.Thread(target=_hash_file, args=(path, digest), name="flexcycle-hash", daemon=True)
        hashing.start()
    read = 0
    size = path.stat().st_size
    try:
        with pa.OSFile(str(path)) as source:
            source.seek(offset)
            for values in _arrow_chunks(source, names, column, to_si, dialect, chunk_samples, path, where):
                read += values.size
                if on_bytes is not None:
                    on_bytes(min(source.tell(), size), size)
                yield values
    finally:
        if hashing is not None:
            hashing.join()
    if read < 2:
        _refuse(path, column, to_si, where)


def _hash_file(path: Path, digest) -> None:
    """Every byte of the file added to ``digest``, read into one buffer of HASH_BLOCK bytes, used again for every
    block (a fresh block each time would be fresh memory, every page of it touched anew)."""
    block = bytearray(HASH_BLOCK)
    view = memoryview(block)
    with open(path, "rb", buffering=0) as fh:
        while size := fh.readinto(block):
            digest.update(view[:size])


HASH_BLOCK = 1 << 22  # bytes hashed at once (one buffer, used again for every block)


def _arrow_chunks(source, names: list[str], column: str, to_si: float, dialect, chunk_samples: int, path: Path,
                  where: str) -> Iterator[np.ndarray]:
    """The drive column of a CSV file without comment lines, from ``source`` (an Arrow file, at the first row
    after the header), by Apache Arrow's streaming CSV reader, in chunks of exactly ``chunk_samples`` samples
    (the last shorter), SI, read-only.

    Arrow parses every row (a ragged one is refused), converts the drive column to float64 (correctly
    rounded: the doubles Python's float() gives) and refuses an empty or non-numeric cell; blank lines are
    skipped. It parses in its own threads, about twice as fast as pandas' C parser here. Whatever it refuses,
    and a cell that is not finite, is read again by `read_time_history` for the message with its line number.
    """
    import pyarrow as pa
    import pyarrow.csv as pc

    try:
        reader = pc.open_csv(
            source,
            read_options=pc.ReadOptions(column_names=names, block_size=ARROW_BLOCK, encoding="utf8"),
            parse_options=pc.ParseOptions(delimiter=dialect.sep, ignore_empty_lines=True),
            convert_options=pc.ConvertOptions(column_types={column: pa.float64()}, include_columns=[column],
                                              null_values=[], strings_can_be_null=False,
                                              quoted_strings_can_be_null=False, decimal_point=dialect.decimal),
        )
        held: list[np.ndarray] = []
        count = 0
        for batch in reader:
            with np.errstate(over="ignore"):  # an overflow is refused just below
                values = batch.column(0).to_numpy() * to_si
            if not np.all(np.isfinite(values)):
                raise ValueError("a cell that is not a finite number")
            held.append(values)
            count += values.size
            while count >= chunk_samples:
                joined = np.concatenate(held) if len(held) > 1 else held[0]
                chunk, rest = joined[:chunk_samples], joined[chunk_samples:]
                chunk.flags.writeable = False
                yield chunk
                held, count = ([rest] if rest.size else []), rest.size
        if count:
            chunk = np.concatenate(held)
            chunk.flags.writeable = False
            yield chunk
    except (ValueError, pa.ArrowInvalid, UnicodeDecodeError):
        _refuse(path, column, to_si, where)


def _has_comment(fh, offset: int, size: int) -> bool:
    """Whether the file (of ``size`` bytes) holds a ``#`` past ``offset``: without one, Arrow's reader, which has
    no comment lines, takes the file (a scan of the bytes costs a few ms per 100 MB)."""
    if size <= offset:
        return False
    with mmap.mmap(fh.fileno(), 0, access=mmap.ACCESS_READ) as view:
        return view.find(COMMENT.encode(), offset) >= 0


READ_AHEAD = 2  # chunks the reading thread may hold ready while the last one is counted


def _read_ahead(chunks: Iterator[np.ndarray], depth: int = READ_AHEAD) -> Iterator[np.ndarray]:
    """The chunks of ``chunks``, read by a second thread while the caller counts the previous ones.

    pandas' C parser and numpy release the interpreter lock while they work, so reading and counting
    overlap on two processors. An error while reading is raised here, in the caller's thread; the reader
    stops when the caller stops asking.
    """
    ready: queue.Queue = queue.Queue(maxsize=depth)
    stop = threading.Event()

    def hand(item: tuple) -> bool:
        while not stop.is_set():
            try:
                ready.put(item, timeout=0.1)
                return True
            except queue.Full:
                continue
        return False

    def read() -> None:
        try:
            for chunk in chunks:
                if not hand(("chunk", chunk)):
                    return
            hand(("end", None))
        except BaseException as exc:  # handed to the caller's thread, raised there
            hand(("error", exc))

    reader = threading.Thread(target=read, name="flexcycle-reader", daemon=True)
    reader.start()
    try:
        while True:
            kind, item = ready.get()
            if kind == "end":
                return
            if kind == "error":
                raise item
            yield item
    finally:
        stop.set()
        reader.join()


def refuse_constant(history: CountedHistory, where: str, unit: str, to_si: float) -> None:
    """Refuse a history that never varies: it has no cycle to count.

    where : str — what read it, e.g. ``"ride.toml [duty] profile: ride.csv"``; the message starts with it
    unit : str — the unit of the file's numbers, for the message
    to_si : float — factor from the file's numbers to SI [SI unit per file unit]
    """
    low, high = float(history.envelope.lo.min()), float(history.envelope.hi.max())
    if high == low:
        raise InputError(f"{where}, column {history.column!r} is constant ({low / to_si:g} {unit} in all "
                         f"{history.samples} samples): no cycle to count; a time history must vary")


def minmax_envelope(signal: np.ndarray, bins: int = ENVELOPE_BINS) -> Envelope:
    """A history held whole, decimated into at most ``bins`` (min, max) bins of near-equal size; every extreme
    of the history is kept."""
    signal = np.asarray(signal, float)
    n = signal.size
    start = np.linspace(0, n, max(1, min(bins, n)) + 1).astype(int)[:-1]
    return Envelope(start=start, lo=np.minimum.reduceat(signal, start), hi=np.maximum.reduceat(signal, start), samples=n)


def _envelope(parts: list[tuple[np.ndarray, np.ndarray]], samples: int, bins: int = ENVELOPE_BINS) -> Envelope:
    """The envelope from per-bin (lo, hi) of ENVELOPE_BIN samples each, merged down to at most ``bins`` bins."""
    lo = np.concatenate([p[0] for p in parts]) if parts else np.empty(0)
    hi = np.concatenate([p[1] for p in parts]) if parts else np.empty(0)
    group = max(1, math.ceil(lo.size / bins))
    first = np.arange(0, lo.size, group)
    if lo.size:
        lo, hi = np.minimum.reduceat(lo, first), np.maximum.reduceat(hi, first)
    return Envelope(start=first * ENVELOPE_BIN, lo=lo, hi=hi, samples=samples)


def _bins(values: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Min and max of each ENVELOPE_BIN samples of a chunk."""
    first = np.arange(0, values.size, ENVELOPE_BIN)
    return np.minimum.reduceat(values, first), np.maximum.reduceat(values, first)


def _capacity(path: Path) -> int:
    """Rows enough for every full cycle of the file: cycles <= samples / 2 <= bytes / 4 (a sample takes at least
    a digit and a line end); at most CAPACITY_CAP (the holder grows beyond); 0 if the file cannot be read (the
    reader says why)."""
    try:
        return min(Path(path).stat().st_size // 4 + 2, CAPACITY_CAP)
    except OSError:
        return 0


def count_history(
    path: Path,
    column: str,
    to_si: float,
    where: str,
    residue: str = "half",
    keep_signal: int = KEEP_SIGNAL,
    progress: Callable[[int, int], None] | None = None,
    chunk_samples: int = CHUNK_SAMPLES,
) -> CountedHistory:
    """Read a CSV drive column in chunks, rainflow-count it, keep its envelope (and the signal if short).

    Parameters
    ----------
    path, column, to_si, where : as `history_chunks`
    residue : str — one of `flexcycle.spectra.rainflow.RESIDUE_MODES`, as in `rainflow_cycles`
    keep_signal : int — the history is kept whole (and counted at once) up to this many samples
    progress : Callable[[int, int], None] | None — called with (bytes read, file size) after each
        chunk; the library prints nothing
    chunk_samples : int — samples per chunk, a multiple of ENVELOPE_BIN

    The file is read by a second thread while the chunks read are counted (`_read_ahead`).

    Returns
    -------
    CountedHistory — cycles, sample count, envelope, and the signal when it was kept.

    Raises
    ------
    InputError — the messages of `read_time_history`; an unknown ``residue``.
    """
    if chunk_samples <= 0 or chunk_samples % ENVELOPE_BIN:
        raise InputError(f"count_history: chunk_samples must be a positive multiple of {ENVELOPE_BIN}, got {chunk_samples}")
    close_count(OPEN, residue)  # an unknown residue mode is refused before the file is read
    kept: list[np.ndarray] | None = []
    bins: list[tuple[np.ndarray, np.ndarray]] = []
    state = OPEN
    held = HeldCycles(_capacity(path))
    samples = 0
    digest = hashlib.sha256()
    for values in _read_ahead(history_chunks(path, column, to_si, where, chunk_samples, progress, digest)):
        samples += values.size
        bins.append(_bins(values))
        if kept is not None:
            kept.append(values)
            if samples <= keep_signal:
                continue
            pending, kept = kept, None  # too long to keep: count what was held, then stream
        else:
            pending = [values]
        for chunk in pending:
            step = count_chunk(state, chunk)
            state = step.open
            held.add(step.full)
    envelope = _envelope(bins, samples)
    name = Path(path).name
    if kept is not None:
        signal = np.concatenate(kept)
        signal.flags.writeable = False
        return CountedHistory(rainflow_cycles(signal, residue), samples, signal, envelope, name, column,
                              digest.hexdigest())
    held.add(close_count(state, residue))
    return CountedHistory(held.cycles(), samples, None, envelope, name, column, digest.hexdigest())
