"""The Python API of spaces, polynomials and systems: round trips, arithmetic, orders, errors.

Textbook check values name their source beside them."""

import os
import signal
import threading

import pytest

import fibrewise as fw
from systems import cyclic


@pytest.fixture
def R():
    return fw.Space("GF(7)", "x, y, z", order="grevlex")


# --- fields -----------------------------------------------------------------------------------


def test_field_specs_and_round_trip():
    for spec in [7, "7", "GF(7)", "GF(65521)", " GF( 2 ) ".replace(" ", "")]:
        F = fw.field(spec)
        assert fw.field(str(F)) == F
    F = fw.field("GF(9223372036854775783)")  # the largest prime below 2^63 (sympy.prevprime(2**63))
    assert F.characteristic == 9223372036854775783 and F.size == F.characteristic and F.degree == 1
    assert repr(fw.field(7)) == "field('GF(7)')"


@pytest.mark.parametrize(
    "spec,message",
    [
        ("GF(65535)", "65535 is not a prime (it is divisible by 3)"),
        (1, "1 is not a prime"),
        ("GF(x)", "unknown field spec 'GF(x)'"),
        (2**63 + 1, "is not a prime (it is divisible by 3)"),
    ],
)
def test_bad_field_specs(spec, message):
    with pytest.raises(ValueError, match=message.replace("(", r"\(").replace(")", r"\)").replace("^", r"\^")):
        fw.field(spec)


# --- polynomials ------------------------------------------------------------------------------


def test_parse_and_print_round_trip(R):
    f = R.parse("x^2*y - 3/4*z + 1")
    assert str(f) == "x^2*y + z + 1"  # 3/4 = 6 = -1 in GF(7)
    for text in ["(x+1)**3", "-x^2 + 3*y*z - 1", "x - x", "2*x*y^3 - z^5"]:
        g = R.parse(text)
        assert str(R.parse(str(g))) == str(g) and R.parse(str(g)) == g
    assert repr(R.parse("x + 1")) == "<Polynomial x + 1 over GF(7)[x, y, z]>"
    assert repr(R) == "Space('GF(7)', 'x, y, z', order='grevlex')"


def test_arithmetic(R):
    x, y, z = R.variables
    assert (x + y) ** 2 == x**2 + 2 * x * y + y**2
    assert (x + 1) ** 7 == x**7 + 1  # Frobenius in characteristic 7
    assert x * 0 == 0 and not (x - x) and bool(x)
    assert 3 - x == -(x - 3)
    assert R.parse("x*y").degree() == 2 and R.polynomial(0).degree() == -1
    assert R.parse("x^2 + y").terms() == [((2, 0, 0), 1), ((0, 1, 0), 1)]
    assert R.from_terms([((1, 1, 0), 3), ((0, 0, 0), -1)]) == R.parse("3*x*y - 1")


def test_evaluate_and_substitute(R):
    f = R.parse("x^2*y - z + 1")
    assert f.evaluate([2, 3, 4]) == (4 * 3 - 4 + 1) % 7
    assert f.evaluate({"x": 2, "y": 3, "z": 4}) == (4 * 3 - 4 + 1) % 7
    assert f.substitute({"x": "y + 1", "z": 0}) == R.parse("(y+1)^2*y + 1")
    with pytest.raises(ValueError, match="no value for z"):
        f.evaluate({"x": 1, "y": 1})
    with pytest.raises(ValueError, match="unknown variable 'w'"):
        f.substitute({"w": 1})


def test_leading_monomials_in_each_order():
    # Cox, Little, O'Shea §2.2 (from memory): f = 4xy^2z + 4z^2 - 5x^3 + 7x^2z^2 has leading
    # monomial x^3 in lex, x^2z^2 in grlex and xy^2z in grevlex.
    R = fw.Space(101, "x, y, z")
    f = R.parse("4*x*y^2*z + 4*z^2 - 5*x^3 + 7*x^2*z^2")
    assert f.leading_monomial("lex") == R.parse("x^3")
    assert f.leading_monomial("grlex") == R.parse("x^2*z^2")
    assert f.leading_monomial("grevlex") == R.parse("x*y^2*z")
    block = fw.BlockOrder([("grevlex", ["z"]), ("grevlex", ["x", "y"])])
    assert f.leading_monomial(block) == R.parse("x^2*z^2")
    assert f.leading_monomial(fw.WeightOrder([1, 5, 1])) == R.parse("x*y^2*z")


@pytest.mark.parametrize(
    "text,column,message",
    [
        ("x + w", 5, "unknown variable 'w'"),
        ("(x + y", 7, "unbalanced parenthesis: missing ')'"),
        ("x + y)", 6, "unbalanced parenthesis: ')' without '('"),
        ("1/7*x", 2, "division by zero"),
        ("x +", 4, "unexpected end of input"),
        ("2x", 2, "expected an operator"),
        ("x^-1", 3, "expected a non-negative integer exponent"),
    ],
)
def test_parse_errors_say_what_and_where(R, text, column, message):
    with pytest.raises(fw.ParseError) as err:
        R.parse(text)
    assert str(err.value).startswith(f"line 1, column {column}: ") and message in str(err.value)
    assert (err.value.line, err.value.column) == (1, column) and message in err.value.message


def test_bad_rings_and_orders():
    with pytest.raises(ValueError, match="variable 'x' is given twice"):
        fw.Space(7, "x, x")
    with pytest.raises(ValueError, match="not an identifier"):
        fw.Space(7, ["x", "2y"])
    with pytest.raises(ValueError, match="unknown monomial order 'revlex'"):
        fw.Space(7, "x, y", order="revlex")
    with pytest.raises(ValueError, match="in no block"):
        fw.Space(7, "x, y", order=fw.BlockOrder([("lex", ["x"])]))
    with pytest.raises(ValueError, match="unknown variable 'q'"):
        fw.Space(7, "x, y", order=fw.BlockOrder([("lex", ["x", "q"])]))
    with pytest.raises(ValueError, match="2 weights for 3 variables"):
        fw.Space(7, "x, y, z", order=fw.WeightOrder([1, 2]))
    with pytest.raises(ValueError, match="different spaces"):
        fw.Space(7, "x, y").parse("x") + fw.Space(11, "x, y").parse("x")


# --- systems -----------------------------------------------------------------------------------


def test_textbook_bases():
    # Cox, Little, O'Shea §2.7 (from memory): (x^3 - 2xy, x^2y - 2y^2 + x) in grlex has the
    # reduced basis {x^2, xy, y^2 - x/2}.
    R = fw.Space(32003, "x, y", order="grlex")
    gb = R.system(["x^3 - 2*x*y", "x^2*y - 2*y^2 + x"]).basis()
    assert list(gb) == [R.parse("x^2"), R.parse("x*y"), R.parse("y^2 - 1/2*x")]
    assert gb.order == "grlex" and gb.stats.seconds >= 0 and gb.stats.max_degree >= 3
    # Same source, §3.1: lex basis {x - z, y - 2z^2, z^4 + z^2/2 - 1/4}.
    S = fw.Space(32003, "x, y, z", order="lex")
    gb = S.system(["x^2 + y^2 + z^2 - 1", "x^2 + z^2 - y", "x - z"]).basis()
    assert list(gb) == [S.parse("x - z"), S.parse("y - 2*z^2"), S.parse("z^4 + 1/2*z^2 - 1/4")]


def test_membership_equality_containment():
    # Twisted cubic (t, t^2, t^3): its ideal (y - x^2, z - x^3) contains the 2x2 minors
    # xz - y^2, y^3 - z^2 (Cox, Little, O'Shea §1.4, from memory).
    R = fw.Space(101, "x, y, z")
    I = R.system(["y - x^2", "z - x^3"])
    assert "x*z - y^2" in I and R.parse("y^3 - z^2") in I and "x" not in I
    J = R.system(["x*z - y^2", "y^3 - z^2"])
    assert I.ideal_contains(J) and not J.ideal_contains(I) and not I.same_ideal(J)
    assert I.same_ideal(R.system(["y - x^2", "z - x*y"]))
    assert R.system(str(I)) == I  # str() of a system reads back
    # grevlex basis {x^2 - y, xy - z, ...}: x^3 + y -> xy + y -> z + y.
    assert I.normal_form("x^3 + y") == R.parse("y + z")


def test_unit_and_zero_ideals():
    R = fw.Space(5, "x, y")
    assert list(R.system(["x*y - 1", "x"]).basis()) == [R.polynomial(1)]
    assert list(R.system(["0"]).basis()) == []
    assert "x + 3" in R.system(["1"])


def test_groebner_basis_in_another_order_and_cache():
    R = fw.Space(101, "x, y")
    I = R.system(["x^2 - y", "x*y - 1"])
    lex = I.basis("lex")
    assert lex.order == "lex" and list(lex) == [R.parse("x - y^2"), R.parse("y^3 - 1")]
    assert I.basis("lex") is lex


def test_resource_limit():
    R = fw.Space(32003, "x, y, z")
    I = R.system(["x^2*y + z", "x*y^2 + 1", "z^3 - x"])
    with pytest.raises(fw.ResourceLimit, match="degree limit 3"):
        I.basis(max_degree=3)


def test_ctrl_c_interrupts_a_long_computation():
    names, polys = cyclic(7)  # far beyond the reference engine's reach in a test's lifetime
    R = fw.Space(32003, names)
    timer = threading.Timer(0.3, lambda: os.kill(os.getpid(), signal.SIGINT))
    timer.start()
    try:
        with pytest.raises(KeyboardInterrupt):
            R.system(polys).basis(engine="buchberger")
    finally:
        timer.cancel()


def test_system_file_errors_name_file_line_and_column(tmp_path):
    from fibrewise.systemfile import SystemFileError

    path = tmp_path / "sys.txt"
    path.write_text("# demo\nfield: GF(7)\nvariables: x, y\n  x*y - 1\n  x + w\n")
    with pytest.raises(SystemFileError) as err:
        fw.System.read(str(path))
    assert str(err.value) == f"{path}:5:7: unknown variable 'w' (the variables are x, y)"
    path.write_text("field: GF(12)\nvariables: x\nx\n")
    with pytest.raises(SystemFileError, match=r":1:8: field spec 'GF\(12\)': 12 is not a prime"):
        fw.System.read(str(path))
    path.write_text("field: GF(7)\nvariable: x\nx\n")
    with pytest.raises(SystemFileError, match=r":2:1: unknown header 'variable:'"):
        fw.System.read(str(path))
    path.write_text("variables: x\nx\n")
    with pytest.raises(SystemFileError, match="missing header 'field:'"):
        fw.System.read(str(path))
