"""The public names of the package against the interface (tests/INTERFACE.md, the project's
copy of the second edition): every name the interface gives for the parts built so far exists,
every public name of the package is documented (INTERFACE.md or README.md), no name of the first
edition remains anywhere in the tree, and the Literal types repeat the core's one list of engine
and strategy names."""

import re
from pathlib import Path
from typing import get_args

import pytest

import fibrewise as fw
from fibrewise import _native

ROOT = Path(__file__).resolve().parent.parent
INTERFACE = (ROOT / "tests" / "INTERFACE.md").read_text(encoding="utf-8")
README = (ROOT / "README.md").read_text(encoding="utf-8")

# Members of the interface that need mathematics other engineers are building; they join the
# package under these names.
PENDING: set[str] = set()

# Names of the first edition, gone everywhere (no aliases). Two of them are the names another
# program uses, so they are spelled here in pieces: the tree must not contain them at all.
OLD_NAMES = [
    "Polynomial" + "Ring",
    "Ideal",
    "groebner_basis",
    "noether_normalization",
    "vector_space" + "_dimension",
    "is_maximal",
    "residue_field_degree",
    "hilbert_series",
    "is_subset",
    "QQ",
    "read_system",
    "parse_system",
    "normal_form_of",
    "NativeRing",
]

API_CLASSES = [
    fw.Field,
    fw.Space,
    fw.Polynomial,
    fw.System,
    fw.ReducedBasis,
    fw.HilbertSeries,
    fw.FiniteProjection,
    fw.IntegralEquation,
    fw.GroebnerStats,
    fw.ClosedPoint,
]


def table_rows(heading: str) -> list[str]:
    """First cells of the rows of the table whose header row starts with ``heading``."""
    lines = INTERFACE.splitlines()
    start = next(i for i, line in enumerate(lines) if line.startswith(heading))
    cells = []
    for line in lines[start + 2 :]:  # after the header and the rule
        if not line.startswith("|"):
            break
        cells.append(line.split("|")[1])
    return cells


def called_names(text: str) -> list[str]:
    return re.findall(r"(?:^|[`.\s])([a-z_]+)\(", text)


def test_every_system_member_of_the_interface_exists():
    names = {n for cell in table_rows("| `System` member |") for n in called_names(cell)}
    assert {"basis", "normal_form", "same_ideal", "ideal_contains", "hilbert", "projection"} <= names
    missing = sorted(n for n in names - PENDING if not hasattr(fw.System, n))
    assert not missing, f"System lacks {missing}"
    assert hasattr(fw.System, "__contains__")  # `f in S`


def examples() -> dict:
    V = fw.Space("GF(7)", "x, y")
    return {
        "Field": V.field,
        "Polynomial": V.parse("x*y"),
        "FiniteProjection": V.system(["x*y"]).projection(),
    }


@pytest.mark.parametrize("cls", ["Field", "Polynomial", "FiniteProjection"])
def test_members_listed_after_a_class_name_exist(cls):
    paragraph = INTERFACE.split(f"`{cls}`:", 1)[1].split("\n\n", 1)[0]
    names = set(re.findall(r"`\.([a-z_]+)", paragraph))
    assert names, cls
    missing = sorted(n for n in names - PENDING if not hasattr(examples()[cls], n))
    assert not missing, f"{cls} lacks {missing}"


def test_the_space_example_runs_as_written():
    block = INTERFACE.split("```python", 1)[1].split("```", 1)[0]
    for name in ["Space", "System"]:
        assert f"fw.{name}" in block and hasattr(fw, name)
    for method in ["variables", "parse", "system", "read"]:
        assert f".{method}" in block
    V = fw.Space("GF(7)", "x, y, z", order="grevlex")
    x, y, z = V.variables
    f = V.parse("x^2*y - 3/4*z + 1")
    S = V.system(["x*y - z^2", x**3 + y + 1])
    assert str(f) == "x^2*y + z + 1" and len(S.equations) == 2
    assert fw.field("GF(2^8)", modulus="a^8 + a^4 + a^3 + a + 1") == fw.field("GF(2^8)")
    assert str(fw.field("Q")) == "Q"


def test_public_names_are_documented():
    documented = INTERFACE + README
    for name in fw.__all__:
        assert re.search(rf"\b{name}\b", documented), f"fw.{name} is documented nowhere"
    for cls in API_CLASSES:
        for member in dir(cls):
            if member.startswith("_") or member in ("count", "index"):  # Sequence's own
                continue
            assert re.search(rf"\b{member}\b", documented), f"{cls.__name__}.{member} is documented nowhere"


def test_no_old_name_remains_in_the_package():
    public = set(dir(fw)) | set(dir(_native))
    for cls in API_CLASSES:
        public |= set(dir(cls))
    assert not public & set(OLD_NAMES)


def tree_files():
    # rust/python is left out: its Rust code calls the core by the core's own function names
    # (the mathematics' terms); the names it gives Python are checked above through dir(_native).
    for pattern in [
        "python/fibrewise/*.py",
        "python/fibrewise/*.pyi",
        "tests/*.py",
        "bench/*.py",
        "bench/README.md",
        "examples/*",
        "README.md",
        "DEVELOPERS.md",
        "CHANGELOG.md",
    ]:
        yield from ROOT.glob(pattern)


# Where an old name is still right: sympy's own API (its Gröbner function and its rational
# domain), the tests that the old field spec is refused, and this file's list.
ALLOWED = [
    r'domain="QQ"',
    r"sympy\.groebner",
    r"unknown field spec 'QQ'",
    r'"QQ", None',
    r"\"GF\(2\^8, modulus='a\^8\+a\^4\+a\^3\+a\+1'\)\", None",
]


def test_no_old_name_remains_in_the_tree():
    found = []
    for path in tree_files():
        if path.name in ("test_names.py", "CHANGELOG.md"):  # the changelog lists the renames
            continue
        for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            line = re.sub("|".join(ALLOWED), "", line)
            for name in OLD_NAMES:
                if re.search(rf"\b{name}\b", line):
                    found.append(f"{path.relative_to(ROOT)}:{number}: {name}")
            if "modulus='" in line or ".ideal(" in line:
                found.append(f"{path.relative_to(ROOT)}:{number}: {line.strip()}")
    assert not found, "\n".join(found)


def test_literal_types_repeat_the_core_lists():
    assert get_args(fw.Engine) == tuple(_native.ENGINE_NAMES)
    assert get_args(fw.Strategy) == tuple(_native.STRATEGY_NAMES)
    assert get_args(fw.OrderName) == ("lex", "grlex", "grevlex")


def test_every_engine_name_gives_the_same_basis():
    # Cox, Little, O'Shea §2.7 (from memory): (x^3 - 2xy, x^2y - 2y^2 + x) in grlex has the
    # reduced basis {x^2, xy, y^2 - x/2}.
    V = fw.Space(32003, "x, y", order="grlex")
    expected = [V.parse("x^2"), V.parse("x*y"), V.parse("y^2 - 1/2*x")]
    for engine in get_args(fw.Engine):
        assert list(V.system(["x^3 - 2*x*y", "x^2*y - 2*y^2 + x"]).basis(engine=engine)) == expected, engine
