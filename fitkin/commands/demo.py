"""``fitkin demo``: the synthetic scenario of :mod:`fitkin.demo`, end to end."""
from __future__ import annotations

from pathlib import Path

from .. import demo
from ..io import read_tables
from ..io.atomic import check_can_write
from ..report import REPORT_NAME
from ..saving import PARAMETERS_NAME, SAMPLES_NAME
from ..species import Gas
from ..workflow import FitOptions, run_fit_job

__all__ = ["run_demo"]

#: The demo also samples the posterior (a few seconds), to show the whole job.
DEMO_SAMPLING = {"max_steps": 20000, "progress": False}


def run_demo(args, out) -> int:
    folder = Path(args.out)
    for name in (PARAMETERS_NAME, SAMPLES_NAME, REPORT_NAME):
        check_can_write(folder / name, args.force)  # refuse before writing the demo tables
    print("fitkin demo: SYNTHETIC data of a fictional krypton experiment (see fitkin/demo.py)", file=out)
    paths = demo.write_demo_tables(folder / "data", force=args.force)
    for p in paths:
        print(f"  wrote {p}", file=out)
    tables = read_tables(paths)
    gas = Gas.from_formula(demo.DEMO_GAS["formula"], name=demo.DEMO_GAS["name"])
    job = run_fit_job(tables, gas, potentials="lj",
                      options=FitOptions(order=3, sample=DEMO_SAMPLING | {"seed": demo.DEMO_SEED}),
                      out_dir=folder, force=args.force, truth=demo.TRUE_PARAMETERS)
    print("", file=out)
    print(job.summary, file=out)
    print("\nThe 'generated from' column is the truth behind the synthetic data; deviations of a few "
          "standard errors or less mean the fit recovered it.", file=out)
    print(f"Open {folder / 'report.html'} in a browser to judge the fit.", file=out)
    return 0
