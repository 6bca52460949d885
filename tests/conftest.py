"""Shared test set-up: an isolated collision-integral cache for the whole session."""
import os

import pytest


@pytest.fixture(scope="session", autouse=True)
def _isolated_cache(tmp_path_factory):
    """Tables built during the tests go to a fresh folder, never the user's cache."""
    folder = tmp_path_factory.mktemp("fitkin-cache")
    old = os.environ.get("FITKIN_CACHE_DIR")
    os.environ["FITKIN_CACHE_DIR"] = str(folder)
    yield folder
    if old is None:
        os.environ.pop("FITKIN_CACHE_DIR", None)
    else:
        os.environ["FITKIN_CACHE_DIR"] = old
