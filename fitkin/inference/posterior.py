"""The outcome of posterior sampling: draws, summaries, the record section and the samples file.

A :class:`Posterior` holds the retained draws (after burn-in and thinning) of every sampled
parameter — σ in Å, ε/k in K, free shape parameters, and nuisance parameters (extra scatter,
calibration factors). :meth:`Posterior.to_record` gives the ``"posterior"`` section of the
parameter file; :func:`save_samples` writes the draws to a compressed ``.npz`` next to it and
returns the reference (relative path and SHA-256) that the section carries.

Posterior predictive bands (:func:`predictive_band`) push parameter draws through any
property function and take pointwise quantiles: the credible band of the model curve (the
measurement noise is not added).
"""
from __future__ import annotations

import hashlib
import io
import os
import zipfile
import zlib
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from ..errors import FitkinError, OutOfRangeError, ParameterFileError
from ..formatting import count_of, format_interval
from ..io.atomic import write_bytes_atomic
from .diagnostics import Diagnostics

__all__ = ["Posterior", "save_samples", "load_samples", "posterior_draws", "predictive_band",
           "band_over_draws", "SAMPLES_NAME", "PERCENTILES", "MIN_DRAWS"]

SAMPLES_NAME = "samples.npz"
#: Reported percentiles: median, ±1σ-equivalent (16/84) and 95 % (2.5/97.5) central intervals.
PERCENTILES = {"p2_5": 2.5, "p16": 16.0, "median": 50.0, "p84": 84.0, "p97_5": 97.5}


@dataclass(frozen=True)
class Posterior:
    """Posterior draws of one fit and how they were obtained.

    Attributes
    ----------
    names : sampled parameter names (physical first, then nuisance).
    units : unit of each name ("angstrom", "K", "1").
    samples : (draws, dim) retained draws.   log_prob : (draws,) log posterior (up to a constant).
    diagnostics : convergence diagnostics.   seed : the seed of the run.
    priors, likelihood : descriptions for the record.
    start : the least-squares FitResult the sampler started from.
    fixed : parameters held fixed (shape parameters not sampled), {name: value}.
    sources : {source: {"points": n, "chi2_at_median": χ²}}.
    warnings : plain-language findings.
    sampler : {"method": ..., "emcee_version": ..., "walkers": ...}.
    """

    names: tuple
    units: tuple
    samples: np.ndarray
    log_prob: np.ndarray
    diagnostics: Diagnostics
    seed: int
    priors: dict
    likelihood: dict
    start: object
    fixed: dict = field(default_factory=dict)
    sources: dict = field(default_factory=dict)
    warnings: tuple = ()
    sampler: dict = field(default_factory=dict)

    # -- summaries ----------------------------------------------------------------------
    @property
    def converged(self) -> bool:
        return bool(self.diagnostics.converged)

    @property
    def convergence_message(self) -> str:
        if self.converged:
            d = self.diagnostics
            return (f"converged: {d.steps} steps = {d.steps / max(d.tau):.0f} autocorrelation times, "
                    f"max split-R̂ {np.nanmax(d.rhat):.3f}")
        return "NOT CONVERGED: " + "; ".join(self.diagnostics.reasons)

    def column(self, name: str) -> np.ndarray:
        if name not in self.names:
            raise FitkinError(f"no sampled parameter '{name}'; sampled: {', '.join(self.names)}")
        return self.samples[:, self.names.index(name)]

    def percentile(self, name: str, q) -> np.ndarray:
        return np.percentile(self.column(name), q)

    def median(self, name: str) -> float:
        return float(np.median(self.column(name)))

    def interval(self, name: str, probability: float = 0.68) -> tuple[float, float]:
        """Central credible interval of ``probability`` for one parameter."""
        lo, hi = np.percentile(self.column(name), [50 - 50 * probability, 50 + 50 * probability])
        return float(lo), float(hi)

    def summary(self) -> dict:
        """{name: {unit, median, p16, p84, p2_5, p97_5, mean, sd}}."""
        out = {}
        for j, n in enumerate(self.names):
            x = self.samples[:, j]
            q = np.percentile(x, list(PERCENTILES.values()))
            out[n] = {"unit": self.units[j], **dict(zip(PERCENTILES, map(float, q))),
                      "mean": float(x.mean()), "sd": float(x.std(ddof=1))}
        return out

    @property
    def covariance(self) -> np.ndarray:
        return np.atleast_2d(np.cov(self.samples, rowvar=False))

    @property
    def correlation(self) -> np.ndarray:
        c = self.covariance
        d = np.sqrt(np.diag(c))
        with np.errstate(invalid="ignore", divide="ignore"):
            return c / np.outer(d, d)

    def draws(self, n: int | None = None, seed: int | None = None) -> list[dict]:
        """Parameter draws as θ dicts (with fixed parameters), all or ``n`` chosen at random."""
        rows = self.samples
        if n is not None and n < len(rows):
            rng = np.random.default_rng(self.seed if seed is None else seed)
            rows = rows[rng.choice(len(rows), n, replace=False)]
        return [{**self.fixed, **dict(zip(self.names, map(float, r)))} for r in rows]

    def least_squares_comparison(self) -> dict:
        """Posterior sd versus the least-squares standard error for each fitted parameter."""
        out = {}
        for n in self.names:
            p = getattr(self.start, "parameters", {}).get(n)
            if p is None or not p.vary:
                continue
            sd = float(np.std(self.column(n), ddof=1))
            out[n] = {"least_squares_value": p.value, "least_squares_stderr": p.stderr, "posterior_sd": sd,
                      "ratio_sd_to_stderr": sd / p.stderr if p.stderr and np.isfinite(p.stderr) else None}
        return out

    def summary_lines(self) -> list[str]:
        """Plain-text lines for a terminal: median, 68 % and 95 % intervals, correlation, diagnostics."""
        lines = [f"posterior ({self.sampler.get('walkers', '?')} walkers, seed {self.seed}): "
                 + self.convergence_message]
        for n, s in self.summary().items():
            unit = {"angstrom": "Å", "1": ""}.get(s["unit"], s["unit"])
            lo95, hi95, lo68, hi68, med = format_interval(s["p2_5"], s["p97_5"], s["p16"], s["p84"], s["median"])
            lines.append(f"  {n:<24s} {med} {unit}   68 %: [{lo68}, {hi68}]   95 %: [{lo95}, {hi95}]")
        if "sigma" in self.names and "epsilon_over_k" in self.names:
            r = self.correlation[self.names.index("sigma"), self.names.index("epsilon_over_k")]
            lines.append(f"  correlation(σ, ε/k) = {r:+.3f}")
        d = self.diagnostics
        lines.append(f"  τ = {', '.join(f'{t:.0f}' for t in d.tau)} steps; acceptance {d.acceptance['mean']:.2f}; "
                     f"ESS ≥ {min(d.ess):.0f}")
        lines += [f"  warning: {w}" for w in self.warnings]
        return lines

    # -- record -------------------------------------------------------------------------
    def to_record(self, samples: dict | None = None) -> dict:
        """The ``"posterior"`` section of the parameter file.

        ``samples`` is the reference returned by :func:`save_samples` (relative path, SHA-256);
        without it the section says the draws were not saved.
        """
        names = list(self.names)
        return {
            **self.sampler,
            "seed": int(self.seed),
            "converged": self.converged,
            "convergence_message": self.convergence_message,
            "parameters": self.summary(),
            "correlation": {"names": names, "matrix": self.correlation.tolist()},
            "covariance": {"names": names, "units": list(self.units), "matrix": self.covariance.tolist()},
            "fixed": dict(self.fixed),
            "priors": self.priors,
            "likelihood": self.likelihood,
            "sources": self.sources,
            "least_squares_comparison": self.least_squares_comparison(),
            "diagnostics": self.diagnostics.to_record(),
            "samples": samples if samples is not None else {"file": None, "note": "draws not saved"},
            "warnings": list(self.warnings),
        }


def _npz_bytes(posterior: Posterior) -> bytes:
    buf = io.BytesIO()
    np.savez_compressed(buf, names=np.array(posterior.names, dtype=str), units=np.array(posterior.units, dtype=str),
                        samples=np.asarray(posterior.samples, dtype=float),
                        log_prob=np.asarray(posterior.log_prob, dtype=float), seed=np.array(posterior.seed))
    return buf.getvalue()


def save_samples(posterior: Posterior, path, force: bool = False, relative_to=None) -> dict:
    """Write the draws to ``path`` (compressed npz), atomically; return the record reference.

    Parameters
    ----------
    path : the .npz file, normally ``SAMPLES_NAME`` beside parameters.json.
    force : replace an existing file (otherwise :class:`~fitkin.errors.OutputExistsError`).
    relative_to : folder the reference's path is relative to (default: the file's folder,
        i.e. the parameter file sits beside it).

    Returns
    -------
    {"file": relative path, "sha256": hex digest, "format": ..., "arrays": [...], "draws": n, "names": [...]}
    """
    data = _npz_bytes(posterior)
    p = write_bytes_atomic(path, data, force=force)
    base = Path(relative_to) if relative_to is not None else p.parent
    return {"file": os.path.relpath(p, base), "sha256": hashlib.sha256(data).hexdigest(),
            "format": "numpy .npz (savez_compressed)", "arrays": ["names", "units", "samples", "log_prob", "seed"],
            "draws": int(len(posterior.samples)), "names": list(posterior.names)}


#: Fewest draws a samples file must hold to give a band (a few draws give no quantiles).
MIN_DRAWS = 20


def load_samples(reference: dict, base_dir, sampled=None) -> tuple[list[str], np.ndarray]:
    """(names, samples (draws, dim)) from a record's ``samples`` reference, checking its SHA-256.

    ``sampled`` : the names of the parameters the record says were sampled (the keys of its
    ``posterior.parameters`` summary); the file must hold exactly these, as must the names the
    reference lists, so that a file with a column missing cannot give a band that leaves out
    a parameter's uncertainty.

    Refused with :class:`ParameterFileError`: a reference without a SHA-256 (the file could not
    be checked), a file that does not match it, a damaged file, and draws that cannot give a
    band (not one column per name, other parameters than the record's, fewer than
    :data:`MIN_DRAWS` draws, non-finite values, or a parameter without any spread).
    """
    if not reference or not reference.get("file"):
        raise ParameterFileError("this parameter file references no posterior samples")
    p = Path(base_dir) / reference["file"]
    if not p.is_file():
        raise ParameterFileError(f"the posterior samples file {p} named in the parameter file is missing")
    expected = reference.get("sha256")
    if not isinstance(expected, str) or not expected:
        raise ParameterFileError(f"the parameter file names the posterior samples {p} without their SHA-256 "
                                 "(posterior.samples.sha256), so they cannot be checked; restore the entry, "
                                 "or remove posterior.samples.file to use the covariance for bands")
    data = p.read_bytes()
    if hashlib.sha256(data).hexdigest() != expected.lower():
        raise ParameterFileError(f"{p} does not match the SHA-256 recorded in the parameter file "
                                 "(the samples were changed or belong to another fit)")
    try:
        with np.load(io.BytesIO(data), allow_pickle=False) as z:
            names, samples = [str(n) for n in z["names"]], np.asarray(z["samples"], dtype=float)
    except (ValueError, KeyError, OSError, EOFError, zipfile.BadZipFile, zlib.error) as exc:
        raise ParameterFileError(f"{p} is not a readable fitkin samples file "
                                 f"({type(exc).__name__}: {exc})") from None
    _check_draws(p, names, samples, reference.get("names"), "posterior.samples.names")
    if sampled:
        _check_draws(p, names, samples, list(sampled), "posterior.parameters")
    return names, samples


def _check_draws(p: Path, names: list[str], samples: np.ndarray, recorded, entry: str) -> None:
    if samples.ndim != 2 or samples.shape[1] != len(names) or not names:
        raise ParameterFileError(f"{p}: the samples hold an array of shape {samples.shape} for the parameters "
                                 f"{names}; expected one column per parameter")
    if recorded is not None and list(recorded) != names:
        raise ParameterFileError(f"{p}: the samples are of {', '.join(names)}, but the parameter file ({entry}) "
                                 f"says {', '.join(map(str, recorded))} were sampled; a band from these draws would "
                                 "not be the fit's (sample again with fitkin fit --sample, or remove "
                                 "posterior.samples.file to use the covariance)")
    if len(samples) < MIN_DRAWS:
        raise ParameterFileError(f"{p} holds {count_of(len(samples), 'draw')}; a band needs at least {MIN_DRAWS} "
                                 "(sample again with fitkin fit --sample)")
    if not np.all(np.isfinite(samples)):
        raise ParameterFileError(f"{p}: the samples contain values that are not finite numbers")
    flat = [n for n, sd in zip(names, np.ptp(samples, axis=0)) if sd == 0]
    if flat:
        raise ParameterFileError(f"{p}: every draw of {', '.join(flat)} is the same value, so no band can "
                                 "be computed from these samples")


def posterior_draws(record: dict, base_dir, max_draws: int | None = None, seed: int = 0) -> list[dict]:
    """θ dicts from a parameter-file record whose ``posterior.samples`` references a file.

    Values of parameters not sampled are taken from ``record["parameters"]``.
    """
    post = record.get("posterior") or {}
    names, samples = load_samples(post.get("samples") or {}, base_dir, sampled=list(post.get("parameters") or ()))
    base = {k: v.get("value") for k, v in (record.get("parameters") or {}).items()}
    base.update(post.get("fixed") or {})
    if max_draws is not None and len(samples) > max_draws:
        samples = samples[np.random.default_rng(seed).choice(len(samples), max_draws, replace=False)]
    return [{**base, **dict(zip(names, map(float, row)))} for row in samples]


def predictive_band(draws, kind: str, T, evaluate, *, band: float = 0.95, pressure=None, names=None,
                    base: dict | None = None, max_draws: int = 400, seed: int = 0):
    """Pointwise posterior median and central ``band`` limits of a property curve.

    Parameters
    ----------
    draws : list of θ dicts, a (draws, dim) array with ``names``, or a :class:`Posterior`.
    kind : property passed to ``evaluate`` ('viscosity', 'conductivity', 'self_diffusion').
    T : temperatures in K, (m,).
    evaluate : callable ``evaluate(kind, theta, T, pressure)`` → (m,) SI values
        (e.g. ``FittedGas._evaluate``).
    band : central probability, 0 < band < 1.   pressure : Pa, for diffusion.
    base : values of parameters absent from the draws.   max_draws : at most this many
        draws are used (chosen with ``seed``).

    Returns
    -------
    (median, lower, upper), each (m,) in SI.
    """
    if not 0 < band < 1:
        raise FitkinError(f"band must be a probability between 0 and 1, got {band}")
    if isinstance(draws, Posterior):
        thetas = draws.draws()
    elif isinstance(draws, np.ndarray):
        if names is None or draws.ndim != 2 or draws.shape[1] != len(names):
            raise FitkinError("an array of draws needs names, one per column")
        thetas = [dict(zip(names, map(float, row))) for row in draws]
    else:
        thetas = list(draws)
    if not thetas:
        raise FitkinError("no parameter draws to compute a band from")
    if len(thetas) > max_draws:
        pick = np.random.default_rng(seed).choice(len(thetas), max_draws, replace=False)
        thetas = [thetas[i] for i in pick]
    T = np.atleast_1d(np.asarray(T, dtype=float))
    values = np.array([evaluate(kind, {**(base or {}), **th}, T, pressure) for th in thetas])
    lo, med, hi = np.quantile(values, [0.5 - band / 2, 0.5, 0.5 + band / 2], axis=0)
    return med, lo, hi


def band_over_draws(draws, evaluate, band: float, *, usable: float = 0.9):
    """(median, lower, upper) of ``evaluate(draw)`` over ``draws``: pointwise quantiles.

    A draw the model cannot evaluate (``evaluate`` raises :class:`OutOfRangeError`: a T*
    outside the collision-integral tables, a polar correction out of its range) is left out;
    when fewer than ``usable`` of the draws remain, no reliable band exists and
    :class:`OutOfRangeError` says how many fell outside.
    """
    draws = list(draws)
    values = []
    for draw in draws:
        try:
            values.append(np.asarray(evaluate(draw), dtype=float))
        except OutOfRangeError:
            continue
    if not draws or len(values) < usable * len(draws):
        raise OutOfRangeError(f"{len(draws) - len(values)} of {len(draws)} parameter draws fall outside the "
                              "range the model covers at these temperatures; no reliable band can be given")
    lo, med, hi = np.quantile(np.array(values), [0.5 - band / 2, 0.5, 0.5 + band / 2], axis=0)
    return med, lo, hi
