"""What is known before the new measurements: the fitted parameters' draws and covariance.

A :class:`Knowledge` holds the forward model of the fit, the names of the uncertain
parameters, a point estimate, their covariance (the current uncertainty, read as a Gaussian
whose precision the new points add to) and parameter draws at which the plan's criterion is
averaged, so that the design accounts for what is not yet known (Chaloner & Verdinelli,
Statist. Sci. 10, 273 (1995), "Bayesian experimental design: a review", §2.2).

Three origins: a saved fit with posterior samples beside it (draws = the samples, covariance
= theirs), a saved fit without (Gaussian draws from its least-squares covariance), and a
prior alone, before any measurement (draws from the priors, covariance = the priors'
variances; corresponding-states priors from critical constants or explicit ones).
"""
from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from ..errors import FitkinError, UsageError
from ..fitted import FittedGas, load_parameters
from ..inference.compare import PotentialChoice
from ..inference.corresponding_states import corresponding_states_priors
from ..inference.leastsq import SHAPE_BOUNDS
from ..inference.model import ForwardModel, default_internal_model
from ..inference.posterior import posterior_draws
from ..inference.priors import Prior, Uniform
from ..species import Gas

__all__ = ["Knowledge", "knowledge_from_fit", "knowledge_from_prior", "check_draws", "DEFAULT_DRAWS", "MAX_DRAWS"]

#: Parameter draws the criterion is averaged over (a plan's cost grows linearly with it).
DEFAULT_DRAWS = 100
#: Most parameter draws one plan averages over (memory grows with draws × candidates).
MAX_DRAWS = 10000
#: Draws used to compute the mean and variance of a prior (Monte Carlo, seeded).
_PRIOR_MOMENT_DRAWS = 20000


@dataclass(frozen=True)
class Knowledge:
    """The current state of knowledge about the parameters of one potential shape.

    Attributes
    ----------
    model : the :class:`~fitkin.inference.model.ForwardModel`.
    names : the uncertain parameters (columns of ``draws``), in the model's order.
    fixed : values of the model's other parameters (report units).
    center : (p,) point estimate.   covariance : (p, p) current covariance (report units).
    draws : (D, p) parameter draws.   source : "posterior samples", "covariance" or "prior".
    label : the potential's label.   seed : the seed of the draws.
    measured : ((T K, kind, u SI), ...) of the points behind a saved fit; empty for a prior.
    description : what the knowledge came from, for plan.json.
    notes : findings about the knowledge worth a warning (e.g. parameters the fit did not determine).
    """

    model: ForwardModel
    names: tuple
    fixed: dict
    center: np.ndarray
    covariance: np.ndarray
    draws: np.ndarray
    source: str
    label: str
    seed: int
    measured: tuple = ()
    description: dict = field(default_factory=dict)
    notes: tuple = ()

    @property
    def gas(self) -> Gas:
        return self.model.gas

    @property
    def sd(self) -> np.ndarray:
        """(p,) current standard uncertainties."""
        return np.sqrt(np.diag(self.covariance))

    def theta(self, row) -> dict:
        """θ dict of one parameter vector (p,), with the fixed parameters."""
        return {**self.fixed, **dict(zip(self.names, map(float, row)))}

    def with_draws(self, keep) -> "Knowledge":
        """The same knowledge with only the draws where ``keep`` (D,) is true."""
        return Knowledge(self.model, self.names, self.fixed, self.center, self.covariance, self.draws[keep],
                         self.source, self.label, self.seed, self.measured, self.description, self.notes)


def check_draws(draws) -> None:
    """UsageError unless ``draws`` is a whole number from 2 to :data:`MAX_DRAWS`."""
    if isinstance(draws, bool) or not (isinstance(draws, (int, np.integer)) and 2 <= draws <= MAX_DRAWS):
        raise UsageError(f"--draws must be a whole number from 2 to {MAX_DRAWS}, got {draws!r}")


def _measured_points(record: dict) -> tuple:
    """((T K, kind, u SI), ...) of the fit's points; u is NaN where the file stated none."""
    out = []
    for r in record.get("residuals") or ():
        if "T_K" in r and "property" in r:
            u = r.get("uncertainty_SI")
            out.append((float(r["T_K"]), str(r["property"]), float(u) if u is not None else float("nan")))
    return tuple(out)


def knowledge_from_fit(fit, *, draws: int = DEFAULT_DRAWS, seed: int = 0) -> Knowledge:
    """Knowledge from a saved fit: a PARAMETERS.json path or a :class:`~fitkin.fitted.FittedGas`.

    Uses the posterior samples beside the file when the fit was sampled, else Gaussian draws
    from its least-squares covariance. ``draws`` of them are used (chosen with ``seed``).
    """
    check_draws(draws)
    fitted = fit if isinstance(fit, FittedGas) else load_parameters(fit)
    record, model = fitted.record, fitted.forward_model
    values = {k: float(v["value"]) for k, v in record["parameters"].items()}
    where = fitted.path or "the parameter record"
    if fitted.band_source == "posterior samples":
        rows = posterior_draws(record, Path(fitted.path).parent, seed=seed)
        names = tuple(n for n in model.parameter_names if n in rows[0] and n in (record["posterior"].get(
            "samples") or {}).get("names", rows[0]))
        all_rows = np.array([[r[n] for n in names] for r in rows])
        covariance = np.atleast_2d(np.cov(all_rows, rowvar=False))
        center = all_rows.mean(axis=0)
        pick = np.random.default_rng(seed).choice(len(all_rows), min(draws, len(all_rows)), replace=False)
        sample = all_rows[np.sort(pick)]
        source = "posterior samples"
    else:
        cov = record.get("covariance") or {}
        cov_names = list(cov.get("names") or [])
        matrix = np.array(cov.get("matrix") or [], dtype=float)
        names = tuple(n for n in model.parameter_names if n in cov_names)
        if not names or matrix.size == 0 or not np.all(np.isfinite(matrix)):
            raise FitkinError(f"{where} has no usable covariance and no posterior samples, so the current "
                              "uncertainty is unknown; refit with fitkin fit --sample, or plan from a prior "
                              "(--formula/--gas with --critical or --prior)")
        idx = [cov_names.index(n) for n in names]
        covariance = matrix[np.ix_(idx, idx)]
        center = np.array([values[n] for n in names])
        sample = np.random.default_rng(seed).multivariate_normal(center, covariance, size=draws, method="eigh")
        source = "covariance"
    fixed = {k: v for k, v in values.items() if k not in names}
    fixed.update((record.get("posterior") or {}).get("fixed") or {})
    label = record["potential"].get("label") or record["potential"]["name"]
    _check_positive_definite(covariance, where)
    notes = _ridge_notes(names, covariance, [n for n in names if record["parameters"].get(n, {}).get("determined")
                                             is False])
    return Knowledge(model, names, fixed, center, covariance, sample, source, label, seed,
                     _measured_points(record),
                     {"from": "saved fit", "file": str(fitted.path) if fitted.path else None, "uncertainty": source,
                      "draws": int(len(sample))}, notes)


#: Correlation beyond which the current knowledge is a ridge that linearisation describes poorly.
RIDGE_CORRELATION = 0.999


def _ridge_notes(names, covariance, undetermined) -> tuple:
    """A warning when the fit leaves parameters undetermined or almost fully correlated."""
    sd = np.sqrt(np.diag(covariance))
    corr = covariance / np.outer(sd, sd)
    pairs = [(names[i], names[j], corr[i, j]) for i in range(len(names)) for j in range(i + 1, len(names))
             if abs(corr[i, j]) > RIDGE_CORRELATION]
    if not undetermined and not pairs:
        return ()
    what = (f"does not determine {', '.join(undetermined)}" if undetermined else
            f"leaves {pairs[0][0]} and {pairs[0][1]} almost fully correlated (r = {pairs[0][2]:+.4f})")
    return (f"the saved fit {what}: the plan's linearised uncertainties may be far from what fits will give "
            "(--verify shows how far); a prior helps (fitkin fit --sample --critical ...)",)


def _check_positive_definite(covariance, where: str) -> None:
    sd = np.sqrt(np.diag(covariance))
    if not np.all(np.isfinite(sd) & (sd > 0)):
        raise FitkinError(f"{where}: a parameter has no uncertainty in the fit's covariance, so nothing can be planned "
                          "for it; refit, or plan from a prior")
    try:
        np.linalg.cholesky(covariance / np.outer(sd, sd))
    except np.linalg.LinAlgError:
        raise FitkinError(f"{where}: the fit's covariance is singular (its parameters are fully correlated), so the "
                          "current uncertainty cannot be used; refit with a prior (fitkin fit --sample --critical "
                          "...), or plan from a prior") from None


def _prior_moments(prior: Prior, rng) -> tuple[float, float]:
    x = prior.draw(rng, _PRIOR_MOMENT_DRAWS)
    return float(np.mean(x)), float(np.var(x))


def knowledge_from_prior(gas: Gas, choice: PotentialChoice, *, priors: dict | None = None, critical=None,
                         order: int = 3, collision: str = "computed", draws: int = DEFAULT_DRAWS,
                         seed: int = 0) -> Knowledge:
    """Knowledge before any measurement of ``gas`` with the potential ``choice``.

    ``priors`` ({name: Prior}, as ``--prior`` gives) take precedence over the
    corresponding-states priors of ``critical`` (or of the gas's own critical constants).
    Free shape parameters without a prior get a uniform one over the range fitkin allows
    (:data:`~fitkin.inference.leastsq.SHAPE_BOUNDS`). The internal-energy conductivity model
    is fitkin's default for the gas with its parameters held at their defaults.
    """
    check_draws(draws)
    given = dict(priors or {})
    critical = critical if critical is not None else gas.critical
    base = corresponding_states_priors(critical) if critical is not None else {}
    chosen = {**base, **given}
    model = ForwardModel(gas=gas, potential=choice.potential, free_shape=tuple(choice.free_shape), order=order,
                         collision=collision, internal=default_internal_model(gas, False), polar=gas.is_polar)
    for name in model.free_shape:
        chosen.setdefault(name, Uniform(*SHAPE_BOUNDS.get(name, (1.0, 100.0))))
    names = tuple(model.parameter_names)
    missing = [n for n in names if n not in chosen]
    if missing:
        raise UsageError(f"a plan before any measurement needs a prior for {', '.join(missing)}: give the critical "
                         "constants (--critical 'Tc=150.7 K, Pc=4.86 MPa', or a gas file with them) or explicit "
                         "priors (--prior sigma=gaussian:3.4,0.3 --prior epsilon_over_k=gaussian:120,30)")
    unknown = sorted(set(given) - set(names))
    if unknown:
        raise UsageError(f"--prior names {', '.join(unknown)}, which the {choice.label} model does not have; "
                         f"its parameters are {', '.join(names)}")
    rng = np.random.default_rng(seed)
    moments = [_prior_moments(chosen[n], rng) for n in names]
    center = np.array([m for m, _ in moments])
    covariance = np.diag([v for _, v in moments])
    sample = np.column_stack([chosen[n].draw(rng, draws) for n in names])
    return Knowledge(model, names, {}, center, covariance, sample, "prior", choice.label, seed, (),
                     {"from": "prior", "priors": {n: chosen[n].describe() for n in names},
                      "critical": critical.to_dict() if critical is not None else None, "draws": int(draws)})
