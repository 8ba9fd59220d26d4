"""Generate flexcycle's bundled demo duty profiles (invented data) into spectra/data/.

Both profiles are INVENTED scenarios, made up for the examples and tests; nothing
here was measured. The random draws use a fixed seed, so running this script again
writes the same files:

    .venv/bin/python tools/make_demo_profiles.py            # writes spectra/data/*.csv
    .venv/bin/python tools/make_demo_profiles.py --out DIR  # elsewhere

- cargo-bike-ride.csv: rear leaf spring of a cargo bike, load-point deflection over
  one 15-minute ride at 20 Hz. Static sag with rider and cargo 28 mm; road roughness
  through the sprung-mass bounce mode, scaled with riding speed (stops at junctions);
  occasional kerbs and potholes as decaying bounces, limited by the bump stop at 55 mm
  and the top-out at 8 mm.
- feeder-flexure.csv: tip deflection of a parts-feeder flexure, 4 s at 1 kHz: a steady
  25 Hz drive that ramps up, with an amplitude modulated as parts load the track.
- feeder-flexure-psd.csv: one-sided PSD of the same flexure's tip deflection [mm²/Hz], 0–400 Hz: the 25 Hz
  drive as a narrow peak (rms about 0.55 mm) and the parts rattling on the track as a broad band from 20 to
  300 Hz (rms 0.14 mm).
- keel-gauge-log.csv: a strain-gauge log of a prosthetic-foot keel [µε], 120 s of walking at 100 Hz, written as
  a logger of a decimal-comma locale exports it (semicolons between columns, decimal commas): per step a
  small heel-strike reversal, then the toe-load peak of late stance; every ninth step a stair step or a slope
  (a higher peak), every fiftieth a hop or a missed step; measurement noise of a few µε.
"""
from __future__ import annotations

import argparse
from pathlib import Path

import numpy as np

SEED = 20240601  # fixed seed: the demo files are reproducible
DATA = Path(__file__).resolve().parent.parent / "spectra" / "data"


def _bounce(t: np.ndarray, frequency: float, damping: float) -> np.ndarray:
    """Unit-amplitude decaying bounce exp(-ζωt)·sin(ω_d t) of a damped mode, 0 for t < 0."""
    omega = 2.0 * np.pi * frequency
    omega_d = omega * np.sqrt(1.0 - damping**2)
    after = np.maximum(t, 0.0)
    return np.where(t >= 0.0, np.exp(-damping * omega * after) * np.sin(omega_d * after), 0.0)


def cargo_bike_ride(rng: np.random.Generator) -> tuple[np.ndarray, np.ndarray]:
    """Time [s] and load-point deflection [mm] of the invented cargo-bike ride."""
    fs, duration = 20.0, 900.0  # sampling rate [Hz], ride length [s]
    t = np.arange(0.0, duration, 1.0 / fs)

    # Riding speed [m/s]: cruising about 5 m/s, standing still at the start, the end
    # and three junctions; smooth starts and stops.
    stops = [(0.0, 15.0), (240.0, 270.0), (480.0, 500.0), (700.0, 735.0), (885.0, 900.0)]
    riding = np.ones_like(t)
    for begin, end in stops:
        riding[(t >= begin) & (t < end)] = 0.0
    kernel = np.ones(int(4.0 * fs)) / (4.0 * fs)  # 4 s ramps in and out of stops
    speed = 5.0 * np.convolve(riding, kernel, mode="same") * (1.0 + 0.15 * np.sin(2 * np.pi * t / 97.0))

    # Road roughness: white noise through the bounce mode of rider and cargo on the
    # spring (about 2.2 Hz, 25 % damping), intensity growing with speed.
    mode = _bounce(np.arange(0.0, 3.0, 1.0 / fs), frequency=2.2, damping=0.25)
    roughness = np.convolve(rng.normal(size=t.size), mode, mode="full")[: t.size]
    roughness *= 2.4 / roughness.std() * speed / 5.0  # about 2.4 mm rms when cruising

    # Kerbs and potholes: about one every 40 s of riding, each a decaying bounce;
    # a pothole first lets the wheel drop (spring extends), a kerb first compresses it.
    events = np.zeros_like(t)
    moving = t[speed > 3.0]
    for when in np.sort(rng.choice(moving, size=20, replace=False)):
        size = rng.uniform(8.0, 24.0)  # first peak [mm]
        sign = rng.choice([-1.0, 1.0])
        events += sign * size * _bounce(t - when, frequency=2.4, damping=0.2)
    biggest = rng.choice(moving)  # one hard kerb that reaches both end stops
    events += 34.0 * _bounce(t - biggest, frequency=2.4, damping=0.1)

    deflection = 28.0 + roughness + events  # static sag with rider and cargo: 28 mm
    deflection = np.clip(deflection, 8.0, 55.0)  # top-out at 8 mm, bump stop at 55 mm
    return t, deflection


def feeder_flexure(rng: np.random.Generator) -> tuple[np.ndarray, np.ndarray]:
    """Time [s] and tip deflection [mm] of the invented parts-feeder flexure."""
    fs, duration, drive = 1000.0, 4.0, 25.0  # sampling rate [Hz], length [s], drive frequency [Hz]
    t = np.arange(0.0, duration, 1.0 / fs)
    ramp = np.clip(t / 0.4, 0.0, 1.0)  # the drive comes up over 0.4 s
    amplitude = 1.2 * (1.0 + 0.2 * np.sin(2 * np.pi * 0.7 * t) + 0.05 * np.sin(2 * np.pi * 3.1 * t))
    deflection = ramp * amplitude * np.sin(2 * np.pi * drive * t) + 0.01 * rng.normal(size=t.size)
    return t, deflection


CARGO_HEADER = """\
# DEMO DATA - invented, not measured: an example made up for flexcycle, not a real ride.
# Rear leaf spring of a cargo bike: load-point deflection over one ride (15 min, 20 Hz).
# Static sag with rider and cargo about 28 mm; road roughness; occasional kerbs and potholes,
# up to about 55 mm (bump stop) and down to about 8 mm on rebounds (top-out).
# Generated by tools/make_demo_profiles.py with a fixed seed; do not edit by hand.
# time_s: time [s]; deflection_mm: load-point deflection [mm], positive compresses the spring.
"""

FEEDER_HEADER = """\
# DEMO DATA - invented, not measured: an example made up for flexcycle, not a real machine.
# Parts-feeder flexure: tip deflection over 4 s at 1 kHz; steady 25 Hz drive ramping up over 0.4 s,
# amplitude about 1.2 mm modulated by about 20 % as parts load the track.
# Generated by tools/make_demo_profiles.py with a fixed seed; do not edit by hand.
# time_s: time [s]; deflection_mm: tip deflection [mm] from the rest position.
"""


def write(path: Path, header: str, t: np.ndarray, deflection: np.ndarray, time_fmt: str, value_fmt: str) -> None:
    """Write the header comments, the column names and one sample per line."""
    lines = [f"{time_fmt % ti},{value_fmt % di}" for ti, di in zip(t, deflection)]
    path.write_text(header + "time_s,deflection_mm\n" + "\n".join(lines) + "\n", encoding="utf-8")


def feeder_psd() -> tuple[np.ndarray, np.ndarray]:
    """Frequency [Hz] and deflection PSD [mm²/Hz] of the invented feeder flexure."""
    f = np.arange(0.0, 400.0 + 0.25, 0.5)
    drive = 0.3 / (0.8 * np.sqrt(2.0 * np.pi)) * np.exp(-0.5 * ((f - 25.0) / 0.8) ** 2)  # variance 0.3 mm²
    rattle = np.where((f >= 20.0) & (f <= 300.0), 0.02 / 280.0, 0.0)  # variance 0.02 mm²
    g = drive + rattle
    return f, np.where(g > 1e-9 * g.max(), g, 0.0)  # the Gaussian peak's far tails written as zero


def keel_log(rng: np.random.Generator) -> tuple[np.ndarray, np.ndarray]:
    """Time [s] and gauge strain [µε] of the invented keel walk."""
    fs, duration = 100.0, 120.0
    t = np.arange(0.0, duration, 1.0 / fs)
    strain = np.zeros_like(t)
    start, step = 0.3, 0
    while start < duration - 1.2:
        period = rng.normal(1.08, 0.04)  # s per step of this foot
        peak = rng.normal(2200.0, 120.0) * (1.17 if step % 9 == 8 else 1.0)  # µε at the toe-load peak
        peak *= 1.6 if step % 50 == 49 else 1.0  # now and then a hop or a missed step
        heel = -rng.uniform(120.0, 220.0)  # µε at heel strike
        phase = (t - start) / period
        stance = (phase >= 0) & (phase < 0.62)
        p = phase[stance] / 0.62
        strain[stance] += heel * np.sin(np.pi * np.clip(p / 0.2, 0, 1)) * (p < 0.2) \
            + peak * np.sin(np.pi * np.clip((p - 0.2) / 0.8, 0, 1)) ** 2 * (p >= 0.2)
        start += period
        step += 1
    return t, strain + rng.normal(0.0, 3.0, t.size)


MEASURED_SEED = 20261202  # the measured-duty demos' own seed: the two profiles above keep their draws


def write_measured(out: Path) -> None:
    """The demo data of the measured-duty examples: a deflection PSD and a strain-gauge log."""
    rng = np.random.default_rng(MEASURED_SEED)
    f, g = feeder_psd()
    with open(out / "feeder-flexure-psd.csv", "w", encoding="utf-8") as fh:
        fh.write("# DEMO DATA - invented, not measured: an example made up for flexcycle, not a real machine.\n"
                 "# Parts-feeder flexure: one-sided PSD of the tip deflection, the 25 Hz drive and the parts\n"
                 "# rattling on the track (20-300 Hz). Generated by tools/make_demo_profiles.py.\n"
                 "# f_hz: frequency [Hz]; deflection_psd: one-sided PSD of the tip deflection [mm^2/Hz].\n"
                 "f_hz,deflection_psd\n")
        for fk, gk in zip(f, g):
            fh.write(f"{fk:g},{gk:.6e}\n")
    t, strain = keel_log(rng)
    with open(out / "keel-gauge-log.csv", "w", encoding="utf-8") as fh:
        fh.write("# DEMO DATA - invented, not measured: an example made up for flexcycle, not a real product or patient.\n"
                 "# Prosthetic-foot keel: strain gauge 20 mm from the clamp on the tension face, 120 s of walking\n"
                 "# at 100 Hz, as a logger of a decimal-comma locale exports it (semicolons, decimal commas).\n"
                 "# Generated by tools/make_demo_profiles.py with a fixed seed; do not edit by hand.\n"
                 "time_s;strain_ue\n")
        for tk, ek in zip(t, strain):
            fh.write(f"{tk:.3f};{ek:.1f}\n".replace(".", ","))


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--out", type=Path, default=DATA, help="folder to write into (default: spectra/data)")
    out = parser.parse_args().out
    out.mkdir(parents=True, exist_ok=True)
    rng = np.random.default_rng(SEED)
    write(out / "cargo-bike-ride.csv", CARGO_HEADER, *cargo_bike_ride(rng), time_fmt="%.2f", value_fmt="%.1f")
    write(out / "feeder-flexure.csv", FEEDER_HEADER, *feeder_flexure(rng), time_fmt="%.3f", value_fmt="%.3f")
    write_measured(out)


if __name__ == "__main__":
    main()
