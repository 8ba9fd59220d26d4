"""Is the duty quasi-static? The drive's frequency content against the part's first bending frequency.

flexcycle maps the drive to stresses by statics: the part's inertia is left out. That holds while the drive
has no content near the part's first natural frequency f₁: a single-mode system driven at f/f₁ = 1/3 responds
1/(1 − (1/3)²) = 1.125 times its static deflection (undamped dynamic amplification; Thomson, Theory of
Vibration with Applications, sec. 3.1), 12.5 % more, and the error grows fast above. Content above about a
third of f₁ is therefore warned of (common practice; the third is the usual rule of thumb for a quasi-static
test or analysis).
"""
from __future__ import annotations

import numpy as np

from flexcycle.design import Duty
from flexcycle.spectra.spectral import energy_above, spectrum

QUASI_STATIC_FRACTION = 1.0 / 3.0  # content above this fraction of f₁ is not quasi-static (common practice)
CONTENT_SHARE = 0.01  # warn when more than this share of the drive's variance lies there (1 %: our choice)


def resonance_warnings(duty: Duty, first_frequency: float) -> list[str]:
    """Warnings when the duty has content above QUASI_STATIC_FRACTION of the first frequency [Hz].

    A PSD duty: the share of its variance m0 above that frequency. A time history with ``sample_rate``: the
    share of its variance (about its mean) there, from Welch's averaged periodogram (scipy.signal.welch,
    segments of up to 4096 samples); a history too long to be kept whole is checked on nothing and said so.
    A history without a sampling rate, and a block table, have no time scale: nothing to check.
    """
    limit = QUASI_STATIC_FRACTION * first_frequency
    where = f"above {limit:.4g} Hz, a third of the part's first bending frequency ({first_frequency:.4g} Hz)"
    consequence = ("the quasi-static answer no longer holds there: the part's own vibration amplifies (or, far "
                   "above the frequency, shields) the stresses; a dynamic analysis is needed")
    if duty.spectral is not None:
        share = energy_above(duty.spectral.spectrum, limit)
        if share > CONTENT_SHARE:
            return [f"the PSD carries {share:.0%} of its variance {where}: {consequence}"]
        return []
    if duty.sample_rate is None:
        return []
    nyquist = 0.5 * duty.sample_rate
    if nyquist <= limit:
        return []
    if duty.signal is None:
        return [f"the time history, sampled at {duty.sample_rate:g} Hz, may hold content {where}; it is too long "
                "to be kept whole and was not checked"]
    values = np.asarray(duty.signal, float)
    # imported here: scipy.signal is slow to import, and only a sampled history needs it
    from scipy import signal as scipy_signal

    frequency, density = scipy_signal.welch(values - values.mean(), fs=duty.sample_rate,
                                            nperseg=min(4096, values.size))
    if not np.any(density > 0):
        return []
    share = energy_above(spectrum(frequency, density, "time history"), limit)
    if share > CONTENT_SHARE:
        return [f"the time history holds {share:.0%} of its variance {where}: {consequence}"]
    return []
