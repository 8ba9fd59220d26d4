"""The elastica tabulated against the drive at the load point, over a duty's extreme drives.

A force drive (the end load [N]) or a deflection drive (the load-point deflection along the load [m]) is
mapped to the elastica's shapes (``flexcycle.mechanics.elastica.solve``) on drive levels from zero to the
duty's extremes. The levels are refined until linear interpolation between them keeps every station's
bending moment and normal shear force within 0.1 % of that station's largest value; the problem being odd in
the load, levels are solved for one sign and mirrored. The cycle extremes are then mapped through the table,
which needs every section load monotonic in the drive: a section load that turns back by more than 1 % of
the part's largest, a deflection that stops growing with the force (a snap), or a deflection drive the end
cannot reach (the span, approached only as P → ∞) is refused; a smaller turn is noted.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from scipy.interpolate import PchipInterpolator

from .elastica import Elastica, Shapes, solve
from .errors import InputError

TABLE_TOLERANCE = 1e-3  # interpolated section loads within 0.1 % of their largest value at that station
DRIVE_MATCH = 1e-7  # a deflection extreme's level is solved to this share of the span (30 nm on 300 mm)
INITIAL_LEVELS = 7  # levels from zero to the peak before the refinement
REVERSAL_LIMIT = 1e-2  # a section load turning back by more than this share of the part's largest is refused
TABLE_FLOOR = 1e-3  # a station's section loads are kept to the tolerance of at least this share of the part's peak
MAX_LEVELS = 400  # drive levels a table may take before the refinement gives up (a snap or a kink)
REACH = 0.995  # a deflection drive beyond this share of the span is refused: it needs P → ∞ (strains unbounded)


@dataclass(frozen=True)
class DriveTable:
    """The elastica tabulated against the drive at the load point, over the duty's extremes.

    drive : np.ndarray — drive levels, ascending, shape (J,) [N for a force drive, m for a deflection drive]
    kind : str — ``"force"`` or ``"deflection"``
    shapes : Shapes — the solution at each level (same order)
    interpolation_error : float — the largest error of linear interpolation between levels found by the last
        refinement, as a share of each station's largest section load [-]
    notes : tuple[str, ...] — what the user should know (a section load that turns back a little)
    """

    drive: np.ndarray
    kind: str
    shapes: Shapes

    interpolation_error: float = 0.0
    notes: tuple[str, ...] = ()

    def _weights(self, drive: np.ndarray):
        d = np.asarray(drive, float)
        j = np.clip(np.searchsorted(self.drive, d, side="right") - 1, 0, self.drive.size - 2)
        t = (d - self.drive[j]) / (self.drive[j + 1] - self.drive[j])
        return j, t

    def interpolate(self, values: np.ndarray, drive: np.ndarray) -> np.ndarray:
        """Values tabulated per level (J, ...) at the given drives, linear between levels; shape (len(drive), ...)."""
        j, t = self._weights(np.atleast_1d(drive))
        t = t.reshape(t.shape + (1,) * (values.ndim - 1))
        return values[j] * (1.0 - t) + values[j + 1] * t

    def force(self, drive: np.ndarray) -> np.ndarray:
        """End load at the drives [N]."""
        return self.interpolate(self.shapes.force, drive)

    def deflection(self, drive: np.ndarray) -> np.ndarray:
        """Load-point deflection along the load at the drives [m]."""
        return self.interpolate(self.shapes.deflection, drive)

    def energy(self, drive: np.ndarray) -> np.ndarray:
        """Stored energy ∫P dδ at the drives [J]; monotone cubic (PCHIP) between levels, U being near-quadratic."""
        return PchipInterpolator(self.drive, self.shapes.energy)(np.atleast_1d(np.asarray(drive, float)))


def _levels(model: Elastica, forces: np.ndarray, stations: np.ndarray, piece_of: np.ndarray,
            near: Shapes | None = None) -> Shapes:
    """``solve`` at the given end loads, sorted ascending (``near``: solved levels around them)."""
    return solve(model, np.sort(forces), stations, piece_of, near)


def _merge(a: Shapes, b: Shapes) -> Shapes:
    """Two sets of solutions as one, sorted by the end load."""
    force = np.concatenate([a.force, b.force])
    order = np.argsort(force, kind="stable")
    order = order[np.concatenate([[True], np.diff(force[order]) > 0])]  # a load solved twice is kept once
    fields = {}
    for name in Shapes.__dataclass_fields__:
        if name == "s":
            fields[name] = a.s
        else:
            fields[name] = np.concatenate([getattr(a, name), getattr(b, name)])[order]
    return Shapes(**fields)


def _drive_of(shapes: Shapes, kind: str) -> np.ndarray:
    return shapes.force if kind == "force" else shapes.deflection


def tabulate(model: Elastica, kind: str, lowest: float, highest: float, stations: np.ndarray,
             piece_of: np.ndarray, tolerance: float = TABLE_TOLERANCE, stiffness: float | None = None) -> DriveTable:
    """Solve the elastica on drive levels covering [lowest, highest] and zero, refined until linear interpolation
    of every station's moment and normal shear force is within ``tolerance`` of that station's largest value
    (or of TABLE_FLOOR of the part's largest, where a station carries almost none); section loads that turn back
    are refused or noted (``_reversals``).

    kind : str — ``"force"`` (end load [N]) or ``"deflection"`` (load-point deflection along the load [m])
    lowest, highest : float — the duty's extreme drives [N or m]
    stations, piece_of : as in ``solve``
    stiffness : float | None — the small-deflection stiffness at the load point, if known [N/m] (else solved)

    Notes
    -----
    The problem is odd in the load (the section law is symmetric): levels are solved for one sign and mirrored.
    Refinement: between neighbouring levels the solution at the mid-load is computed and compared with the
    linear interpolation of its neighbours at its drive; where it misses by more than the tolerance, both halves
    are checked again (the mid-levels join the table either way). Then every section load must be monotonic in
    the drive (else the cycle extremes would not map to local extremes) and, for a deflection drive, the deflection
    monotonic in the force (a snap would make a deflection reachable twice): a reversal beyond the tolerance is
    refused.
    """
    L = model.length
    peak = max(abs(lowest), abs(highest))
    if kind == "deflection" and peak >= REACH * L:
        raise InputError(
            f"[duty] a load-point deflection of {peak * 1e3:.4g} mm is beyond what the part can reach under an end "
            f"load of fixed direction: the end approaches the span ({L * 1e3:.4g} mm) only as the force grows "
            f"without bound; keep the deflection below {REACH:.1%} of the span"
        )
    if kind == "force":
        levels = np.append(peak * np.linspace(0.0, 1.0, INITIAL_LEVELS), min(abs(lowest), abs(highest)))
        shapes = _levels(model, np.unique(levels), stations, piece_of)
    else:
        # the small-deflection force underestimates the force at a deflection (the cantilever stiffens under a
        # load of fixed direction: the deflection per force falls faster than the moment arm shortens); start a
        # quarter above it and grow until the deflection is passed
        if stiffness is None:
            stiffness = _small_load_stiffness(model, stations, piece_of)
        top = 1.25 * peak * stiffness
        shapes = _levels(model, top * np.linspace(0.0, 1.0, INITIAL_LEVELS), stations, piece_of)
        while shapes.deflection[-1] < peak:
            top *= 1.5
            shapes = _merge(shapes, _levels(model, np.array([top]), stations, piece_of))
        beyond = int(np.argmax(shapes.deflection >= peak))  # the first level past the peak closes the table
        shapes = _take(shapes, np.arange(beyond + 1))
    shapes, worst = _refine(model, shapes, kind, stations, piece_of, tolerance)
    if kind == "deflection":  # the duty's extreme deflections as solved levels (force by inverse interpolation)
        wanted = np.unique([d for d in (abs(lowest), abs(highest)) if d > 0])
        guess = PchipInterpolator(shapes.deflection, shapes.force)(wanted)
        for _ in range(4):
            fresh = _levels(model, guess, stations, piece_of, shapes)
            if np.all(np.abs(fresh.deflection - wanted) <= DRIVE_MATCH * L):
                break
            slope = PchipInterpolator(shapes.deflection, shapes.force).derivative()(fresh.deflection)
            guess = fresh.force + slope * (wanted - fresh.deflection)
        shapes = _merge(shapes, fresh)
        shapes = _take(shapes, np.flatnonzero(shapes.deflection <= fresh.deflection.max()))  # the peak closes it
    notes = _reversals(shapes, kind)
    mirrored = _mirror(shapes) if lowest < 0 else shapes
    return DriveTable(_drive_of(mirrored, kind), kind, mirrored, worst, notes)


def _take(shapes: Shapes, index: np.ndarray) -> Shapes:
    """The levels ``index`` of a set of solutions."""
    return Shapes(**{name: getattr(shapes, name) if name == "s" else getattr(shapes, name)[index]
                     for name in Shapes.__dataclass_fields__})


def _refine(model: Elastica, shapes: Shapes, kind: str, stations: np.ndarray, piece_of: np.ndarray,
            tolerance: float) -> tuple[Shapes, float]:
    """Mid-levels added until linear interpolation meets the tolerance (see ``tabulate``); the largest miss found."""
    # refine: the intervals still to check, by index pairs of the sorted levels
    check = np.ones(shapes.force.size - 1, bool)
    worst = 0.0
    while check.any():
        if shapes.force.size > MAX_LEVELS:
            raise InputError(f"the large-deflection map needs more than {MAX_LEVELS} drive levels to keep the section "
                             "loads within 0.1 %: a snap or a kink in the response; check the drive and the design")
        lo_index = np.flatnonzero(check)
        middle = 0.5 * (shapes.force[lo_index] + shapes.force[lo_index + 1])
        fresh = _levels(model, middle, stations, piece_of, shapes)
        drive = _drive_of(shapes, kind)
        d_mid = _drive_of(fresh, kind)
        t = ((d_mid - drive[lo_index]) / (drive[lo_index + 1] - drive[lo_index]))[:, None]
        miss = 0.0
        # each station's largest value, but no less than TABLE_FLOOR of the part's (a station at the inflection of
        # a guided beam carries round-off only)
        scale_m = np.abs(shapes.moment).max(axis=0)
        scale_m = np.maximum(scale_m, TABLE_FLOOR * scale_m.max() + 1e-300)
        scale_v = np.abs(shapes.shear).max(axis=0)
        scale_v = np.maximum(scale_v, TABLE_FLOOR * scale_v.max() + 1e-300)
        guess_m = shapes.moment[lo_index] * (1 - t) + shapes.moment[lo_index + 1] * t
        guess_v = shapes.shear[lo_index] * (1 - t) + shapes.shear[lo_index + 1] * t
        miss = np.maximum(np.abs(guess_m - fresh.moment) / scale_m, np.abs(guess_v - fresh.shear) / scale_v).max(axis=1)
        worst = float(miss.max())
        failing = miss > tolerance
        shapes = _merge(shapes, fresh)
        # after the merge, interval i of the old table is intervals 2i' and 2i'+1 of the new one
        new_check = np.zeros(shapes.force.size - 1, bool)
        position = np.searchsorted(shapes.force, middle)
        new_check[position[failing] - 1] = True
        new_check[position[failing]] = True
        check = new_check
    return shapes, worst


def _small_load_stiffness(model: Elastica, stations: np.ndarray, piece_of: np.ndarray) -> float:
    """End load per load-point deflection at a vanishing load [N/m]."""
    probe = 1e-6 * model.load_scale()
    shapes = solve(model, np.array([probe]), stations, piece_of)
    return probe / float(shapes.deflection[0])


def _reversals(shapes: Shapes, kind: str) -> tuple[str, ...]:
    """Section loads and, for a deflection drive, the deflection must not turn back as the load grows.

    A deflection that turns back, or a section load that turns back by more than REVERSAL_LIMIT of the part's
    largest such load, is refused; a smaller turn (beyond the table's tolerance) is returned as a note: there the
    cycle extremes are still mapped from the drive's extremes and may miss up to that share of the local range.
    Under heavy loads the outer part turns into the load's direction and the moment or the normal shear force
    near the end falls again (the shapes of Bisshopp & Drucker's table past P·L²/EI ≈ 5).
    """
    step = np.diff(shapes.deflection)
    if kind == "deflection" and np.any(step <= 0):
        j = int(np.argmax(step <= 0))
        raise InputError(
            f"the load-point deflection stops growing with the force near {shapes.deflection[j] * 1e3:.4g} mm (a snap "
            "or a limit point): a deflection drive cannot be mapped to one shape there; use a force drive or a "
            "smaller deflection"
        )
    notes = []
    for name, values in (("bending moment", shapes.moment), ("normal shear force", shapes.shear)):
        top = np.abs(values).max()
        if top == 0.0:
            continue
        # the largest fall below the running maximum (or rise above the running minimum) at each station
        rises = np.maximum.accumulate(values, axis=0) - values
        falls = values - np.minimum.accumulate(values, axis=0)
        increasing = values[-1] >= values[0]
        back = np.where(increasing[None, :], rises, falls)
        j, i = np.unravel_index(int(np.argmax(back)), back.shape)
        share = float(back[j, i] / top)
        where = (f"the {name} at {shapes.s[i] * 1e3:.4g} mm from the root turns back as the end load grows past "
                 f"{shapes.force[int(np.argmax(np.abs(values[:, i])))]:.4g} N")
        if share > REVERSAL_LIMIT:
            raise InputError(
                f"{where}, by {share:.1%} of the part's largest: the local stresses are not a monotonic function of "
                "the drive there, so the cycle extremes cannot be mapped through it; reduce the duty's largest drive"
            )
        if share > TABLE_TOLERANCE:
            notes.append(f"{where}, by {share:.2%} of the part's largest (the end turning into the load's direction): "
                         "the local cycles there are mapped from the drive's extremes and may miss up to that share "
                         "of their range")
    return tuple(notes)


def _mirror(shapes: Shapes) -> Shapes:
    """Add the negative loads: the odd solution (y, θ, M, V and the load change sign; x, energies do not)."""
    positive = shapes.force > 0
    flipped = {}
    odd = {"force", "deflection", "tip_rotation", "y", "theta", "moment", "shear"}
    for name in Shapes.__dataclass_fields__:
        value = getattr(shapes, name)
        if name == "s":
            flipped[name] = value
        else:
            part = value[positive][::-1]
            flipped[name] = np.concatenate([-part if name in odd else part, value])
    return Shapes(**flipped)
