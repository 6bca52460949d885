"""Code shape: import cycles among fitkin's modules and imports inside functions.

Usage: ``python tools/check_imports.py [REPO]`` prints both lists and exits 1 when either
holds something not allowed. Reads the source as text (``ast``); imports nothing of fitkin.

* An import cycle is a group of modules that import one another at module level, directly or
  through others (a strongly connected component of the import graph, Tarjan 1972). Importing
  a name from a package runs the package's ``__init__``, so such an import is an edge to the
  package; imports under ``if TYPE_CHECKING:`` are not edges.
* A function-local import hides a dependency; the one allowed is the command line choosing
  which sub-command module to load (:data:`ALLOWED_LOCAL`).
"""
from __future__ import annotations

import ast
import sys
from pathlib import Path

__all__ = ["module_files", "scan", "import_cycles", "ALLOWED_LOCAL"]

#: (file, import statement) of the function-local imports the project allows.
ALLOWED_LOCAL = {("fitkin/cli.py", "from . import commands")}


def module_files(repo: Path) -> dict[str, Path]:
    """{dotted module name: file} of every module of the fitkin package under ``repo``."""
    out = {}
    for f in sorted((repo / "fitkin").rglob("*.py")):
        parts = list(f.relative_to(repo).with_suffix("").parts)
        if parts[-1] == "__init__":
            parts = parts[:-1]
        out[".".join(parts)] = f
    return out


def _targets(module: str, is_package: bool, node, modules) -> list[str]:
    """The fitkin modules an import statement of ``module`` loads."""
    if isinstance(node, ast.Import):
        names = [a.name for a in node.names]
    else:
        base = module.split(".") if is_package else module.split(".")[:-1]
        if node.level:
            base = base[:len(base) - node.level + 1]
            target = ".".join(base + ([node.module] if node.module else []))
        else:
            target = node.module or ""
        names = [f"{target}.{a.name}" if f"{target}.{a.name}" in modules else target for a in node.names]
    out = []
    for name in names:
        while name and name not in modules:  # 'fitkin.io.tables.read_table' -> 'fitkin.io.tables'
            name = name.rpartition(".")[0]
        if name and name != module:
            out.append(name)
    return out


def _type_checking_only(node, parents) -> bool:
    p = parents.get(node)
    while p is not None:
        if isinstance(p, ast.If) and "TYPE_CHECKING" in ast.unparse(p.test):
            return True
        p = parents.get(p)
    return False


def _in_function(node, parents) -> bool:
    p = parents.get(node)
    while p is not None:
        if isinstance(p, (ast.FunctionDef, ast.AsyncFunctionDef, ast.Lambda)):
            return True
        p = parents.get(p)
    return False


def scan(repo: Path) -> tuple[dict[str, set[str]], list[tuple[str, int, str]]]:
    """(module-level import edges {module: modules it imports}, function-local imports as
    (file relative to ``repo``, line, statement))."""
    modules = module_files(repo)
    edges: dict[str, set[str]] = {m: set() for m in modules}
    local = []
    for module, path in modules.items():
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        parents = {child: node for node in ast.walk(tree) for child in ast.iter_child_nodes(node)}
        for node in ast.walk(tree):
            if not isinstance(node, (ast.Import, ast.ImportFrom)):
                continue
            if _in_function(node, parents):
                local.append((path.relative_to(repo).as_posix(), node.lineno, ast.unparse(node)))
            elif not _type_checking_only(node, parents):
                edges[module].update(_targets(module, path.name == "__init__.py", node, modules))
    return edges, local


def import_cycles(edges: dict[str, set[str]]) -> list[list[str]]:
    """Groups of two or more modules that import one another (Tarjan's strongly connected
    components, iterative), each sorted."""
    index, low, on_stack, stack, groups = {}, {}, set(), [], []
    counter = 0
    for root in edges:
        if root in index:
            continue
        work = [(root, iter(sorted(edges[root])))]
        index[root] = low[root] = counter
        counter += 1
        stack.append(root)
        on_stack.add(root)
        while work:
            v, children = work[-1]
            w = next(children, None)
            if w is not None:
                if w not in index:
                    index[w] = low[w] = counter
                    counter += 1
                    stack.append(w)
                    on_stack.add(w)
                    work.append((w, iter(sorted(edges.get(w, ())))))
                elif w in on_stack:
                    low[v] = min(low[v], index[w])
                continue
            work.pop()
            if work:
                low[work[-1][0]] = min(low[work[-1][0]], low[v])
            if low[v] == index[v]:
                group = []
                while True:
                    w = stack.pop()
                    on_stack.discard(w)
                    group.append(w)
                    if w == v:
                        break
                if len(group) > 1:
                    groups.append(sorted(group))
    return groups


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else argv
    repo = Path(argv[0] if argv else Path(__file__).resolve().parent.parent)
    edges, local = scan(repo)
    bad_local = [x for x in local if (x[0], x[2]) not in ALLOWED_LOCAL]
    cycles = import_cycles(edges)
    print("function-local imports (not allowed):")
    print("\n".join(f"  {f}:{line}: {stmt}" for f, line, stmt in bad_local) or "  none")
    print("import cycles:")
    for group in cycles:
        inner = {m: sorted(edges[m] & set(group)) for m in group}
        print("  " + "; ".join(f"{m} -> {', '.join(t)}" for m, t in inner.items()))
    if not cycles:
        print("  none")
    return 1 if bad_local or cycles else 0


if __name__ == "__main__":
    sys.exit(main())
