"""Solutions (System.points, System.closed_points, ClosedPoint, count_points over extensions,
`fibrewise solve`, the batch task `solutions`) against references outside the project:

- brute force: every point of GF(q)^n substituted into every equation, evaluated with galois's
  field arithmetic (not ours);
- galois (`Poly.roots`, `Poly.factors`) for univariate systems over GF(p^k), and sympy
  (`factor_list(..., modulus=p)`) over prime fields, word-size and multi-precision;
- planted keys in power-map ciphers of our own, re-encrypted with Python's modular arithmetic.
"""

import itertools
import json
import random

import numpy as np
import pytest
import sympy

import fibrewise as fw
from fibrewise.cli import main

# --- references -------------------------------------------------------------------------------


def random_system(k: fw.Field, names: str, equations: int, degree: int, terms: int, rng: random.Random):
    """Random equations with coefficients given as ints (integer representations for GF(p^k))."""
    V = fw.Space(k, names)
    n = len(V.names)
    polys = []
    for _ in range(equations):
        rows = []
        for _ in range(terms):
            exps = [0] * n
            for _ in range(rng.randint(0, degree)):
                exps[rng.randrange(n)] += 1
            rows.append((exps, rng.randrange(1, k.size)))
        polys.append(V.from_terms(rows))
    return V.system(polys)


def galois_values(polynomial, points, GF, coefficient=lambda c: c):
    """The values of ``polynomial`` at every row of ``points`` (a galois array, one point a
    row), computed in galois; ``coefficient`` maps a coefficient (an int of the polynomial's
    field) into ``GF``."""
    total = GF.Zeros(points.shape[0])
    for exps, c in polynomial.terms():
        value = coefficient(c)
        # an int times a galois array is repeated addition in galois: make it a field element
        term = GF.Ones(points.shape[0]) * (value if isinstance(value, GF) else GF(value))
        for i, e in enumerate(exps):
            term = term * points[:, i] ** e
        total = total + term
    return total


def brute_force(system, GF=None, coefficient=lambda c: c):
    """Every point of GF^n (GF: the system's field by default) where every equation vanishes,
    as sorted tuples of ints."""
    GF = GF or system.space.field.galois_field()
    n = len(system.space.names)
    grid = GF(np.array(list(itertools.product(range(GF.order), repeat=n)), dtype=np.int64).reshape(-1, n))
    keep = np.ones(grid.shape[0], dtype=bool)
    for g in system.equations:
        keep &= galois_values(g, grid, GF, coefficient) == 0
    return sorted(tuple(int(v) for v in row) for row in grid[keep])


# --- brute force over small fields ------------------------------------------------------------

SMALL_FIELDS = ["GF(2)", "GF(3)", "GF(5)", "GF(7)", "GF(4)", "GF(8)", "GF(9)"]


def on_galois_modulus(spec):
    """The field on galois's own default modulus (a Conway polynomial): galois builds its class
    for that modulus at once, while one for another modulus (GF(9) on a^2 + 1, our default) costs
    it many seconds of compilation. The solver does not depend on the modulus."""
    import galois

    return fw.field(galois.GF(fw.field(spec).size))


@pytest.mark.parametrize("spec", SMALL_FIELDS)
def test_points_are_all_points_of_brute_force(spec):
    k = on_galois_modulus(spec)
    rng = random.Random(f"points {spec}")
    dimensions = set()
    for names, equations in [("x, y", 2), ("x, y", 1), ("x, y, z", 3), ("x, y, z", 2)] * 2:
        S = random_system(k, names, equations, degree=3, terms=3, rng=rng)
        expected = brute_force(S)
        found = sorted(S.points())
        assert found == expected, f"{S!r}"
        assert S.count_points() == len(expected), f"{S!r}"
        dimensions.add(S.dimension())
        if expected:
            assert len(list(S.points(limit=1))) == 1
    assert {0, 1} <= dimensions  # both routes ran: one call, and fibre by fibre


def test_points_of_a_surface_come_fibre_by_fibre():
    # x*y - z^2 over GF(5): dimension 2, so 25 fibres over a finite projection; brute force
    # counts 25 points (also Gauss's count, from memory: q^2 for the quadric cone).
    V = fw.Space("GF(5)", "x, y, z")
    S = V.system(["x*y - z^2"])
    assert sorted(S.points()) == brute_force(S)
    assert len(brute_force(S)) == 25 == S.count_points()
    first = list(S.points(limit=7))
    assert len(first) == 7 and len(set(first)) == 7


def test_no_points_and_the_unit_ideal():
    V = fw.Space("GF(7)", "x, y")
    assert list(V.system(["x^2 + 1", "y"]).points()) == []  # -1 is no square mod 7 (7 = 3 mod 4)
    assert list(V.system(["x", "x - 1"]).points()) == []
    assert list(V.system(["x - 1", "y - 2"]).points(limit=0)) == []


# --- univariate systems: galois and sympy -----------------------------------------------------


def sympy_roots_and_degrees(coefficients, p):
    """The roots in GF(p) and the degrees of the distinct irreducible factors, by sympy's
    ``factor_list(..., modulus=p)``."""
    t = sympy.symbols("t")
    f = sum(int(c) * t**i for i, c in enumerate(coefficients))
    _, factors = sympy.factor_list(f, modulus=p)
    roots = []
    for g, _ in factors:
        if sympy.degree(g, t) == 1:
            a, b = sympy.Poly(g, t).all_coeffs()
            roots.append(int(-b * pow(int(a), -1, p)) % p)
    return sorted(roots), sorted(sympy.degree(g, t) for g, _ in factors)


def univariate(V, coefficients):
    return V.from_terms([((i,), c) for i, c in enumerate(coefficients) if c])


PRIME_FIELDS = [65521, 2**61 - 1, 2**127 - 1, 2**255 - 19, sympy.prevprime(2**512)]  # one of each prime kind


@pytest.mark.parametrize("p", PRIME_FIELDS)
def test_roots_and_closed_points_over_prime_fields_agree_with_sympy(p):
    rng = random.Random(p)
    V = fw.Space(p, "x")
    for degree in (5, 8):
        coefficients = [rng.randrange(p) for _ in range(degree)] + [1]
        # plant two roots so that rational points exist
        f = univariate(V, coefficients) * V.parse(f"(x - {rng.randrange(p)})*(x - 1)")
        coefficients = [0] * (f.degree() + 1)
        for (e,), c in f.terms():
            coefficients[e] = c
        S = V.system([f])
        roots, degrees = sympy_roots_and_degrees(coefficients, p)
        assert sorted(x for (x,) in S.points()) == roots
        assert sorted(P.degree for P in S.closed_points()) == degrees
        assert S.count_points() == len(roots)


@pytest.mark.parametrize("spec", ["GF(2^8)", "GF(7^3)"])
def test_roots_and_closed_points_over_extension_fields_agree_with_galois(spec):
    import galois

    k = on_galois_modulus(spec)
    GF = k.galois_field()
    rng = random.Random(spec)
    V = fw.Space(k, "x")
    for degree in (4, 7):
        coefficients = [rng.randrange(k.size) for _ in range(degree)] + [1]
        planted = rng.randrange(k.size)
        reference = galois.Poly(coefficients[::-1], field=GF) * galois.Poly([1, planted], field=GF)
        f = V.from_terms([((i,), int(c)) for i, c in enumerate(reference.coeffs[::-1]) if c])
        S = V.system([f])
        factors, _ = reference.factors()
        roots = sorted(int(-g.coeffs[1]) for g in factors if g.degree == 1)
        assert roots == sorted(int(r) for r in reference.roots())
        assert sorted(x for (x,) in S.points()) == roots
        assert sorted(P.degree for P in S.closed_points()) == sorted(g.degree for g in factors)


# (field, r, degrees of the closed points of x^(p^r) - x): x^(p^r) - x over GF(p) is the product
# of the monic irreducibles of degree dividing r, and one of degree d splits over GF(p^k) into
# gcd(d, k) factors of degree d / gcd(d, k) (Lidl and Niederreiter 1983, Theorems 3.20 and 3.46,
# from memory). One field of each representation: tables, bit-packed GF(2^k), coefficient vectors.
SUBFIELD_CASES = [
    ("GF(4)", 3, [1, 1, 3, 3]),
    ("GF(2^8)", 2, [1, 1, 1, 1]),
    ("GF(2^20)", 3, [1, 1, 3, 3]),
    ("GF(2^20)", 2, [1, 1, 1, 1]),
    ("GF(3^20)", 3, [1] * 3 + [3] * 8),
    ("GF(3^20)", 2, [1] * 9),
]


@pytest.mark.parametrize("spec, r, degrees", SUBFIELD_CASES)
def test_closed_points_of_x_to_the_p_to_the_r_minus_x_over_every_extension_kind(spec, r, degrees):
    k = fw.field(spec)
    V = fw.Space(k, "x")
    f = f"x^{k.characteristic**r} - x"
    S = V.system([f])
    assert sorted(P.degree for P in S.closed_points()) == degrees
    roots = list(S.points())
    assert len(roots) == degrees.count(1) == S.count_points()
    # one more root planted: x + c with c = 1 + 2a + 3a^2 + ... (coefficients mod p) has the
    # root -c, whose integer representation negates each digit
    p, digits = k.characteristic, [(i + 1) % k.characteristic for i in range(k.degree)]
    c = sum(d * p**i for i, d in enumerate(digits))
    minus_c = sum(((-d) % p) * p**i for i, d in enumerate(digits))
    planted = V.system([V.parse(f) * V.from_terms([((1,), 1), ((0,), c)])])
    found = list(planted.points())
    assert (minus_c,) in found and len(found) == len(roots) + ((minus_c,) not in roots)


# --- closed points ----------------------------------------------------------------------------


def test_closed_points_split_the_solutions_into_galois_orbits():
    # x^4 - 1 over GF(3) = (x - 1)(x + 1)(x^2 + 1) (sympy's factor_list agrees, checked below);
    # with y = x^2 the orbit {±i} has y = -1.
    V = fw.Space("GF(3)", "x, y")
    S = V.system(["x^4 - 1", "y - x^2"])
    closed = S.closed_points()
    assert [P.degree for P in closed] == [1, 1, 2] == sympy_roots_and_degrees([2, 0, 0, 0, 1], 3)[1]
    rational = sorted(P.rational_point() for P in closed if P.degree == 1)
    assert rational == sorted(S.points()) == [(1, 1), (2, 1)]
    (orbit,) = [P for P in closed if P.degree == 2]
    assert orbit.rational_point() is None
    assert orbit.residue_field == fw.field("GF(3^2)")
    lex = fw.Space("GF(3)", "x, y", order="lex")
    assert [str(g) for g in orbit.equations] == [str(g) for g in lex.system(["x^2 + 1", "y + 1"]).basis()]
    # Its points in k(P) = GF(9), checked in galois's GF(9): x^2 = -1 and y = x^2.
    GF9 = orbit.residue_field.galois_field()
    pts = orbit.points(as_galois=True)
    assert len(pts) == 2
    for p in pts:
        assert type(p) is GF9
        assert p[0] ** 2 == GF9(2) and p[1] == p[0] ** 2
    assert repr(orbit).startswith("<ClosedPoint of degree 2 over GF(3)")


def test_closed_points_need_a_zero_dimensional_system():
    with pytest.raises(ValueError, match="zero-dimensional"):
        fw.Space("GF(5)", "x, y").system(["x*y"]).closed_points()
    with pytest.raises(ValueError, match="zero-dimensional"):
        fw.Space("Q", "x, y").system(["x^2 - 2"]).closed_points()


# --- planted keys in power-map ciphers of our own ---------------------------------------------


def encrypt(p, key, plaintext, constants):
    """Rounds s -> (s + key + c)^3 mod p, Python's own modular arithmetic."""
    s = plaintext
    for c in constants:
        s = pow(s + key + c, 3, p)
    return s


@pytest.mark.parametrize("p, rounds", [(65519, 4), (2**61 - 1, 3), (2**255 - 19, 3)])
def test_the_planted_key_of_a_power_map_cipher_is_found(p, rounds):
    rng = random.Random(p)
    key, plaintext = rng.randrange(p), rng.randrange(p)
    constants = [rng.randrange(p) for _ in range(rounds)]
    ciphertext = encrypt(p, key, plaintext, constants)
    names = ["k"] + [f"s{i}" for i in range(1, rounds)]
    V = fw.Space(p, names)
    states = [str(plaintext)] + names[1:]
    equations = [f"{states[i + 1]} - ({states[i]} + k + {constants[i]})^3" for i in range(rounds - 1)]
    equations.append(f"{ciphertext} - ({states[-1]} + k + {constants[-1]})^3")
    found = list(V.system(equations).points())
    keys = [point[0] for point in found]
    assert key in keys
    for point in found:  # every key found encrypts the plaintext to the ciphertext
        assert encrypt(p, point[0], plaintext, constants) == ciphertext


# --- galois arrays and extension fields -------------------------------------------------------


def test_points_as_galois_arrays_equal_the_ints():
    k = fw.field("GF(2^4)")
    V = fw.Space(k, "x, y")
    S = V.system(["x^5 - 1", "y^3 - a^3*x"])
    as_ints = list(S.points())
    arrays = list(S.points(as_galois=True))
    # x^5 = 1 has gcd(5, 15) = 5 roots in GF(16), each a cube (the cubes form the subgroup of
    # order 5), and y^3 = a^3 x then has 3 solutions: 15 points (cyclic group facts).
    assert len(as_ints) == len(arrays) == 15
    GF = k.galois_field()
    for ints, array in zip(as_ints, arrays):
        assert type(array) is GF and list(array) == list(GF(list(ints)))
        a = GF(2)  # the generator, integer representation 2
        assert array[0] ** 5 == 1 and array[1] ** 3 == a**3 * array[0]
    prime = list(fw.Space("GF(11)", "x").system(["x^2 - 3"]).points(as_galois=True))
    assert sorted(int(p[0]) for p in prime) == [5, 6]  # 5^2 = 25 = 3 mod 11
    with pytest.raises(TypeError, match="as_galois must be a bool"):
        S.points(as_galois=1)


def embedding_images(base, target):
    """The roots in galois's ``target`` of the modulus of ``base``: the possible images of a."""
    import galois

    modulus = [int(c) for c in base.galois_field().irreducible_poly.coeffs]  # highest degree first
    return [int(r) for r in galois.Poly(modulus, field=target.galois_field()).roots()]


def embedded_brute_force(system, target):
    """Brute force over ``target`` ⊇ the system's field, for every embedding (a -> each root
    of the modulus in galois's ``target``): the point sets, one per embedding."""
    GFt = target.galois_field()
    base = system.space.field
    if base.degree == 1:
        return [brute_force(system, GFt, lambda c: GFt(c % base.characteristic))]
    p = base.characteristic
    sets = []
    for image in embedding_images(base, target):
        gamma = GFt(image)

        def coefficient(c, gamma=gamma):
            digits = [(c // p**i) % p for i in range(base.degree)]
            return sum((GFt(d) * gamma**i for i, d in enumerate(digits)), GFt(0))

        sets.append(brute_force(system, GFt, coefficient))
    return sets


@pytest.mark.parametrize(
    "base, over, equations",
    [
        ("GF(2)", "GF(2^4)", ["x^2 + x + 1", "y^3 + x*y + 1"]),
        ("GF(3)", "GF(3^2)", ["x^2 + 1 - y^2", "x*y - 1"]),
        ("GF(4)", "GF(2^4)", ["x^2 + a*x + 1", "y - x^3 - a"]),
        ("GF(9)", "GF(3^4)", ["x^2 - a", "y^2 - x*y - a^3"]),
        ("GF(4)", "GF(2^6)", ["x^3 + a", "x*y + a*y^2 + 1"]),
    ],
)
def test_points_over_an_extension_agree_with_brute_force_in_galois(base, over, equations):
    S = fw.Space(on_galois_modulus(base), "x, y").system(equations)
    target = on_galois_modulus(over)
    found = sorted(S.points(over=target))
    candidates = embedded_brute_force(S, target)
    assert found in candidates
    assert S.count_points(over=target) == len(found)


def test_counting_over_an_extension_uses_the_image_of_the_generator():
    # x = a over GF(27), counted over GF(3^6): one point, the image of a, a root of GF(27)'s
    # modulus in GF(729) (galois's arithmetic checks it); reading "a" again in GF(729) would
    # give its own generator, whose minimal polynomial has degree 6 (no root of a cubic).
    S = fw.Space("GF(27)", "x").system(["x - a", "x^27 - x"])
    assert S.count_points(over="GF(3^6)") == 1
    GF729 = on_galois_modulus("GF(3^6)")
    ((image,),) = list(S.points(over=GF729))
    assert image in embedding_images(fw.field("GF(27)"), GF729)
    own_generator = 3  # the integer representation of a in GF(3^6)
    assert own_generator not in embedding_images(fw.field("GF(27)"), GF729)
    # A curve over GF(9) counted over GF(3^4): brute force over GF(81) for the embedding.
    C = fw.Space(on_galois_modulus("GF(9)"), "x, y").system(["y^2 - x^3 - a*x"])
    GF81 = on_galois_modulus("GF(3^4)")
    assert C.count_points(over=GF81) in [len(s) for s in embedded_brute_force(C, GF81)]


def test_extensions_that_do_not_contain_the_field_are_refused():
    S = fw.Space("GF(9)", "x").system(["x - a"])
    with pytest.raises(ValueError, match="not a finite extension of"):
        S.count_points(over="GF(3^3)")
    with pytest.raises(ValueError, match="not a finite extension of"):
        list(S.points(over="GF(5^2)"))


def test_a_generator_name_in_a_prime_field_is_an_error(tmp_path):
    path = tmp_path / "s.txt"
    path.write_text("field: GF(7)\nvariables: x\nx - a\n")
    with pytest.raises(fw.ParseError) as e:
        fw.System.read(str(path))
    assert (e.value.line, e.value.column) == (3, 5)
    assert "GF(7) has no generator a" in str(e.value)


# --- lex bases by the change of order ---------------------------------------------------------


def test_a_lex_basis_of_a_zero_dimensional_system_comes_from_the_change_of_order():
    # Katsura-3 over GF(32003), zero-dimensional: its lex basis equals sympy's
    # (groebner(..., order="lex", modulus=32003)).
    names = "x0, x1, x2, x3"
    eqs = [
        "x0 + 2*x1 + 2*x2 + 2*x3 - 1",
        "x0^2 + 2*x1^2 + 2*x2^2 + 2*x3^2 - x0",
        "2*x0*x1 + 2*x1*x2 + 2*x2*x3 - x1",
        "x1^2 + 2*x0*x2 + 2*x1*x3 - x2",
    ]
    lex = fw.Space(32003, names, order="lex").system(eqs).basis()
    assert "FGLM" in lex.stats.choice
    symbols = sympy.symbols(names.replace(",", ""))
    reference = sympy.groebner(
        [sympy.sympify(e.replace("^", "**")) for e in eqs], *symbols, order="lex", modulus=32003
    )
    ours = [sympy.Poly(sympy.sympify(str(g).replace("^", "**")), *symbols, modulus=32003) for g in lex]
    assert [g.monic() for g in ours] == [
        sympy.Poly(g, *symbols, modulus=32003).monic() for g in reference.exprs
    ]


# --- command line and batch -------------------------------------------------------------------


def write(tmp_path, text, name="s.txt"):
    path = tmp_path / name
    path.write_text(text)
    return str(path)


def test_solve_prints_the_summary_then_one_line_per_point(tmp_path, capsys):
    path = write(tmp_path, "field: GF(7)\nvariables: x, y\nx^2 - 2\ny - x^3\n")
    assert main(["solve", path, "-q"]) == 0
    lines = capsys.readouterr().out.splitlines()
    assert lines[0] == f"{path}: 2 points over GF(7)"
    # 3^2 = 2 and 4^2 = 2 mod 7; y = x^3: 27 = 6, 64 = 1 (Python's arithmetic).
    assert sorted(lines[1:3]) == ["x = 3, y = 6", "x = 4, y = 1"]
    assert any("every point satisfies every equation" in line for line in lines)


def test_solve_json_limit_over_and_closed_points(tmp_path, capsys):
    path = write(tmp_path, "field: GF(4)\nvariables: x, y\nx^2 + x + a\ny^2 - x\n")
    assert main(["solve", path, "--json", "-q"]) == 0
    result = json.loads(capsys.readouterr().out)
    assert result["points"] == [] and result["truncated"] is False  # x^2 + x + a is irreducible over GF(4)
    assert main(["solve", path, "--json", "-q", "--over", "GF(2^4)"]) == 0
    over = json.loads(capsys.readouterr().out)
    assert len(over["points"]) == 2 and over["points_field"] == str(fw.field("GF(2^4)"))
    assert over["generator_image"]  # the image of a, in GF(16)'s generator
    assert main(["solve", path, "--json", "-q", "--over", "GF(2^4)", "--limit", "1"]) == 0
    cut = json.loads(capsys.readouterr().out)
    assert len(cut["points"]) == 1 and cut["truncated"] is True
    assert main(["solve", path, "-q", "--closed-points"]) == 0
    text = capsys.readouterr().out.splitlines()
    assert text[0] == f"{path}: 1 closed point over GF(2^2) (1 of degree 2)"
    assert text[1].startswith("degree 2: ")


def test_solve_points_in_the_generator_and_exit_statuses(tmp_path, capsys):
    path = write(tmp_path, "field: GF(9)\nvariables: x\nx^2 - a\n")
    assert main(["solve", path, "-q"]) == 0
    out = capsys.readouterr().out.splitlines()
    # a^2 = -1, so a^4 = 1: a lies in the subgroup of order 4 of GF(9)^*, the squares
    assert out[0] == f"{path}: 2 points over GF(3^2)"
    squares = fw.Space("GF(9)", "x").system(["x^2 - a"])
    for line in out[1 : 1 + len(list(squares.points()))]:
        value = line.split(" = ", 1)[1]
        assert str(fw.Space("GF(9)", "x").parse(f"({value})^2")) == "a"
    rational = write(tmp_path, "field: Q\nvariables: x, y\nx^2 - y\n", "q.txt")
    assert main(["solve", rational, "-q"]) == 2  # over Q: zero-dimensional systems only
    assert "dimension 1" in capsys.readouterr().err
    assert main(["solve", path, "-q", "--over", "GF(3^3)"]) == 2


def test_batch_task_solutions(tmp_path):
    from fibrewise.jobs import check_job, run_job

    job = check_job(
        {
            "id": 1,
            "field": "GF(5)",
            "variables": ["x", "y"],
            "polynomials": ["x*y - 1"],
            "tasks": ["solutions", "points"],
            "limit": 3,
        }
    )
    record = run_job(job)
    assert record["status"] == "ok"
    assert record["result"]["solutions"]["truncated"] is True  # xy = 1 has 4 points over GF(5)
    assert len(record["result"]["solutions"]["points"]) == 3 and record["result"]["points"] == 4
    for x, y in record["result"]["solutions"]["points"]:
        assert int(x) * int(y) % 5 == 1
    full = run_job(check_job({**job, "limit": 10}))
    assert full["result"]["solutions"]["truncated"] is False
    assert sorted(map(tuple, full["result"]["solutions"]["points"])) == [
        ("1", "1"),
        ("2", "3"),
        ("3", "2"),
        ("4", "4"),
    ]
    with pytest.raises(ValueError, match='"limit"'):
        check_job({**job, "limit": 0})
