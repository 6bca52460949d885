"""Reading and checking an interaction file (``fitkin mix ... --out DIR`` → ``DIR/interaction.json``).

The entries a reader needs (docs/file-formats.md describes the whole file):

* ``format`` = :data:`FORMAT_NAME`, ``format_version`` ≤ :data:`FORMAT_VERSION` (a whole number);
* ``gases.first``, ``gases.second``: the two pure gases' parameter records, embedded whole,
  so the interaction file is usable alone; ``gas_files.first`` / ``.second``: ``path`` and
  ``sha256`` of the parameter files they came from (null for a gas given as an object);
* ``parametrisation``: ``direct`` (σ12, ε12/k fitted) or ``deviations`` (k12, l12 of the
  combining rule ``rule``); ``pair_options``: further keywords of
  :class:`fitkin.mixture.GasPair` (Sonine order, approximation, ...); ``unlike_potential``:
  ``name``, ``shape_parameters`` and the ``rule`` that chose it;
* ``parameters.sigma12`` (Å) and ``parameters.epsilon12_over_k`` (K), each with ``value``,
  ``stderr`` and ``unit`` (also ``k12``, ``l12`` with the deviations);
* ``covariance``: ``names`` (the entries of ``parameters``) and ``matrix``;
* ``mode`` (``sequential``, the default, or ``joint``) and ``joint`` (null, or for a joint fit
  ``parameters`` and ``covariance`` over the unlike parameters and ``first.sigma``,
  ``first.epsilon_over_k``, ``second.sigma``, ``second.epsilon_over_k``: bands without samples
  draw from it; the embedded ``gases`` are then the jointly refitted ones);
* ``posterior`` (a sampled fit, else null): ``samples_file`` (beside the interaction file,
  normally ``interaction_samples.npz``; an optional ``samples_sha256`` is checked). The
  samples file holds one array per parameter: the unlike parameters under their own names
  and the marginalised pure-gas parameters as ``first.sigma``, ``second.epsilon_over_k`` and
  so on (σ in Å, ε/k in K).

Nothing here computes a property; :mod:`fitkin.interaction.loaded` does.
"""
from __future__ import annotations

import hashlib
import io
import numbers
import zipfile
import zlib
from pathlib import Path

import numpy as np

from ..errors import ParameterFileError
from ..inference.posterior import MIN_DRAWS
from ..io.json_record import read_json_record
from ..io.record_check import check_record
from .record import FORMAT_NAME, FORMAT_VERSION

__all__ = ["FORMAT_NAME", "FORMAT_VERSION", "GAS_ROLES", "FITTED", "UNLIKE_PARAMETERS",
           "read_checked_interaction", "check_interaction_record", "interaction_samples"]

#: The two gases of a pair, in the order of the file (x1 is the mole fraction of the first).
GAS_ROLES = ("first", "second")
#: The parameters each parametrisation varies (what a draw of the unlike pair sets).
FITTED = {"direct": ("sigma12", "epsilon12_over_k"), "deviations": ("k12", "l12")}
#: Unlike-pair parameters a file may report, with the unit of their value in the file.
UNLIKE_PARAMETERS = {"sigma12": "angstrom", "epsilon12_over_k": "K", "k12": "", "l12": ""}
#: Parameters the covariance of a joint fit may name: the unlike ones and both pure gases' σ, ε/k.
JOINT_PARAMETERS = (*UNLIKE_PARAMETERS, *(f"{role}.{n}" for role in GAS_ROLES for n in ("sigma", "epsilon_over_k")))


def _number(value) -> bool:
    return isinstance(value, numbers.Real) and not isinstance(value, bool) and np.isfinite(value)


def read_checked_interaction(path) -> dict:
    """The record of an interaction file, checked (:func:`check_interaction_record`).

    Raises :class:`ParameterFileError` naming the file and what is wrong: not there, not JSON,
    another format or a newer version, an entry missing or of the wrong kind.
    """
    if not isinstance(path, (str, Path)) and not hasattr(path, "__fspath__"):
        raise ParameterFileError(f"an interaction file name must be text or a path, got {type(path).__name__} "
                                 f"{path!r:.60} (e.g. load_interaction('mix-ar-he/interaction.json'))")
    p = Path(path)
    record = read_json_record(p, "interaction file", "interaction.json")
    check_interaction_record(record, p)
    return record


def check_interaction_record(record, source) -> None:
    """Raise :class:`ParameterFileError` (``source``: the file, for the message) unless the
    record has every entry :class:`fitkin.interaction.loaded.FittedInteraction` reads."""
    if not isinstance(record, dict) or record.get("format") != FORMAT_NAME:
        hint = (" (it is a pure-gas parameter file; an interaction file is written by fitkin mix)"
                if isinstance(record, dict) and record.get("schema") == "fitkin.parameters" else "")
        raise ParameterFileError(f"{source}: not a fitkin interaction file (no \"format\": \"{FORMAT_NAME}\" "
                                 f"entry){hint}")
    version = record.get("format_version")
    if not isinstance(version, int) or isinstance(version, bool):
        raise ParameterFileError(f"{source}: format_version missing or not a whole number")
    if version > FORMAT_VERSION:
        raise ParameterFileError(f"{source} was written with interaction-file format version {version}, newer "
                                 f"than this fitkin reads (version {FORMAT_VERSION}); upgrade fitkin to read it")
    problems = []
    gases = record.get("gases")
    for role in GAS_ROLES:
        entry = gases.get(role) if isinstance(gases, dict) else None
        if not isinstance(entry, dict):
            problems.append(f"gases.{role}: required entry is missing (the pure gas's parameter record)")
            continue
        try:
            check_record(entry, f"gases.{role}")
        except ParameterFileError as exc:
            problems.append(str(exc))
    if record.get("parametrisation", "direct") not in FITTED:
        problems.append(f"parametrisation: expected one of {', '.join(FITTED)}, found {record['parametrisation']!r}")
    params = record.get("parameters")
    if not isinstance(params, dict):
        problems.append("parameters: required entry is missing")
        params = {}
    for name in ("sigma12", "epsilon12_over_k"):
        entry = params.get(name)
        if not isinstance(entry, dict) or not _number(entry.get("value")) or entry["value"] <= 0:
            problems.append(f"parameters.{name}.value: expected a positive number "
                            f"({'Å' if name == 'sigma12' else 'K'}), found {entry!r:.60}")
    problems += _covariance_problems(record.get("covariance"), params)
    problems += _joint_problems(record.get("joint"))
    if record.get("mode", "sequential") not in ("sequential", "joint"):
        problems.append(f"mode: expected sequential or joint, found {record['mode']!r:.40}")
    for key in ("pair_options", "unlike_potential", "posterior", "gas_files"):
        if record.get(key) is not None and not isinstance(record[key], dict):
            problems.append(f"{key}: expected a group of entries")
    post = record.get("posterior")
    if isinstance(post, dict) and not isinstance(post.get("samples_file"), str):
        problems.append("posterior.samples_file: expected the name of the samples file")
    if problems:
        raise ParameterFileError(f"{source}: " + "; ".join(problems) + " (the file is damaged or was edited by "
                                 "hand; write it again with fitkin mix)")


def _covariance_problems(cov, params: dict, where: str = "", allowed=tuple(UNLIKE_PARAMETERS)) -> list[str]:
    """What is wrong with the covariance ``cov`` of ``params`` (entries ``where`` + covariance, parameters)."""
    if not isinstance(cov, dict):
        return [f"{where}covariance: required entry is missing (names and matrix of the fitted parameters)"]
    names, matrix = cov.get("names"), cov.get("matrix")
    if not isinstance(names, list) or not names or not all(n in allowed for n in names):
        return [f"{where}covariance.names: expected fitted parameters among {', '.join(allowed)}, "
                f"found {names!r:.80}"]
    missing = [n for n in names if not isinstance(params.get(n), dict) or not _number(params[n].get("value"))]
    if missing:
        return [f"{where}parameters.{n}.value: the covariance names it, but it has no value" for n in missing]
    try:
        m = np.array(matrix, dtype=float)
    except (TypeError, ValueError):
        m = np.array([])
    if m.shape != (len(names), len(names)) or not np.all(np.isfinite(m)):
        return [f"{where}covariance.matrix: expected a {len(names)}×{len(names)} matrix of numbers"]
    scale = max(float(np.abs(m).max()), 1e-300)
    if not np.allclose(m, m.T, rtol=1e-8, atol=1e-12 * scale) or np.any(np.linalg.eigvalsh(m) < -1e-9 * scale):
        return [f"{where}covariance.matrix: not a covariance (not symmetric positive semi-definite)"]
    return []


def _joint_problems(joint) -> list[str]:
    """What is wrong with the ``joint`` entry of a joint-mode fit (None: not a joint fit)."""
    if joint is None:
        return []
    if not isinstance(joint, dict) or not isinstance(joint.get("parameters"), dict):
        return ["joint: expected a group with parameters and covariance (of a joint fit), or null"]
    return _covariance_problems(joint.get("covariance"), joint["parameters"], "joint.", JOINT_PARAMETERS)


def interaction_samples(record: dict, path) -> dict[str, np.ndarray] | None:
    """{name: (draws,) array} of the file's posterior samples, or None for a fit not sampled.

    The samples file lies beside the interaction file. A referenced file that is missing,
    damaged, changed (when the record gives its SHA-256) or unusable for a band (arrays of
    unequal length, fewer than :data:`fitkin.inference.posterior.MIN_DRAWS` draws,
    non-finite values, a fitted parameter missing, a name that is neither an unlike
    parameter nor ``first.``/``second.``) raises :class:`ParameterFileError` naming it: a band
    without it would silently leave out the marginalised pure-gas uncertainty.
    """
    post = record.get("posterior")
    if not post:
        return None
    p = (Path(path).parent if path is not None else Path(".")) / post["samples_file"]
    where = f"{path}: the posterior samples file {p}"
    if not p.is_file():
        raise ParameterFileError(f"{where} is missing (keep it beside the interaction file)")
    data = p.read_bytes()
    expected = post.get("samples_sha256")
    if isinstance(expected, str) and expected and hashlib.sha256(data).hexdigest() != expected.lower():
        raise ParameterFileError(f"{where} does not match the SHA-256 recorded in the interaction file "
                                 "(the samples were changed or belong to another fit)")
    try:
        with np.load(io.BytesIO(data), allow_pickle=False) as z:
            samples = {str(k): np.asarray(z[k], dtype=float).ravel() for k in z.files}
    except (ValueError, KeyError, OSError, EOFError, zipfile.BadZipFile, zlib.error) as exc:
        raise ParameterFileError(f"{where} is not a readable samples file ({type(exc).__name__}: {exc})") from None
    unknown = [n for n in samples if n not in UNLIKE_PARAMETERS and n.partition(".")[0] not in GAS_ROLES]
    fitted = FITTED[record.get("parametrisation", "direct")]
    missing = [n for n in fitted if n not in samples]
    lengths = {len(v) for v in samples.values()}
    if unknown or missing:
        raise ParameterFileError(f"{where} " + (f"holds {', '.join(unknown)}, which are neither unlike-pair nor "
                                                f"first./second. pure-gas parameters" if unknown else
                                                f"lacks the fitted {', '.join(missing)}"))
    if len(lengths) != 1 or lengths.pop() < MIN_DRAWS:
        raise ParameterFileError(f"{where} holds arrays of unequal length or fewer than {MIN_DRAWS} draws")
    if not all(np.all(np.isfinite(v)) for v in samples.values()):
        raise ParameterFileError(f"{where} holds values that are not finite numbers")
    return samples
