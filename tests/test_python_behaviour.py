"""What Python users expect of the API: TypeError for wrong types, ValueError for bad values,
``==`` across spaces is False, ``repr()`` names the space, ``fw.ParseError`` carries the line and
column the core's parser found, variable ranges, and LaTeX for notebooks."""

from fractions import Fraction

import pytest

import fibrewise as fw


@pytest.fixture
def V():
    return fw.Space("GF(7)", "x, y, z")


# --- wrong types: TypeError, naming what was expected -----------------------------------------


@pytest.mark.parametrize(
    "call, message",
    [
        (lambda V: V.parse(3), "parse takes a str"),
        (lambda V: V.variables[0] + 1.5, "unsupported operand"),
        (lambda V: V.variables[0] * "y", "multiply sequence|unsupported operand"),
        (lambda V: V.variables[0] ** 1.5, "int exponent"),
        (lambda V: V.variables[0] ** "2", "int exponent"),
        (lambda V: V.polynomial(0.5), "float is not an element of GF\\(7\\)"),
        (lambda V: V.polynomial(None), "cannot make a polynomial"),
        (lambda V: V.system([1.0]), "float is not an element"),
        (lambda V: V.system(None), "equations are a list"),
        (lambda V: V.parse("x").evaluate([1.5, 0, 0]), "must be an int"),
        (lambda V: V.parse("x").evaluate(3), "sequence or a mapping"),
        (lambda V: V.parse("x").substitute(["y"]), "mapping"),
        (lambda V: V.from_terms([((1.0, 0, 0), 1)]), "exponents are ints"),
        (lambda V: V.system(["x"]).basis(engine=4), "engine must be a str"),
        (lambda V: V.system(["x"]).basis(max_degree=2.5), "max_degree must be an int"),
        (lambda V: V.system(["x"]).basis(threads="2"), "threads must be an int"),
        (lambda V: V.system(["x"]).projection(strategy=None), "strategy must be a str"),
        (lambda V: V.system(["x"]).projection(seed=1.0), "seed must be an int"),
        (lambda V: V.system(["x"]).same_ideal("x"), "expected a System"),
        (lambda V: V.system(["x"]).count_points(projective="yes"), "projective must be a bool"),
        (lambda V: fw.Space(7, [None]), "variable names must be str"),
        (lambda V: fw.Space(7, 3), "variables are a str or a list"),
        (lambda V: fw.Space(7, "x", order=3), "a monomial order is"),
        (lambda V: fw.WeightOrder([1.5, 1]), "weights must be ints"),
        (lambda V: fw.field(7.0), "a field spec is"),
    ],
)
def test_wrong_types_raise_type_error(V, call, message):
    with pytest.raises(TypeError, match=message):
        call(V)


# --- bad values: ValueError ------------------------------------------------------------------


@pytest.mark.parametrize(
    "call, message",
    [
        (lambda V: V.variables[0] ** -1, "non-negative exponent"),
        (lambda V: V.variables[0] ** 2**64, "out of range"),
        (lambda V: V.variables[0] / V.variables[1], "non-constant"),
        (lambda V: V.from_terms([((-1, 0, 0), 1)]), "out of range"),
        (lambda V: V.system(["x"]).basis(max_degree=-1), "max_degree must be between 0"),
        (lambda V: V.system(["x"]).basis(threads=0), "threads must be between 1"),
        (lambda V: V.system(["x"]).basis(max_degree=2**40), "max_degree must be between 0 and 4294967295"),
        (lambda V: V.system(["x"]).basis(engine="fast"), "unknown engine 'fast': expected one of auto, f4"),
        (lambda V: V.system(["x"]).projection(strategy="best"), "unknown normalization strategy 'best'"),
        (lambda V: V.system(["x"]).projection(seed=-1), "seed must be non-negative"),
        (lambda V: V.polynomial(Fraction(1, 7)), "1/7 is not an element of GF\\(7\\)"),
        (lambda V: V.parse("x").evaluate([1, 2]), "2 coordinates for 3 variables"),
        (lambda V: fw.Space(7, "x0..y3"), "variable range 'x0..y3'"),
        (lambda V: fw.Space(7, "x5..x2"), "2 is below 5"),
        (lambda V: fw.Space(7, "x, x"), "given twice"),
        (lambda V: fw.Space(7, "x", order="revlex"), "unknown monomial order 'revlex'"),
        (lambda V: V.system(["x"]).count_points(over="GF(5^2)"), "not a finite extension of GF\\(7\\)"),
        (
            lambda V: fw.Space("GF(9)", "x").system(["x"]).count_points(over="GF(3^3)"),
            "not a finite extension of GF\\(3\\^2\\)",
        ),
    ],
)
def test_bad_values_raise_value_error(V, call, message):
    with pytest.raises(ValueError, match=message):
        call(V)


def test_division_by_constants(V):
    x, y, _ = V.variables
    assert (x + y) / 2 == V.parse("4*x + 4*y")  # 1/2 = 4 in GF(7)
    assert x / Fraction(3, 2) == V.parse("2/3*x")
    with pytest.raises(ZeroDivisionError):
        x / 7


# --- equality, hashing and repr ---------------------------------------------------------------


def test_equality_across_spaces_is_false_not_an_error():
    x7 = fw.Space(7, "x, y").parse("x")
    x11 = fw.Space(11, "x, y").parse("x")
    xz = fw.Space(7, "x, z").parse("x")
    assert (x7 == x11) is False and (x7 != x11) is True and (x7 == xz) is False
    assert (x7 == "x") is False and (x7 == 1.0) is False and (x7 == None) is False  # noqa: E711
    # The same coordinates with another order: the same polynomial.
    assert x7 == fw.Space(7, "x, y", order="lex").parse("x")
    assert fw.Space(7, "x, y").system(["x"]) != fw.Space(11, "x, y").system(["x"])
    assert fw.Space(7, "x") != fw.Space(11, "x") and fw.Space(7, "x") == fw.Space("GF(7)", ["x"])


def test_constants_compare_with_ints_and_fractions(V):
    assert V.parse("3") == 3 and V.parse("3") == 10 and V.parse("1/2") == Fraction(1, 2)
    assert hash(V.parse("x + 1")) == hash(fw.Space(7, "x, y, z", order="lex").parse("1 + x"))


def test_repr_names_the_space():
    V = fw.Space("GF(7)", "x, y")
    f = V.parse("x^2 - y")
    assert repr(f) == "<Polynomial x^2 - y over GF(7)[x, y]>"
    S = V.system([f, "x*y - 1"])
    assert repr(S) == "<System of 2 equations over GF(7)[x, y]: (x^2 - y, x*y - 1)>"
    basis = S.basis()
    assert repr(basis).startswith("<ReducedBasis of 3 polynomials over GF(7)[x, y], order 'grevlex': [")
    assert repr(V) == "Space('GF(7)', 'x, y', order='grevlex')"
    assert repr(fw.field("GF(2^8)")) == "field('GF(2^8)')"
    assert repr(S.hilbert()).startswith("<HilbertSeries (affine) ")


# --- ParseError from the core's parser --------------------------------------------------------


def test_parse_errors_carry_line_and_column(V):
    with pytest.raises(fw.ParseError) as err:
        V.parse("x^2 + y\n  + 3*z\n  - w + 1")
    e = err.value
    assert isinstance(e, ValueError)
    assert (e.line, e.column) == (3, 5) and e.message == "unknown variable 'w' (the variables are x, y, z)"
    assert str(e) == "line 3, column 5: unknown variable 'w' (the variables are x, y, z)"
    with pytest.raises(fw.ParseError) as err:
        V.system(["x*y", "x +* y"])
    assert (err.value.line, err.value.column) == (1, 4)


def test_system_file_errors_are_parse_errors(tmp_path):
    path = tmp_path / "s.txt"
    path.write_text("field: GF(7)\nvariables: x0..x3\n# a comment\n   x0*x1 - 1\n   x3 + x4\n")
    with pytest.raises(fw.ParseError) as err:
        fw.System.read(str(path))
    e = err.value
    assert (e.path, e.line, e.column) == (str(path), 5, 9)
    assert e.message == "unknown variable 'x4' (the variables are x0, x1, x2, x3)"
    assert str(e) == f"{path}:5:9: {e.message}"


# --- variable ranges --------------------------------------------------------------------------


def test_variable_ranges_everywhere(tmp_path):
    V = fw.Space("GF(2)", "k0..k3, x, y1..y2")
    assert V.names == ("k0", "k1", "k2", "k3", "x", "y1", "y2")
    assert fw.Space(2, ["x0..x63"]).names == tuple(f"x{i}" for i in range(64))
    path = tmp_path / "r.txt"
    path.write_text("field: GF(2)\nvariables: x0..x2\nx0*x1 + x2\n")
    assert fw.System.read(str(path)).space.names == ("x0", "x1", "x2")
    from fibrewise.jobs import check_job

    job = check_job({"id": 1, "field": "GF(2)", "variables": ["a", "x0..x2"], "polynomials": ["x2"]})
    assert job["variables"] == ["a", "x0", "x1", "x2"]


# --- notebooks --------------------------------------------------------------------------------


def test_latex_reprs():
    V = fw.Space("Q", "x1, y")
    f = V.parse("3/4*x1^2*y - y + 2")
    assert f._repr_latex_() == r"$\frac{3}{4} x_{1}^{2} y - y + 2$"
    S = V.system([f, "x1 - y"])
    assert S._repr_latex_() == (
        r"$\left\{\begin{aligned}\frac{3}{4} x_{1}^{2} y - y + 2 &= 0 \\ "
        r"x_{1} - y &= 0\end{aligned}\right.$"
    )
    assert S.basis()._repr_latex_().startswith(r"$\left[")
    assert fw.field("GF(2^8)")._repr_latex_() == r"$\mathbb{F}_{2^{8}}$"
    assert fw.Space("GF(7)", "x").system(["x^2"]).hilbert()._repr_latex_() == "$1 + t$"
