"""The start of a big fit: the ε/k grid runs on an evenly spaced sample (invented data only)."""
import numpy as np

from fitkin.inference.fitdata import FitData
from fitkin.inference.start import START_POINTS, start_sample
from fitkin.measurements import MeasuredTable, PropertySeries


def _series(kind, T):
    n = len(T)
    return PropertySeries(kind, T, np.ones(n), np.full(n, 0.01), np.full(n, np.nan), np.full(n, "s", dtype=object),
                          np.arange(2, n + 2), "a.csv", "SI", "absolute")


def test_sample_keeps_ends_and_every_point_of_a_small_kind():
    visc = _series("viscosity", np.random.default_rng(1).uniform(200, 900, 40_000))
    virial = _series("second_virial", np.linspace(250, 600, 30))
    data = FitData.from_tables([MeasuredTable("a.csv", "0" * 64, (visc, virial))])
    sample = start_sample(data)
    assert len(sample) <= START_POINTS + 30
    assert np.sum(sample.kind == "second_virial") == 30
    v = data.temperature[data.kind == "viscosity"]
    sv = sample.temperature[sample.kind == "viscosity"]
    assert sv.min() == v.min() and sv.max() == v.max()
    assert sample.weighted == data.weighted


def test_small_data_is_used_whole():
    data = FitData.from_tables([MeasuredTable("a.csv", "0" * 64, (_series("viscosity", np.linspace(200, 900, 50)),))])
    assert start_sample(data) is data
