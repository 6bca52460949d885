"""The worked-example notebooks run top to bottom without an error, and are stored as built.

Each notebook is executed in a fresh ``python3`` kernel of this environment (ipykernel) with
nbclient. The kernel inherits the environment, including the temporary collision-integral
cache ``FITKIN_CACHE_DIR`` that ``tests/conftest.py`` sets; the notebooks write only into
temporary folders of their own, and the kernel's working directory is a pytest temporary
folder so that nothing lands in the source tree.
"""
from __future__ import annotations

import importlib.util
import os
from pathlib import Path

import pytest

nbformat = pytest.importorskip("nbformat")
nbclient = pytest.importorskip("nbclient")
pytest.importorskip("ipykernel")

NOTEBOOK_DIR = Path(__file__).resolve().parent.parent / "notebooks"
NOTEBOOKS = sorted(NOTEBOOK_DIR.glob("*.ipynb"))
KERNEL = "python3"
TIMEOUT = 300  # seconds per cell; the notebooks take well under a minute in all


def _builder():
    spec = importlib.util.spec_from_file_location("build_notebooks", NOTEBOOK_DIR / "build_notebooks.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _kernel_available() -> bool:
    from jupyter_client.kernelspec import KernelSpecManager, NoSuchKernel
    try:
        KernelSpecManager().get_kernel_spec(KERNEL)
    except NoSuchKernel:
        return False
    return True


def test_there_are_notebooks():
    assert len(NOTEBOOKS) >= 2, f"expected the worked examples in {NOTEBOOK_DIR}"


@pytest.mark.parametrize("path", NOTEBOOKS, ids=lambda p: p.stem)
def test_notebook_is_stored_as_built_without_outputs(path):
    nb = nbformat.read(path, as_version=4)
    for cell in nb.cells:
        if cell.cell_type == "code":
            assert not cell.outputs and cell.execution_count is None, \
                f"{path.name}: stored with outputs; rebuild with notebooks/build_notebooks.py"
    built = _builder().build(_builder().NOTEBOOKS[path.name])
    assert [c.source for c in nb.cells] == [c.source for c in built.cells], \
        f"{path.name} differs from notebooks/build_notebooks.py; edit the script and rebuild"


@pytest.mark.parametrize("path", NOTEBOOKS, ids=lambda p: p.stem)
def test_notebook_runs(path, tmp_path):
    if not _kernel_available():
        pytest.skip(f"no Jupyter kernel '{KERNEL}' found; install ipykernel in this environment")
    assert os.environ.get("FITKIN_CACHE_DIR"), "conftest.py should set a temporary cache"
    nb = nbformat.read(path, as_version=4)
    client = nbclient.NotebookClient(nb, kernel_name=KERNEL, timeout=TIMEOUT,
                                     resources={"metadata": {"path": str(tmp_path)}})
    try:
        client.execute()
    except nbclient.exceptions.CellExecutionError as exc:
        pytest.fail(f"{path.name}: a cell raised an error:\n{exc}")
    errors = [o for c in nb.cells if c.cell_type == "code" for o in c.outputs if o.output_type == "error"]
    assert not errors
    assert list(tmp_path.iterdir()) == [], "the notebook wrote into its working directory"
