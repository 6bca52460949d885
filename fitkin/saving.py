"""Saving a fit from Python in one call: parameter file, posterior samples and report.

>>> from fitkin import read_tables, Gas, FitData, fit_least_squares, save_fit   # doctest: +SKIP
>>> tables = read_tables(["visc.csv"])                                          # doctest: +SKIP
>>> result = fit_least_squares(FitData.from_tables(tables), Gas.from_formula("Ar"))  # doctest: +SKIP
>>> save_fit(result, "fit-argon", tables=tables)                                # doctest: +SKIP
{'parameters': PosixPath('fit-argon/parameters.json'), 'report': PosixPath('fit-argon/report.html')}

The command ``fitkin fit`` uses the same two functions, so a fit saved from Python and one
made on the command line hold the same entries.
"""
from __future__ import annotations

from pathlib import Path

from .errors import FitkinError
from .inference.eucken import eucken_entry
from .inference.staged import conductivity_record
from .inference.posterior import save_samples
from .io.atomic import check_can_write
from .io.parameter_file import result_to_record, write_parameter_file
from .io.residuals import INLINE_LIMIT, sidecar_path
from .report import REPORT_NAME, write_report

__all__ = ["PARAMETERS_NAME", "SAMPLES_NAME", "fit_record", "save_fit", "write_report_safely"]

PARAMETERS_NAME = "parameters.json"
SAMPLES_NAME = "samples.npz"


def fit_record(result, tables=(), *, label: str | None = None, posterior=None, samples_ref=None,
               extra: dict | None = None) -> dict:
    """The parameter-file record of a least-squares result (and optional posterior).

    Adds what the bare :func:`fitkin.io.parameter_file.result_to_record` leaves to its
    caller: the reduced-temperature range of the data, the potential's label, the Eucken
    factor entry of a polyatomic gas, and the posterior section (``samples_ref`` from
    :func:`fitkin.inference.posterior.save_samples`).
    """
    t_star = result.data.temperature / result.value("epsilon_over_k")
    record = result_to_record(result, tables, t_star_range=(float(t_star.min()), float(t_star.max())))
    if label:
        record["potential"]["label"] = label
    # the bounds' origins are provenance; the advice belongs to the warnings already written
    record.pop("undetermined_advice", None)
    origins = record.pop("bound_origins", None)
    if origins:
        record.setdefault("provenance", {})["bound_origins"] = origins
    for name, problem in (record.get("parameter_problems") or {}).items():
        if name in record["parameters"]:
            record["parameters"][name].update({"determined": False, "problem": problem})
    record.update(extra or {})
    if conductivity_record(result):  # how a polyatomic gas's conductivity was fitted, and the check
        record["conductivity_fit"] = conductivity_record(result)
    eucken = eucken_entry(record)
    if eucken:
        record["eucken"] = eucken
    if posterior is not None:
        record["posterior"] = posterior.to_record(samples=samples_ref)
    return record


def save_fit(result, out_dir, *, tables=(), posterior=None, report: bool = True, force: bool = False,
             label: str | None = None, report_pressure: float = 101325.0, extra: dict | None = None) -> dict:
    """Write ``out_dir/parameters.json`` (and ``samples.npz`` with a posterior, ``residuals.npz``
    for more than :data:`fitkin.io.residuals.INLINE_LIMIT` points, and ``report.html`` with
    its figures); never replaces an existing file unless ``force``.

    A report that cannot be made does not undo the fit: the parameter file (and samples) are
    written first, and the report's problem comes back as one sentence under
    "report_problem" (see :func:`write_report_safely`).

    With ``force``, files of the replaced fit that this save does not write again
    (``samples.npz`` of an earlier sampled fit, ``residuals.npz`` of an earlier large one,
    ``report.html`` when no report is made now) are removed after the new parameter file is
    written, so that nothing beside it describes another fit.

    Returns {"parameters": path, "samples": path (if any), "report": path (if made),
    "report_problem": str (if the report failed), "removed": [paths] (if any)}.
    """
    out_dir = Path(out_dir)
    planned = [out_dir / PARAMETERS_NAME]
    if len(result.data) > INLINE_LIMIT:
        planned.append(sidecar_path(out_dir / PARAMETERS_NAME))
    if posterior is not None:
        planned.append(out_dir / SAMPLES_NAME)
    if report:
        planned.append(out_dir / REPORT_NAME)
    for p in planned:
        check_can_write(p, force)
    stale = [p for p in (sidecar_path(out_dir / PARAMETERS_NAME), out_dir / SAMPLES_NAME, out_dir / REPORT_NAME)
             if p not in planned and p.is_file()] if force and (out_dir / PARAMETERS_NAME).is_file() else []
    paths = {}
    ref = None
    if posterior is not None:
        ref = save_samples(posterior, out_dir / SAMPLES_NAME, force=force, relative_to=out_dir)
        paths["samples"] = out_dir / SAMPLES_NAME
    record = fit_record(result, tables, label=label, posterior=posterior, samples_ref=ref, extra=extra)
    paths["parameters"] = write_parameter_file(record, out_dir / PARAMETERS_NAME, force=force)
    if report:
        made, problem = write_report_safely(record, out_dir, force=force, record_path=paths["parameters"],
                                            pressure=report_pressure)
        if made is not None:
            paths["report"] = made
        else:
            paths["report_problem"] = problem
    removed = _remove_files(stale)
    if removed:
        paths["removed"] = removed
    return paths


def _remove_files(paths) -> list:
    """Remove each file; those that could not be removed are left (and not listed)."""
    done = []
    for p in paths:
        try:
            p.unlink()
            done.append(p)
        except OSError:
            pass
    return done


def write_report_safely(record: dict, out_dir, *, force: bool = False, record_path=None,
                        pressure: float = 101325.0):
    """Write the report of a saved fit; a failure is returned as a sentence, never raised.

    Returns (path of report.html, None) or (None, problem). The problem names what went
    wrong and how to make the report later (``fitkin report PARAMETERS.json``); a fault in
    fitkin itself is said to be one. The parameter file is already written when this runs.
    """
    again = f"fitkin report {record_path}" if record_path is not None else "fitkin report PARAMETERS.json"
    try:
        return write_report(record, out_dir, force=force, record_path=record_path, pressure=pressure), None
    except FitkinError as exc:
        return None, f"the report could not be made ({exc}); the parameters are saved; `{again}` tries again"
    except Exception as exc:  # noqa: BLE001 - a fault of the report must not lose a finished fit
        return None, (f"the report could not be made because of a fault in fitkin ({type(exc).__name__}: {exc}); "
                      f"the parameters are saved; please report this, and `{again}` tries again")
