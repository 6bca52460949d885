"""Code shape (DESIGN.md style notes): no import cycles among fitkin's modules, and imports at
the top of modules except where the command line picks a sub-command module."""
import importlib.util
from pathlib import Path

REPO = Path(__file__).resolve().parent.parent
_spec = importlib.util.spec_from_file_location("check_imports", REPO / "tools" / "check_imports.py")
check_imports = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(check_imports)


def test_no_import_cycles_and_no_function_local_imports():
    edges, local = check_imports.scan(REPO)
    assert check_imports.import_cycles(edges) == []
    assert [x for x in local if (x[0], x[2]) not in check_imports.ALLOWED_LOCAL] == []
    assert edges["fitkin.theory.transport"] >= {"fitkin.collision", "fitkin.theory.sonine"}


def test_the_checker_finds_a_cycle_and_a_local_import(tmp_path):
    pkg = tmp_path / "fitkin"
    (pkg / "sub").mkdir(parents=True)
    (pkg / "__init__.py").write_text("", encoding="utf-8")
    (pkg / "a.py").write_text("from .sub import b\n", encoding="utf-8")
    (pkg / "sub" / "__init__.py").write_text("", encoding="utf-8")
    (pkg / "sub" / "b.py").write_text("from ..c import x\n", encoding="utf-8")
    (pkg / "c.py").write_text("import fitkin.a\nfrom typing import TYPE_CHECKING\nif TYPE_CHECKING:\n"
                              "    from .d import y\n\ndef f():\n    from .d import y\n    return y\n",
                              encoding="utf-8")
    (pkg / "d.py").write_text("from .c import f\n", encoding="utf-8")
    edges, local = check_imports.scan(tmp_path)
    assert check_imports.import_cycles(edges) == [["fitkin.a", "fitkin.c", "fitkin.sub.b"]]
    assert local == [("fitkin/c.py", 7, "from .d import y")]
    assert check_imports.main([str(tmp_path)]) == 1
