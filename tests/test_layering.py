"""The core imports no spreadsheet library (DEVELOPERS.md, layout)."""

import ast
import subprocess
import sys
from pathlib import Path


def test_import_cellchem_loads_no_spreadsheet_library():
    code = (
        "import sys, cellchem, cellchem.audit, cellchem.cli;"
        "bad = [m for m in ('openpyxl', 'xlwings', 'uno') if m in sys.modules];"
        "print(','.join(bad))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""


def test_public_names():
    import cellchem

    for name in (
        "parse_formula",
        "molar_mass",
        "composition",
        "mass_fraction",
        "salt_formula",
        "charge_balance",
        "oxidation_state",
        "net_charge",
        "CellchemError",
    ):
        assert name in cellchem.__all__
        assert hasattr(cellchem, name)
    assert issubclass(cellchem.CellchemError, ValueError)


# ---------------------------------------------------------------------------
# The import graph: no circle, and the core never reaches the adapters
# ---------------------------------------------------------------------------

PACKAGE = Path(__file__).resolve().parents[1] / "cellchem"


def _module_name(path: Path) -> str:
    parts = path.relative_to(PACKAGE.parent).with_suffix("").parts
    return ".".join(parts[:-1] if parts[-1] == "__init__" else parts)


def _package_of(name: str, path: Path) -> str:
    return name if path.name == "__init__.py" else name.rpartition(".")[0]


def import_graph() -> dict[str, set[str]]:
    """Every module of the package and the cellchem modules it imports: every
    import statement, at module level or inside a function, relative or
    absolute; ``from . import x`` is an import of the submodule x where there is
    one, else of the package."""
    files = {_module_name(p): p for p in sorted(PACKAGE.rglob("*.py"))}
    graph: dict[str, set[str]] = {name: set() for name in files}

    def known(target: str) -> str | None:
        while target and target not in files:
            target = target.rpartition(".")[0]
        return target or None

    for name, path in files.items():
        tree = ast.parse(path.read_text(encoding="utf-8"), filename=str(path))
        for node in ast.walk(tree):
            targets: list[str] = []
            if isinstance(node, ast.Import):
                targets = [alias.name for alias in node.names]
            elif isinstance(node, ast.ImportFrom):
                if node.level:
                    base = _package_of(name, path)
                    for _ in range(node.level - 1):
                        base = base.rpartition(".")[0]
                    module = f"{base}.{node.module}" if node.module else base
                else:
                    module = node.module or ""
                targets = [
                    f"{module}.{alias.name}" if f"{module}.{alias.name}" in files else module
                    for alias in node.names
                ]
            for target in targets:
                if target == "cellchem" or target.startswith("cellchem."):
                    found = known(target)
                    if found is not None and found != name:
                        graph[name].add(found)
    return graph


def strongly_connected(graph: dict[str, set[str]]) -> list[list[str]]:
    """The strongly connected components of the graph (Tarjan), without recursion."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    on_stack: set[str] = set()
    stack: list[str] = []
    components: list[list[str]] = []
    counter = 0
    for root in sorted(graph):
        if root in index:
            continue
        work = [(root, iter(sorted(graph[root])))]
        index[root] = low[root] = counter
        counter += 1
        stack.append(root)
        on_stack.add(root)
        while work:
            node, children = work[-1]
            child = next(children, None)
            if child is not None:
                if child not in index:
                    index[child] = low[child] = counter
                    counter += 1
                    stack.append(child)
                    on_stack.add(child)
                    work.append((child, iter(sorted(graph[child]))))
                elif child in on_stack:
                    low[node] = min(low[node], index[child])
                continue
            work.pop()
            if work:
                low[work[-1][0]] = min(low[work[-1][0]], low[node])
            if low[node] == index[node]:
                component = []
                while True:
                    member = stack.pop()
                    on_stack.discard(member)
                    component.append(member)
                    if member == node:
                        break
                components.append(sorted(component))
    return components


def a_cycle(graph: dict[str, set[str]], members: list[str]) -> list[str]:
    """One circle of imports through the first member of a component, as a path."""
    inside = set(members)
    start = members[0]
    paths = {start: [start]}
    queue = [start]
    while queue:
        node = queue.pop(0)
        for child in sorted(graph[node] & inside):
            if child == start:
                return [*paths[node], start]
            if child not in paths:
                paths[child] = [*paths[node], child]
                queue.append(child)
    return members


def test_the_graph_sees_every_kind_of_import():
    graph = import_graph()
    # module level, relative: charge imports the solver
    assert "cellchem.solver" in graph["cellchem.charge"]
    # inside a function: the command line imports the adapters only in its commands
    assert "cellchem.adapters.files.fill" in graph["cellchem.cli"]
    # 'from . import x' is the submodule x
    assert "cellchem.adapters.sheets.functions" in graph["cellchem.adapters.sheets.excel"]
    # absolute imports, and a package's own modules
    assert "cellchem.names.to_formula" in graph["cellchem.names"]


def test_a_circle_is_found():
    graph = {"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}}
    (component,) = [c for c in strongly_connected(graph) if len(c) > 1]
    assert component == ["a", "b", "c"]
    assert a_cycle(graph, component) == ["a", "b", "c", "a"]


def test_no_import_circle_in_the_package():
    graph = import_graph()
    circles = [c for c in strongly_connected(graph) if len(c) > 1]
    assert not circles, "import circles: " + "; ".join(
        f"{', '.join(c)} (for example {' -> '.join(a_cycle(graph, c))})" for c in circles
    )


def test_the_core_imports_no_adapter_and_not_the_command_line():
    graph = import_graph()

    def outside_core(name: str) -> bool:
        # the command line, the adapters, and `python -m cellchem`, which runs the command line
        return name in ("cellchem.cli", "cellchem.__main__") or name.startswith("cellchem.adapters")

    wrong = {
        name: sorted(t for t in targets if outside_core(t))
        for name, targets in graph.items()
        if not outside_core(name) and any(outside_core(t) for t in targets)
    }
    assert not wrong, f"core modules importing the command line or an adapter: {wrong}"


def test_every_package_is_installed():
    """A wheel holds only the packages pyproject.toml lists: every folder of
    the package with an __init__.py must be among them."""
    import tomllib
    from pathlib import Path

    root = Path(__file__).resolve().parents[1]
    listed = set(tomllib.loads((root / "pyproject.toml").read_text())["tool"]["setuptools"]["packages"])
    found = {
        ".".join(init.parent.relative_to(root).parts) for init in (root / "cellchem").rglob("__init__.py")
    }
    assert found <= listed, sorted(found - listed)
