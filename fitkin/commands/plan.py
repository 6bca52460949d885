"""``fitkin plan``: parse the options, call :func:`fitkin.plan.plan_measurements`, print and save.

What is known comes from a saved fit (``PARAMETERS.json``) or, before any measurement, from
a gas (``--formula/--gas/--molar-mass``, as ``fit`` reads them) with priors (``--critical``
or ``--prior``, as ``fit --sample`` reads them).
"""
from __future__ import annotations

from argparse import Namespace

from ..errors import UsageError
from ..inference.corresponding_states import parse_critical_constants
from ..inference.fitdata import FitData
from ..inference.priors import parse_prior_assignment
from ..plan import knowledge_from_fit, knowledge_from_prior, plan_measurements
from ..plan.output import write_plan
from ..plan.verify import check_replications, verify_plan
from ..units import parse_quantity
from ..workflow import parse_potential_choices
from .fit import gas_from_args
from .tables import read_from_args

__all__ = ["run_plan", "knowledge_from_args"]


def knowledge_from_args(args):
    """The Knowledge of a saved fit, or of a gas and its priors."""
    gas_given = bool(args.formula or args.molar_mass or args.gas)
    if args.parameters and gas_given:
        raise UsageError("give either a saved fit (PARAMETERS.json) or a gas (--formula, --molar-mass or --gas) "
                         "with priors, not both")
    if args.parameters:
        if args.prior or args.critical or args.potential:
            raise UsageError("--prior, --critical and --potential describe a plan before any measurement; a plan "
                             "from a saved fit uses that fit's potential and uncertainty")
        return knowledge_from_fit(args.parameters, draws=args.draws, seed=args.seed)
    if not gas_given:
        raise UsageError("say what is known: a saved fit (fitkin plan fit/parameters.json ...) or a gas "
                         "(--formula, --molar-mass or --gas) with --critical or --prior")
    choices = parse_potential_choices(args.potential or "lj")
    if len(choices) != 1:
        raise UsageError("--potential: a plan is made for one potential shape (use --goal discriminate:A,B to "
                         "compare shapes)")
    priors = dict(map(parse_prior_assignment, args.prior))
    critical = parse_critical_constants(args.critical) if args.critical else None
    return knowledge_from_prior(gas_from_args(args), choices[0], priors=priors, critical=critical,
                                draws=args.draws, seed=args.seed)


def _existing(args):
    """The FitData of the tables named by --data (measurements the plan adds to), or None."""
    if not args.data:
        return None
    reading = Namespace(files=args.data, sheet=None, unit=args.unit, pressure_limit="1 MPa", table_pressure=None)
    return FitData.from_tables(read_from_args(reading))


def run_plan(args, out) -> int:
    if args.points is None:
        raise UsageError("--points is needed: how many new measurements to plan, e.g. --points 6")
    if args.verify is not None:
        check_replications(args.verify)   # before the work, not after it
    known = knowledge_from_args(args)
    pressure = parse_quantity(args.pressure, "Pa", name="--pressure")
    result = plan_measurements(known, grid=args.range, points=args.points,
                               properties=[p for p in args.property.split(",") if p.strip()],
                               uncertainty=args.uncertainty or None, goals=args.goal or ["parameters"],
                               pressure=pressure,
                               data=_existing(args), draws=args.draws, seed=args.seed)
    if args.verify is not None:
        result = verify_plan(result, replications=args.verify, seed=args.seed)
    print(result.table(), file=out)
    if args.out:
        paths = write_plan(result, args.out, force=args.force, html=not args.no_html)
        print("\n".join(f"{name} written to {p}" for name, p in
                        (("Plan table (fill in the values)", paths["csv"]), ("Plan record", paths["json"]),
                         ("Plan figure", paths.get("html"))) if p is not None), file=out)
    return 0
