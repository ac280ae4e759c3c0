"""Fuzzing that stays: the parser, system files, batch input and result files, and certificates.

No input may produce anything but a result, a ValueError / TypeError / ResourceLimit (here), or an
exit status 1 or 2 (on the command line). The normal suite runs small versions (a few seconds
each); ``make fuzz`` runs them long (``FIBREWISE_FUZZ=1``: many more examples, twenty systems for
the certificate tampering), in rounds until ``FIBREWISE_FUZZ_SECONDS`` have passed, round n with
hypothesis seed n and projection seed n (``FIBREWISE_FUZZ_ROUND``).

References: polynomial expressions expanded by sympy (reduced mod p) must equal what the parser
reads; every single-field change of a certificate must be rejected by the check, which
recomputes every claim from the ideal (tests/tampering.py lists the changes).
"""

from __future__ import annotations

import json
import os

import pytest
import sympy
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import fibrewise as fw
from fibrewise.batch import BatchInputError, read_jobs, read_results
from fibrewise.jobs import run_job
from fibrewise.normalization import check_certificate
from fibrewise.systemfile import SystemFileError, parse_system_text
from tampering import changes

LONG = bool(os.environ.get("FIBREWISE_FUZZ"))
#: The round of a long run: the seed of the projections whose certificates are tampered with.
ROUND = int(os.environ.get("FIBREWISE_FUZZ_ROUND", "1"))
EXAMPLES = 3000 if LONG else 40
FUZZ = settings(max_examples=EXAMPLES, deadline=None, suppress_health_check=list(HealthCheck))
#: What bad input may raise (ParseError and SystemFileError are ValueErrors).
EXPECTED = (ValueError, TypeError, fw.ResourceLimit)

P = 101
SPACE = fw.Space(f"GF({P})", "x, y, z", memory="64MB")
GF9 = fw.Space("GF(9)", "x, y", memory="64MB")


# The parser -------------------------------------------------------------------------------------

TOKENS = [
    "x",
    "y",
    "z",
    "a",
    "w",
    "0",
    "1",
    "7",
    "100",
    "4294967295",
    "99999999999999999999",
    "+",
    "-",
    "*",
    "/",
    "^",
    "**",
    "(",
    ")",
    " ",
    "\n",
    "\t",
    ".",
    ",",
    "=",
    "é",
    "\x00",
    "^-1",
    "^2",
    "^40",
    "2/3",
    "x1",
]


@FUZZ
@given(st.lists(st.sampled_from(TOKENS), max_size=30))
def test_the_parser_reads_or_refuses_any_text(tokens):
    text = "".join(tokens)
    for space in (SPACE, GF9):
        try:
            f = space.parse(text)
        except EXPECTED:
            continue
        assert space.parse(str(f)) == f  # what it prints reads back


def expression(depth: int = 3):
    """Polynomial expressions in x, y, z with small exponents, as (text, sympy expression)."""
    x, y, z = sympy.symbols("x y z")
    leaf = st.one_of(
        st.sampled_from([("x", x), ("y", y), ("z", z)]),
        st.integers(0, 300).map(lambda n: (str(n), sympy.Integer(n))),
    )
    if depth == 0:
        return leaf

    def combine(args):
        (a, ea), op, (b, eb), k = args
        if op == "+":
            return f"({a}) + ({b})", ea + eb
        if op == "-":
            return f"({a}) - ({b})", ea - eb
        if op == "*":
            return f"({a})*({b})", ea * eb
        if op == "/":
            return f"({a})/{k}", ea * sympy.Rational(1, k)
        return f"({a})^{k % 4}", ea ** (k % 4)

    sub = expression(depth - 1)
    return st.one_of(leaf, st.tuples(sub, st.sampled_from("+-*/^"), sub, st.integers(1, P - 1)).map(combine))


@FUZZ
@given(expression())
def test_the_parser_agrees_with_sympy(pair):
    text, expr = pair
    gens = sympy.symbols("x y z")
    ours = sympy.Poly(SPACE.parse(text).to_sympy(), *gens, modulus=P)
    theirs = sympy.Poly(sympy.expand(expr), *gens, domain="QQ")  # sympy's name for the rationals
    # sympy reduces a rational coefficient a/b mod p as a * b^-1
    reduced = {m: int(c.p * pow(int(c.q), -1, P)) % P for m, c in theirs.terms()}
    assert {m: int(c) % P for m, c in ours.terms() if int(c) % P} == {m: c for m, c in reduced.items() if c}


# System files -------------------------------------------------------------------------------------

LINES = [
    "field: GF(7)",
    "field: GF(9)",
    "field: Q",
    "field: GF(10)",
    "field: GF(2^8)",
    "field:",
    "variables: x, y",
    "variables: x0..x3",
    "variables: x, x",
    "variables: 1x",
    "order: lex",
    "order: sideways",
    "x*y - 1",
    "x^2 + a",
    "x0*x3 - 1",
    "(x + y)^3",
    "x^4294967295",
    "(x + y + 1)^3000",
    "# a comment",
    "",
    "x ++ y",
    "unknown: 3",
    "x: y",
    "\ufeffx",
    "x*y - 1  # and a comment",
    "  y - 2",
]


@FUZZ
@given(st.lists(st.sampled_from(LINES), max_size=8))
def test_a_system_file_reads_or_is_one_clear_error(lines):
    try:
        system = parse_system_text(lines, "fuzz.txt", memory="64MB")
    except SystemFileError as e:
        assert e.path == "fuzz.txt" and e.line >= 1 and e.column >= 1
        return
    except EXPECTED:
        return
    assert system.space.names


@FUZZ
@given(st.binary(max_size=200))
def test_system_file_bytes_read_or_are_one_clear_error(tmp_path_factory, data):
    path = tmp_path_factory.mktemp("files") / "system.txt"
    path.write_bytes(b"field: GF(7)\nvariables: x, y\n" + data)
    try:
        fw.System.read(str(path), memory="64MB")
    except SystemFileError as e:
        assert e.path == str(path)
    except EXPECTED:
        pass


# Batch input and result files --------------------------------------------------------------------

json_values = st.recursive(
    st.none() | st.booleans() | st.integers(-3, 10**20) | st.floats(allow_nan=False) | st.text(max_size=8),
    lambda inner: st.lists(inner, max_size=3) | st.dictionaries(st.text(max_size=5), inner, max_size=3),
    max_leaves=6,
)
job_like = st.fixed_dictionaries(
    {"id": st.one_of(st.integers(), st.text(max_size=3))},
    optional={
        "field": st.sampled_from(["GF(7)", "GF(9)", "Q", "GF(4)", 7, "GF(0)", "nope"]) | json_values,
        "variables": st.sampled_from([["x", "y"], "x, y", "x0..x2", [], ["x", "x"], "x0..x9999999"])
        | json_values,
        "polynomials": st.lists(
            st.sampled_from(["x*y - 1", "x^2 - y", "x +", "a*x", "(x+y)^200", "t"]), max_size=3
        )
        | json_values,
        "tasks": st.lists(
            st.sampled_from(
                [
                    "dimension",
                    "degree",
                    "hilbert",
                    "basis",
                    "projection",
                    "normalize",
                    "points",
                    "independent_variables",
                    "nothing",
                ]
            ),
            max_size=3,
        )
        | json_values,
        "order": st.sampled_from(["lex", "grevlex", "sideways"]) | json_values,
        "extra": json_values,
    },
)
batch_lines = st.one_of(job_like.map(json.dumps), json_values.map(json.dumps), st.text(max_size=30))


@FUZZ
@given(st.lists(batch_lines, max_size=5))
def test_batch_input_is_read_or_refused_and_every_job_gets_a_record(tmp_path_factory, lines):
    path = tmp_path_factory.mktemp("batch") / "in.jsonl"
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    try:
        jobs = read_jobs(str(path))
    except BatchInputError as e:
        assert str(e).startswith(str(path))
        return
    for job in jobs:
        record = run_job(job, memory=64 * 10**6)
        assert record["status"] in ("ok", "error") and record["id"] == job["id"]
        json.dumps(record)  # a result line is JSON


GOOD = b'{"id":"a","status":"ok","result":{},"seconds":0.1}\n'


@FUZZ
@given(st.binary(max_size=60) | st.sampled_from([b'{"id":"b","sta', b"\0\0", b'{"x":1}\n', b"notes\n", GOOD]))
def test_a_result_file_is_resumed_or_left_untouched(tmp_path_factory, tail):
    path = tmp_path_factory.mktemp("results") / "out.jsonl"
    path.write_bytes(GOOD + tail)
    try:
        found = read_results(str(path))
    except BatchInputError as e:
        assert str(e).startswith(f"{path}:")
        assert path.read_bytes() == GOOD + tail  # untouched
        return
    after = path.read_bytes()
    assert (GOOD + tail).startswith(after)  # at most a torn tail was cut
    assert found and all(line in after for _, line in found)


# Certificates ------------------------------------------------------------------------------------

SYSTEMS = [
    ("GF(7)", "x, y", ["x*y - 1"], "auto"),
    ("GF(101)", "x, y, z", ["x^2 - y*z + 1", "y^3 - x*z - 2"], "auto"),
    ("GF(101)", "x, y, z", ["x*y - z^2"], "auto"),  # homogeneous
    ("GF(7)", "x, y", ["x*y - 1"], "nonlinear"),
    ("GF(9)", "x, y", ["x^2 + a*y", "y^3 - x"], "auto"),
    ("Q", "x, y", ["x^2 - 2", "y^2 - 3"], "auto"),
    ("GF(2)", "x, y, z", ["x*y + z", "z^2 + x"], "auto"),
    ("GF(101)", "x, y", ["x*y - 1"], "linear"),
    ("GF(5)", "x, y", ["x^3 - y^2"], "auto"),
    ("GF(13)", "x, y, z", ["x*y*z - 1"], "auto"),
    ("Q", "x, y, z", ["x*y - z", "y*z - x"], "auto"),
    ("GF(2)", "x, y", ["x^2 + x", "y^2 + y"], "auto"),
    ("GF(7)", "x, y", ["(x - y)^2", "x*y"], "auto"),
    ("GF(11)", "x, y, z", ["x^2 - y^3", "z^2 - x*y"], "auto"),
    ("GF(101)", "x, y, z", ["x + y + z"], "auto"),
    ("GF(7)", "x, y", ["x^2*y - y"], "auto"),
    ("GF(65521)", "x, y", ["y^2 - x^3 - x - 1"], "auto"),
    ("GF(3)", "x, y", ["x^3 - x", "y^2 - x"], "auto"),
    ("GF(2)", "x, y, z", ["(x^2 - x)*(y^2 - y)*z + x*y - z^2"], "auto"),
    (
        "GF(32003)",
        "x, y, z",
        ["x + 2*y + 2*z - 1", "x^2 + 2*y^2 + 2*z^2 - x", "2*x*y + 2*y*z - y"],
        "auto",
    ),  # katsura-2
]
QUICK = [0, 1, 2, 3, 4]


@pytest.mark.parametrize("index", range(len(SYSTEMS)) if LONG else QUICK)
def test_every_single_field_change_of_a_certificate_is_rejected(index):
    spec, names, equations, strategy = SYSTEMS[index]
    system = fw.Space(spec, names).system(equations)
    cert = system.projection(strategy=strategy, seed=ROUND).to_dict()
    assert check_certificate(cert, system) == []  # the genuine one holds
    accepted = []
    for description, changed in changes(cert):
        try:
            problems = check_certificate(changed, system)
        except EXPECTED as e:  # an unreadable entry may also be reported by raising
            problems = [str(e)]
        if not problems and not still_true(description, changed, system):
            accepted.append(description)
    assert accepted == [], f"{spec} {equations}: accepted {accepted}"


def still_true(description: str, changed: dict, system) -> bool:
    """Whether a changed equation coefficient left a true claim: any monic polynomial of the
    same degree in the ideal is a valid equation (x^4 + x^3 when x^3 is in the ideal), so the
    change is checked here by membership (a normal form modulo the basis), independently."""
    if not description.startswith("equations["):
        return False
    i = int(description.split("[")[1].split("]")[0])
    variable = system.space.names[i]
    projection = fw.FiniteProjection.from_dict(changed, system)
    return projection.equation(variable) in system
