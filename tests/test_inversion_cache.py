"""The collision tables of the iterated potentials of an inversion are cached like any other:
a rerun of the same inversion computes none of them again; a changed table is a new key."""
import numpy as np
import pytest

from fitkin.collision import cache, clear_memory_cache, tables
from fitkin.inversion import invert_viscosity
from fitkin.potentials import ExpSix, Tabulated
from fitkin.potentials.tabulated import FORM_VERSION
from test_inversion_iterate import ARGON_MASS, T, synthetic

ITERATIONS = 2


@pytest.fixture
def counted(monkeypatch):
    """Every table build and every disk look-up of ``collision_table`` (real ones, counted)."""
    calls = {"built": [], "asked": [], "found": []}
    build, load = tables.build_table, cache.load_arrays

    def counting_build(potential, resolution=None):
        calls["built"].append(potential.cache_key())
        return build(potential, resolution)

    def counting_load(key, required=()):
        calls["asked"].append(key)
        out = load(key, required)
        if out is not None:
            calls["found"].append(key)
        return out

    monkeypatch.setattr(tables, "build_table", counting_build)
    monkeypatch.setattr(cache, "load_arrays", counting_load)
    clear_memory_cache()
    yield calls
    clear_memory_cache()


def tabulated(keys):
    return [k for k in keys if k.startswith("tabulated-")]


def test_rerun_of_the_same_inversion_computes_no_table(counted):
    mu, u, virial = synthetic(ExpSix(15.0))
    first = invert_viscosity(T, mu, u, molar_mass=ARGON_MASS, virial=virial, max_iterations=ITERATIONS)
    asked = tabulated(counted["asked"])
    # one table per iteration, each looked up once (then held in memory for the rest of the run)
    assert len(asked) == len(first.iterations) == ITERATIONS and len(set(asked)) == ITERATIONS
    assert len(counted["built"]) == len(set(counted["built"]))
    assert first.curve.cache_key() == asked[-1] and asked[-1].startswith(f"tabulated-form{FORM_VERSION}-")
    assert cache.cache_path(asked[-1]).is_file()

    clear_memory_cache()           # a new run: only the disk cache is left
    for calls in counted.values():
        calls.clear()
    second = invert_viscosity(T, mu, u, molar_mass=ARGON_MASS, virial=virial, max_iterations=ITERATIONS)
    assert counted["built"] == []  # nothing recomputed, the start's table included
    assert tabulated(counted["found"]) == asked
    np.testing.assert_array_equal(second.curve_energy_over_k, first.curve_energy_over_k)
    np.testing.assert_array_equal(second.predicted_viscosity, first.predicted_viscosity)


def test_changed_table_misses_the_cache(counted):
    mu, u, virial = synthetic(ExpSix(15.0))
    res = invert_viscosity(T, mu, u, molar_mass=ARGON_MASS, virial=virial, max_iterations=1)
    key = res.curve.cache_key()
    assert cache.load_arrays(key) is not None
    # one energy of the table moved by 1e-9 of itself: another shape, another key, nothing on disk
    energies = res.curve_energy_over_k.copy()
    energies[len(energies) // 2] *= 1 + 1e-9
    changed = Tabulated(res.curve_r, energies, r_unit="m", energy_unit="K")
    assert changed.cache_key() != key and cache.load_arrays(changed.cache_key()) is None
    # the same table again (rebuilt from the same numbers) shares the key
    assert Tabulated(res.curve_r, res.curve_energy_over_k, r_unit="m", energy_unit="K").cache_key() == key
    # an inversion of data changed by a fifth of one u: its iterated table is new and is computed
    for calls in counted.values():
        calls.clear()
    clear_memory_cache()
    mu_changed = mu.copy()
    mu_changed[0] += 0.2 * u[0]
    other = invert_viscosity(T, mu_changed, u, molar_mass=ARGON_MASS, virial=virial, max_iterations=1)
    assert other.curve.cache_key() != key
    assert tabulated(counted["built"]) == [other.curve.cache_key()]
    assert tabulated(counted["found"]) == []
