"""The modules form layers, as the dependency pictures of DEVELOPERS.md say.

Python: every module of the package imports only modules below it (no cycle in the import
graph), and at module level only, so that the picture in DEVELOPERS.md is the whole truth. Imports under ``if TYPE_CHECKING:`` are for type checkers and do not count;
imports of other packages (the standard library, optional extras such as matplotlib, sympy,
galois and dask) may stay inside functions, where they keep start-up fast.

The graph is read from the source files with ``ast`` (common practice for import checks), so a
new edge that closes a cycle fails here before it fails at import time.

Rust: the core's top-level modules (``crate::field``, ``crate::groebner``, ...) in the order of
``RUST_LAYERS``; a module may use only modules before it (``KNOWN_BACK_EDGES`` is empty: a back
edge added there must be named in DEVELOPERS.md). Read from ``crate::`` paths outside comments and
test code.
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
PACKAGE = ROOT / "python" / "fibrewise"
CORE = ROOT / "rust" / "core" / "src"


def _module_name(path: Path) -> str:
    parts = list(path.relative_to(PACKAGE.parent).with_suffix("").parts)
    if parts[-1] == "__init__":
        parts.pop()
    return ".".join(parts)


def _is_type_checking_block(node: ast.AST) -> bool:
    return isinstance(node, ast.If) and "TYPE_CHECKING" in ast.unparse(node.test)


def _imports(tree: ast.Module):
    """(import node, inside a function) for every import outside ``if TYPE_CHECKING:`` blocks."""
    found = []

    def visit(node: ast.AST, in_function: bool) -> None:
        for child in ast.iter_child_nodes(node):
            if _is_type_checking_block(child):
                continue
            if isinstance(child, (ast.Import, ast.ImportFrom)):
                found.append((child, in_function))
            inner = in_function or isinstance(child, (ast.FunctionDef, ast.AsyncFunctionDef, ast.Lambda))
            visit(child, inner)

    visit(tree, False)
    return found


def _targets(module: str, is_package: bool, node: ast.AST, modules: set[str]) -> list[str]:
    """The fibrewise modules an import statement loads (none for other packages)."""
    if isinstance(node, ast.Import):
        return [a.name for a in node.names if a.name.split(".")[0] == "fibrewise" and a.name in modules]
    assert isinstance(node, ast.ImportFrom)
    if node.level == 0:
        base = node.module or ""
        if base.split(".")[0] != "fibrewise":
            return []
    else:
        anchor = module.split(".") if is_package else module.split(".")[:-1]
        anchor = anchor[: len(anchor) - (node.level - 1)]
        base = ".".join(anchor + ([node.module] if node.module else []))
    targets = []
    for alias in node.names:
        sub = f"{base}.{alias.name}"
        targets.append(sub if sub in modules else base)
    return [t for t in targets if t in modules]


def _graph():
    paths = sorted(PACKAGE.rglob("*.py"))
    modules = {_module_name(p) for p in paths} | {"fibrewise._native"}
    edges: dict[str, set[str]] = {}
    late: list[str] = []
    for path in paths:
        name = _module_name(path)
        tree = ast.parse(path.read_text(encoding="utf-8"))
        edges[name] = set()
        for node, in_function in _imports(tree):
            targets = [t for t in _targets(name, path.name == "__init__.py", node, modules) if t != name]
            edges[name].update(targets)
            if in_function and targets:
                late.append(f"{path.relative_to(PACKAGE.parent)}:{node.lineno}: {ast.unparse(node)}")
    return edges, late


def _cycle(edges: dict[str, set[str]]) -> list[str] | None:
    """One cycle of the graph, as a path, or None (depth-first search with three colours)."""
    colour: dict[str, int] = {}
    stack: list[str] = []

    def visit(node: str) -> list[str] | None:
        colour[node] = 1
        stack.append(node)
        for nxt in sorted(edges.get(node, ())):
            if colour.get(nxt) == 1:
                return stack[stack.index(nxt) :] + [nxt]
            if colour.get(nxt) is None:
                found = visit(nxt)
                if found:
                    return found
        stack.pop()
        colour[node] = 2
        return None

    for node in sorted(edges):
        if colour.get(node) is None:
            found = visit(node)
            if found:
                return found
    return None


def test_the_package_imports_form_layers_without_a_cycle():
    edges, _ = _graph()
    # The package root imports the public names; every module below it must be acyclic too.
    assert _cycle(edges) is None, " -> ".join(_cycle(edges) or [])


def test_modules_of_the_package_are_imported_at_module_level_only():
    _, late = _graph()
    assert late == [], "imports of fibrewise modules inside functions:\n" + "\n".join(late)


def test_the_checker_sees_cycles_and_late_imports():
    # The checks above must be able to fail: a two-module cycle and a late import are found.
    assert _cycle({"a": {"b"}, "b": {"c"}, "c": {"a"}}) == ["a", "b", "c", "a"]
    assert _cycle({"a": {"b"}, "b": set()}) is None
    tree = ast.parse(
        "import os\ndef f():\n    from . import spaces\nif TYPE_CHECKING:\n    from . import x\n"
    )
    imports = _imports(tree)
    assert [(ast.unparse(n), late) for n, late in imports] == [
        ("import os", False),
        ("from . import spaces", True),
    ]
    modules = {"fibrewise.spaces", "fibrewise.systems", "fibrewise.batch", "fibrewise.jobs"}
    assert _targets("fibrewise.systems", False, imports[1][0], modules) == ["fibrewise.spaces"]
    relative = ast.parse("from ..jobs import run_job").body[0]
    assert _targets("fibrewise.batch.sandbox", False, relative, modules) == ["fibrewise.jobs"]


# The core's top-level modules, lowest first (DEVELOPERS.md, "Dependency picture (rust/core)").
RUST_LAYERS = [
    "error",
    "control",
    "monomial",
    "order",
    "vector_unit",
    "monomial_ideal",
    "dimension",
    "rng",
    "field",
    "poly",
    "parse",
    "symbols",
    "univariate",
    "extension",
    "field_kind",
    "field_spec",
    "echelon",
    "charpoly",
    "groebner",
    "hilbert",
    "frobenius",
    "normalization",
    "zerodim",
    "integrality",
    "points",
    "curves",
    "boolean",
    "systems",
]
# Edges from a module to a later one: none remain, and a new one fails the test.
KNOWN_BACK_EDGES: set[tuple[str, str]] = set()


def _without_tests_and_comments(source: str) -> str:
    """The source without ``#[cfg(test)]`` items (a ``mod tests;`` line or a braced block) and
    without line comments."""
    kept, i = [], 0
    while (start := source.find("#[cfg(test)]", i)) >= 0:
        kept.append(source[i:start])
        brace, semicolon = source.find("{", start), source.find(";", start)
        if semicolon >= 0 and (brace < 0 or semicolon < brace):
            i = semicolon + 1
            continue
        depth, j = 0, brace
        while j < len(source):
            depth += {"{": 1, "}": -1}.get(source[j], 0)
            if depth == 0:
                break
            j += 1
        i = j + 1
    kept.append(source[i:])
    return re.sub(r"//[^\n]*", "", "".join(kept))


def _rust_edges() -> set[tuple[str, str]]:
    edges = set()
    for path in CORE.rglob("*.rs"):
        relative = path.relative_to(CORE)
        if path.name in ("lib.rs", "test_support.rs") or path.name.endswith("tests.rs"):
            continue
        module = relative.parts[0].removesuffix(".rs")
        text = _without_tests_and_comments(path.read_text(encoding="utf-8"))
        for used in re.findall(r"(?<![\w$])crate::([a-z_][a-z0-9_]*)\b(?!\s*!)", text):
            if used != module:
                edges.add((module, used))
    return edges


def test_the_core_modules_use_only_lower_layers_but_for_the_known_back_edges():
    edges = _rust_edges()
    modules = {m for edge in edges for m in edge}
    assert modules <= set(RUST_LAYERS), f"modules missing from RUST_LAYERS: {modules - set(RUST_LAYERS)}"
    rank = {m: i for i, m in enumerate(RUST_LAYERS)}
    back = {(a, b) for a, b in edges if rank[b] > rank[a]}
    assert back - KNOWN_BACK_EDGES == set(), "new back edges: add the modules in layer order"
    assert KNOWN_BACK_EDGES - back == set(), "back edges gone: remove them from KNOWN_BACK_EDGES"


def test_the_rust_reader_skips_tests_and_comments():
    source = "use crate::a::b;\n// crate::c\n#[cfg(test)]\nmod tests {\n    use crate::d;\n}\n#[cfg(test)]\nmod more;\n"
    text = _without_tests_and_comments(source)
    assert re.findall(r"crate::([a-z_]+)", text) == ["a"]
