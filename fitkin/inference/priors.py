"""Prior distributions of the fitted parameters, vectorised over an ensemble of walkers.

Each prior is a small frozen object with :meth:`Prior.log_prob` (an array of values → an
array of log densities, −inf outside the support), :meth:`Prior.draw` and
:meth:`Prior.describe` (the entry written to the output record). A :class:`PriorSet` maps
parameter names to priors in the order of the sampled parameter vector.

Defaults follow common practice for location/scale parameters bounded by what the model can
evaluate: bounded uniform on σ, ε/k and shape parameters (the least-squares bounds), a
log-uniform (scale-invariant, Jeffreys 1961, *Theory of Probability*, 3rd ed., §3.1) prior on a
fitted extra scatter.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.special import log_ndtr

from ..errors import FitError

__all__ = ["Prior", "Uniform", "LogUniform", "Gaussian", "PriorSet", "parse_prior", "parse_prior_assignment",
           "PRIOR_KINDS", "bounded_prior"]


class Prior:
    """Base class: a univariate prior density.

    Subclasses implement :meth:`log_prob` on an array of values (any shape; the same shape is
    returned) and :meth:`describe`.
    """

    kind = "prior"

    def log_prob(self, x) -> np.ndarray:  # pragma: no cover - abstract
        raise NotImplementedError

    @property
    def support(self) -> tuple[float, float]:
        return (-math.inf, math.inf)

    def contains(self, x) -> np.ndarray:
        lo, hi = self.support
        x = np.asarray(x, dtype=float)
        return (x >= lo) & (x <= hi)

    def describe(self) -> dict:  # pragma: no cover - abstract
        raise NotImplementedError

    def clipped(self, lo: float, hi: float) -> "Prior":
        """The same prior restricted to [lo, hi] (the interval where the model is defined)."""
        return self


def _check_interval(lo: float, hi: float, what: str):
    if not (math.isfinite(lo) and math.isfinite(hi) and lo < hi):
        raise FitError(f"{what} prior needs finite bounds with lower < upper, got [{lo}, {hi}]")


@dataclass(frozen=True)
class Uniform(Prior):
    """Uniform density on [lower, upper] (the default, bounded flat prior)."""

    lower: float
    upper: float
    kind = "uniform"

    def __post_init__(self):
        _check_interval(self.lower, self.upper, "uniform")

    @property
    def support(self):
        return (self.lower, self.upper)

    def log_prob(self, x):
        x = np.asarray(x, dtype=float)
        inside = (x >= self.lower) & (x <= self.upper)
        return np.where(inside, -math.log(self.upper - self.lower), -np.inf)

    def draw(self, rng, size):
        return rng.uniform(self.lower, self.upper, size)

    def clipped(self, lo, hi):
        return Uniform(max(self.lower, lo), min(self.upper, hi))

    def describe(self):
        return {"kind": self.kind, "lower": self.lower, "upper": self.upper}


@dataclass(frozen=True)
class LogUniform(Prior):
    """Density ∝ 1/x on [lower, upper], 0 < lower < upper (scale-invariant; Jeffreys 1961)."""

    lower: float
    upper: float
    kind = "log-uniform"

    def __post_init__(self):
        _check_interval(self.lower, self.upper, "log-uniform")
        if self.lower <= 0:
            raise FitError(f"log-uniform prior needs a positive lower bound, got {self.lower}")

    @property
    def support(self):
        return (self.lower, self.upper)

    def log_prob(self, x):
        x = np.asarray(x, dtype=float)
        inside = (x >= self.lower) & (x <= self.upper)
        norm = math.log(math.log(self.upper / self.lower))
        with np.errstate(divide="ignore", invalid="ignore"):
            return np.where(inside, -np.log(np.where(inside, x, 1.0)) - norm, -np.inf)

    def draw(self, rng, size):
        return np.exp(rng.uniform(math.log(self.lower), math.log(self.upper), size))

    def clipped(self, lo, hi):
        return LogUniform(max(self.lower, lo), min(self.upper, hi))

    def describe(self):
        return {"kind": self.kind, "lower": self.lower, "upper": self.upper}


@dataclass(frozen=True)
class Gaussian(Prior):
    """Normal density N(mean, sd²), optionally truncated to [lower, upper].

    The truncation constant is included so that the log density is normalised.
    """

    mean: float
    sd: float
    lower: float = -math.inf
    upper: float = math.inf
    origin: str = ""
    kind = "gaussian"

    def __post_init__(self):
        if not (math.isfinite(self.mean) and math.isfinite(self.sd) and self.sd > 0):
            raise FitError(f"gaussian prior needs a finite mean and a positive width, got "
                           f"mean {self.mean}, sd {self.sd}")
        if not self.lower < self.upper:
            raise FitError(f"gaussian prior truncation needs lower < upper, got [{self.lower}, {self.upper}]")

    @property
    def support(self):
        return (self.lower, self.upper)

    def _log_mass(self) -> float:
        a = (self.lower - self.mean) / self.sd
        b = (self.upper - self.mean) / self.sd
        if not math.isfinite(a) and not math.isfinite(b):
            return 0.0
        mass = math.exp(log_ndtr(b)) - math.exp(log_ndtr(a))
        if mass <= 0:
            raise FitError(f"gaussian prior N({self.mean:g}, {self.sd:g}²) has no probability inside "
                           f"[{self.lower:g}, {self.upper:g}]")
        return math.log(mass)

    def log_prob(self, x):
        x = np.asarray(x, dtype=float)
        z = (x - self.mean) / self.sd
        lp = -0.5 * z * z - math.log(self.sd * math.sqrt(2 * math.pi)) - self._log_mass()
        inside = (x >= self.lower) & (x <= self.upper)
        return np.where(inside, lp, -np.inf)

    def draw(self, rng, size):
        out = rng.normal(self.mean, self.sd, size)
        return np.clip(out, self.lower, self.upper)

    def clipped(self, lo, hi):
        return Gaussian(self.mean, self.sd, max(self.lower, lo), min(self.upper, hi), self.origin)

    def describe(self):
        d = {"kind": self.kind, "mean": self.mean, "sd": self.sd}
        if math.isfinite(self.lower) or math.isfinite(self.upper):
            d["truncated_to"] = [self.lower, self.upper]
        if self.origin:
            d["origin"] = self.origin
        return d


PRIOR_KINDS = ("uniform", "log-uniform", "gaussian")


def parse_prior(text: str) -> Prior:
    """A prior from its command-line spelling ``KIND:ARGS``.

    ``uniform:LO,HI``, ``log-uniform:LO,HI`` (also ``loguniform``), ``gaussian:MEAN,SD``
    (also ``normal``). Values are in the parameter's report unit (σ in Å, ε/k in K).

    >>> parse_prior("gaussian:3.4,0.2").describe()
    {'kind': 'gaussian', 'mean': 3.4, 'sd': 0.2}
    """
    if ":" not in str(text):
        raise FitError(f"prior '{text}' should read KIND:ARGS, e.g. 'uniform:3,4' or 'gaussian:3.4,0.2' "
                       f"(kinds: {', '.join(PRIOR_KINDS)})")
    kind, args = str(text).split(":", 1)
    kind = kind.strip().lower().replace("_", "-")
    try:
        values = [float(a) for a in args.split(",") if a.strip()]
    except ValueError:
        raise FitError(f"prior '{text}': the arguments must be numbers separated by commas") from None
    if len(values) != 2:
        raise FitError(f"prior '{text}': expected two numbers after '{kind}:', found {len(values)}")
    if kind == "uniform":
        return Uniform(*values)
    if kind in ("log-uniform", "loguniform"):
        return LogUniform(*values)
    if kind in ("gaussian", "normal"):
        return Gaussian(*values)
    raise FitError(f"unknown prior kind '{kind}'; expected one of {', '.join(PRIOR_KINDS)}")


def parse_prior_assignment(text: str) -> tuple[str, Prior]:
    """``NAME=KIND:ARGS`` (the ``--prior`` option) → (name, prior).

    >>> parse_prior_assignment("sigma=gaussian:3.4,0.2")
    ('sigma', Gaussian(mean=3.4, sd=0.2, lower=-inf, upper=inf, origin=''))
    """
    if "=" not in str(text):
        raise FitError(f"--prior expects NAME=KIND:ARGS, e.g. sigma=gaussian:3.4,0.2, got '{text}'")
    name, spec = (t.strip() for t in str(text).split("=", 1))
    aliases = {"eps": "epsilon_over_k", "epsilon": "epsilon_over_k", "eps/k": "epsilon_over_k"}
    return aliases.get(name, name), parse_prior(spec)


def bounded_prior(name: str, prior, lo: float, hi: float, unit: str = "") -> Prior:
    """The prior of ``name`` restricted to the interval [lo, hi] where the model can be evaluated:
    Uniform(lo, hi) when ``prior`` is None; a given Prior (or ``KIND:ARGS`` text) clipped to it.

    Raises FitError for a prior that is no Prior, lies wholly outside [lo, hi], or for no
    prior where the interval is not finite.
    """
    if prior is None:
        if not (math.isfinite(lo) and math.isfinite(hi)):
            raise FitError(f"no bounds known for {name}; give it a prior")
        return Uniform(lo, hi)
    if isinstance(prior, str):
        prior = parse_prior(prior)
    if not isinstance(prior, Prior):
        raise FitError(f"the prior of {name} must be a Prior or 'KIND:ARGS' text, got {prior!r}")
    plo, phi = prior.support
    if plo >= hi or phi <= lo:
        raise FitError(f"the prior of {name}, {prior.describe()}, lies wholly outside the range the model can "
                       f"evaluate for these data, [{lo:.5g}, {hi:.5g}] {unit}".rstrip())
    return prior.clipped(lo, hi)


class PriorSet:
    """Priors of a parameter vector, in the order of ``names``.

    Parameters
    ----------
    priors : {name: Prior}; every name of the sampled vector must have one.
    names : order of the columns of the (walkers, dim) arrays passed to :meth:`log_prob`.
    """

    def __init__(self, priors: dict, names):
        self.names = tuple(names)
        missing = [n for n in self.names if n not in priors]
        if missing:
            raise FitError(f"no prior given for {', '.join(missing)}")
        self.priors = {n: priors[n] for n in self.names}

    def log_prob(self, x) -> np.ndarray:
        """(walkers,) summed log prior of a (walkers, dim) array."""
        x = np.atleast_2d(np.asarray(x, dtype=float))
        total = np.zeros(x.shape[0])
        for j, n in enumerate(self.names):
            total = total + self.priors[n].log_prob(x[:, j])
        return total

    def excluded(self, point) -> list[str]:
        """Descriptions of the parameters whose prior gives zero density at ``point`` (dim,)."""
        point = np.asarray(point, dtype=float)
        out = []
        for j, n in enumerate(self.names):
            if not np.isfinite(self.priors[n].log_prob(point[j])):
                out.append(f"{n} = {point[j]:.5g} lies outside its prior {self.priors[n].describe()}")
        return out

    def describe(self) -> dict:
        return {n: p.describe() for n, p in self.priors.items()}
