"""Checking a parameter-file record once, thoroughly, before anything uses it.

:func:`check_record` walks the entries every consumer needs (``fitkin predict``, ``fitkin
report``, :func:`fitkin.fitted.load_parameters`, :class:`fitkin.mixture.GasPair`) and reports
what is wrong by its path in the file, e.g. ``gas.molar_mass_kg_per_mol: expected a number in
kg/mol, found the text '39.948'``. :func:`fitkin.io.parameter_file.read_parameter_file` calls it,
so a damaged or hand-edited file gives the same clear message wherever it is read.
"""
from __future__ import annotations

import math
import numbers

from ..errors import ParameterFileError

__all__ = ["check_record", "SHAPE_KEYS"]

#: Shape parameters each potential family accepts in ``potential.shape_parameters``.
SHAPE_KEYS = {"lj": ("n", "m"), "hs": (), "mie": ("n", "m"), "exp6": ("alpha",)}
_COLLISION = ("computed", "neufeld")
#: Plausible molar masses of a gas, kg/mol: hydrogen atom (1.008 g/mol) to a heavy vapour.
_MOLAR_MASS_RANGE = (1.0e-3, 2.0)


def _kind(value) -> str:
    if value is None:
        return "null"
    if isinstance(value, bool):
        return f"the truth value {str(value).lower()}"
    if isinstance(value, str):
        return f"the text '{value[:40]}'"
    if isinstance(value, dict):
        return "a group of entries"
    if isinstance(value, list):
        return f"a list of {len(value)}"
    return repr(value)


def _is_number(value) -> bool:
    return isinstance(value, numbers.Real) and not isinstance(value, bool)


class _Checker:
    def __init__(self):
        self.problems: list[str] = []

    def fail(self, path: str, message: str) -> None:
        self.problems.append(f"{path}: {message}")

    def group(self, record: dict, path: str, required: bool = True):
        """The dict at ``path`` (dotted, below ``record``) or None after reporting it."""
        value = record
        for key in path.split("."):
            value = value.get(key) if isinstance(value, dict) else None
        if value is None and not required:
            return None
        if not isinstance(value, dict):
            self.fail(path, f"expected a group of entries, found {_kind(value)}"
                      if value is not None else "required entry is missing")
            return None
        return value

    def number(self, group: dict, key: str, path: str, *, unit: str = "", positive: bool = False,
               required: bool = True) -> float | None:
        value = group.get(key)
        if value is None:
            if required:
                self.fail(path, f"required number{' in ' + unit if unit else ''} is missing")
            return None
        if not _is_number(value) or not math.isfinite(float(value)):
            self.fail(path, f"expected a finite number{' in ' + unit if unit else ''}, found {_kind(value)}")
            return None
        if positive and value <= 0:
            self.fail(path, f"must be above zero, found {value!r}")
            return None
        return float(value)

    def text(self, group: dict, key: str, path: str, *, required: bool = True, choices=None) -> str | None:
        value = group.get(key)
        if value is None:
            if required:
                self.fail(path, "required text is missing")
            return None
        if not isinstance(value, str):
            self.fail(path, f"expected a text, found {_kind(value)}")
            return None
        if choices is not None and value not in choices:
            self.fail(path, f"'{value}' is not one of {', '.join(choices)}")
            return None
        return value


def _check_gas(c: _Checker, record: dict) -> None:
    gas = c.group(record, "gas")
    if gas is None:
        return
    c.text(gas, "name", "gas.name")
    c.text(gas, "formula", "gas.formula", required=False)
    m = c.number(gas, "molar_mass_kg_per_mol", "gas.molar_mass_kg_per_mol", unit="kg/mol", positive=True)
    lo, hi = _MOLAR_MASS_RANGE
    if m is not None and not lo <= m <= hi:
        hint = " (it looks like g/mol; the file holds kg/mol)" if 1.0 <= m <= 2000.0 else ""
        c.fail("gas.molar_mass_kg_per_mol", f"{m:g} kg/mol is not the molar mass of a gas "
                                            f"(expected {lo:g}–{hi:g} kg/mol){hint}")
    c.number(gas, "dipole_moment_C_m", "gas.dipole_moment_C_m", unit="C m", required=False)
    c.group(record, "gas.heat_capacity", required=False)
    crit = c.group(record, "gas.critical", required=False)
    if crit is not None:
        for key in ("T_c_K", "P_c_Pa", "V_c_m3_per_mol", "acentric_factor"):
            c.number(crit, key, f"gas.critical.{key}", required=False)


def _check_potential(c: _Checker, record: dict) -> None:
    pot = c.group(record, "potential")
    if pot is None:
        return
    name = c.text(pot, "name", "potential.name")
    shape = pot.get("shape_parameters")
    if shape is not None and not isinstance(shape, dict):
        c.fail("potential.shape_parameters", f"expected a group of entries, found {_kind(shape)}")
        shape = None
    for key, value in (shape or {}).items():
        if name in SHAPE_KEYS and key not in SHAPE_KEYS[name]:
            allowed = ", ".join(SHAPE_KEYS[name]) or "none"
            c.fail(f"potential.shape_parameters.{key}", f"not a shape parameter of the '{name}' potential "
                                                        f"(it has: {allowed})")
        elif name in SHAPE_KEYS:
            c.number(shape, key, f"potential.shape_parameters.{key}")
    free = pot.get("free_shape")
    if free is not None and (not isinstance(free, list) or not all(isinstance(x, str) for x in free)):
        c.fail("potential.free_shape", f"expected a list of shape-parameter names, found {_kind(free)}")
        return
    params = record.get("parameters") if isinstance(record.get("parameters"), dict) else {}
    for key in free or ():
        if params and key not in params:
            c.fail("potential.free_shape", f"names the fitted shape parameter '{key}', which has no entry "
                                           "in 'parameters'")


def _check_parameters(c: _Checker, record: dict) -> None:
    params = c.group(record, "parameters")
    if params is None:
        return
    for key in ("sigma", "epsilon_over_k"):
        if key not in params:
            c.fail(f"parameters.{key}", f"parameter '{key}' is missing")
    for key, entry in params.items():
        if not isinstance(entry, dict):
            c.fail(f"parameters.{key}", f"expected a group with 'value', found {_kind(entry)}")
            continue
        unit = {"sigma": "angstrom", "epsilon_over_k": "K"}.get(key, "")
        c.number(entry, "value", f"parameters.{key}.value", unit=unit,
                 positive=key in ("sigma", "epsilon_over_k"))
        c.number(entry, "stderr", f"parameters.{key}.stderr", required=False)


def _check_matrix(c: _Checker, record: dict, path: str, parameters: dict) -> None:
    group = c.group(record, path, required=False)
    if group is None:
        return
    names = group.get("names")
    matrix = group.get("matrix")
    if names is None and matrix is None:
        return
    if not isinstance(names, list) or not all(isinstance(n, str) for n in names):
        c.fail(f"{path}.names", f"expected a list of parameter names, found {_kind(names)}")
        return
    unknown = [n for n in names if path == "covariance" and n not in parameters]
    if unknown:
        c.fail(f"{path}.names", f"names {', '.join(unknown)}, which are not in 'parameters'")
    n = len(names)
    rows_ok = isinstance(matrix, list) and all(isinstance(r, list) and len(r) == n for r in matrix)
    if not rows_ok or len(matrix) != n:
        shape = (f"{len(matrix)} rows" if isinstance(matrix, list) else _kind(matrix))
        c.fail(f"{path}.matrix", f"expected {n} rows of {n} numbers (one per name in {path}.names), "
                                 f"found {shape}")
        return
    if not all(v is None or _is_number(v) for r in matrix for v in r):
        c.fail(f"{path}.matrix", "expected numbers (or null)")


def _check_theory(c: _Checker, record: dict) -> None:
    theory = c.group(record, "theory")
    if theory is None:
        return
    order = theory.get("sonine_order")
    if order is not None and (not isinstance(order, int) or isinstance(order, bool) or order < 1):
        c.fail("theory.sonine_order", f"expected a whole number ≥ 1, found {_kind(order)}")
    c.text(theory, "collision_integrals", "theory.collision_integrals", required=False, choices=_COLLISION)
    c.group(record, "theory.internal_energy", required=False)
    polar = theory.get("polar_correction")
    if polar is not None and not isinstance(polar, bool):
        c.fail("theory.polar_correction", f"expected true or false, found {_kind(polar)}")


def _check_data(c: _Checker, record: dict) -> None:
    data = c.group(record, "data", required=False)  # a hand-made record may leave it out
    if data is None:
        return
    rng = data.get("temperature_range_K")
    path = "data.temperature_range_K"
    if not isinstance(rng, list) or len(rng) != 2:
        c.fail(path, f"expected [lowest, highest] in K, found {_kind(rng)}")
        return
    lo = c.number({"v": rng[0]}, "v", path + "[0]", unit="K", positive=True)
    hi = c.number({"v": rng[1]}, "v", path + "[1]", unit="K", positive=True)
    if lo is not None and hi is not None and hi < lo:
        c.fail(path, f"the highest temperature {hi:g} K is below the lowest {lo:g} K")


def _check_residuals(c: _Checker, record: dict) -> None:
    res = record.get("residuals")
    if res is None:
        return
    if not isinstance(res, list):
        c.fail("residuals", f"expected a list of points, found {_kind(res)}")
        return
    for i, point in enumerate(res):
        if not isinstance(point, dict):
            c.fail(f"residuals[{i}]", f"expected a group of entries, found {_kind(point)}")
            return
        before = len(c.problems)
        c.text(point, "property", f"residuals[{i}].property")
        for key in ("T_K", "measured_SI", "model_SI"):
            c.number(point, key, f"residuals[{i}].{key}")
        if len(c.problems) > before:
            return  # one damaged point is enough to say
    side = c.group(record, "residuals_file", required=False)
    if side is not None and "columns" not in side:  # in memory, before writing, the columns are still there
        c.text(side, "file", "residuals_file.file")
        c.text(side, "sha256", "residuals_file.sha256")


def _check_posterior(c: _Checker, record: dict) -> None:
    post = c.group(record, "posterior", required=False)
    if post is None:
        return
    samples = c.group(record, "posterior.samples", required=False)
    if samples is not None and samples.get("file") is not None:
        c.text(samples, "file", "posterior.samples.file")
        # a missing SHA-256 is refused where the samples are read (fitkin.inference.posterior.load_samples):
        # predictions then stop, a report says so and uses the covariance
        c.text(samples, "sha256", "posterior.samples.sha256", required=False)
    fixed = c.group(record, "posterior.fixed", required=False)
    for key in (fixed or {}):
        c.number(fixed, key, f"posterior.fixed.{key}")


def _check_optional(c: _Checker, record: dict) -> None:
    """Sections only reports and summaries read: right kind, numbers where numbers belong."""
    stats = c.group(record, "statistics", required=False)
    for key in ("chi2", "dof", "reduced_chi2", "points", "rms_deviation_percent", "max_abs_deviation_percent"):
        if stats is not None:
            c.number(stats, key, f"statistics.{key}", required=False)
    for key in ("provenance", "eucken", "demo_truth"):
        c.group(record, key, required=False)
    for key in ("warnings",):
        value = record.get(key)
        if value is not None and (not isinstance(value, list) or not all(isinstance(w, str) for w in value)):
            c.fail(key, f"expected a list of texts, found {_kind(value)}")


def check_record(record: dict, source) -> None:
    """Raise :class:`ParameterFileError` naming every damaged entry of ``record`` (read from
    ``source``) by its path; return None for a usable record."""
    c = _Checker()
    _check_gas(c, record)
    _check_potential(c, record)
    _check_parameters(c, record)
    params = record.get("parameters") if isinstance(record.get("parameters"), dict) else {}
    _check_matrix(c, record, "covariance", params)
    _check_matrix(c, record, "correlation", params)
    _check_theory(c, record)
    _check_data(c, record)
    _check_residuals(c, record)
    _check_posterior(c, record)
    _check_optional(c, record)
    if c.problems:
        shown = c.problems[:4]
        more = f" (and {len(c.problems) - 4} more)" if len(c.problems) > 4 else ""
        raise ParameterFileError(f"{source} is damaged or was edited by hand: " + "; ".join(shown) + more
                                 + "; rewrite it with fitkin fit or restore the entries")
