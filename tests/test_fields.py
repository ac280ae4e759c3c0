"""Fields beyond word-size GF(p): GF(p^k), multi-precision primes and Q.

References: galois (PyPI) for finite-field arithmetic and for the first irreducible polynomial
(``galois.irreducible_poly(..., method="min")``); sympy (PyPI) for Gröbner bases over Q and
modulo a 255-bit prime; the Hermitian curve y^q + y = x^(q+1) over GF(q^2) has q^3 affine points
(Stichtenoth, Algebraic Function Fields and Codes, from memory).
"""

import random
from fractions import Fraction

import galois
import pytest
import sympy

import fibrewise as fw
from systems import random_poly

FIELD_SPECS = [
    "GF(4)",
    "GF(8)",
    "GF(9)",
    "GF(2^8)",
    "GF(3^5)",
    "GF(2^16)",
    "GF(2^32)",
    "GF(2^64)",
    "GF(3^11)",
]


def constant(R, code):
    return R.from_terms([((0,) * len(R.names), code)])


def value(poly):
    """The constant term's coefficient (0 for the zero polynomial)."""
    terms = poly.terms()
    return terms[0][1] if terms else 0


def both_moduli(spec):
    """Our default modulus, and galois's default (Conway) modulus for the same q."""
    ours = fw.field(spec)
    return [ours, fw.field(galois.GF(ours.size))]


@pytest.mark.parametrize("spec", FIELD_SPECS)
def test_arithmetic_matches_galois(spec, rng):
    for F in both_moduli(spec):
        GF = F.galois_field()
        R = fw.Space(F, "x")
        q = F.size
        for _ in range(60):
            a, b = rng.randrange(q), rng.randrange(q)
            A, B = constant(R, a), constant(R, b)
            ga, gb = GF(a), GF(b)
            assert value(A * B) == int(ga * gb), (F, a, b)
            assert value(A + B) == int(ga + gb), (F, a, b)
            assert value(A - B) == int(ga - gb), (F, a, b)
            assert value(A**7) == int(ga**7), (F, a)
            if a:
                assert value(R.parse(f"1/({A})")) == int(ga**-1), (F, a)
            # Evaluation of x^3 + a*x + b at a random point.
            f = R.parse("x^3") + A * R.parse("x") + B
            x0 = rng.randrange(q)
            assert f.evaluate([x0]) == int(GF(x0) ** 3 + ga * GF(x0) + gb), (F, a, b, x0)


@pytest.mark.parametrize("spec", FIELD_SPECS)
def test_default_modulus_is_the_first_irreducible(spec):
    F = fw.field(spec)
    p, k = F.characteristic, F.degree
    first = galois.irreducible_poly(p, k, method="min")
    ours = galois.Poly(F.galois_field().irreducible_poly.coeffs, field=galois.GF(p))
    assert ours == first
    assert first.is_irreducible()


def test_documented_examples():
    F = fw.field("GF(2^8)")
    assert F.modulus == "a^8 + a^4 + a^3 + a + 1"  # the AES modulus, FIPS-197 §4.2 (from memory)
    assert (F.characteristic, F.size, F.degree) == (2, 256, 8)
    G = fw.field(galois.GF(2**8))
    assert str(G) == "GF(2)[a]/(a^8 + a^4 + a^3 + a^2 + 1)"
    assert fw.field(str(G)) == G and G != F
    assert fw.field("GF(2^8)", modulus="a^8 + a^4 + a^3 + a^2 + 1") == G
    assert fw.field("GF(2^8)", modulus="a^8+a^4+a^3+a+1") == F
    assert str(fw.field("GF(9)")) == "GF(3^2)"
    assert fw.field(galois.GF(7)) == fw.field(7)
    assert fw.field("Q").size is None and fw.field("Q").characteristic == 0
    big = fw.field(2**255 - 19)
    assert big.size == 2**255 - 19 and str(big) == f"GF({2**255 - 19})"
    assert fw.field("GF(2^255-19)") == big and fw.field("GF(2^3 * 2^5)") == F


@pytest.mark.parametrize(
    "spec, modulus, message",
    [
        ("GF(12)", None, "12 is not a prime (it is divisible by 2) nor a prime power"),
        ("GF(6^2)", None, "6 is not a prime"),
        ("GF(2^8)", "a^8+1", "reducible over GF(2)"),
        ("GF(2^8)", "a^4+a+1", "degree 4, but the field needs degree 8"),
        ("GF(2)[a]/(a^8+1)", None, "reducible over GF(2)"),
        ("GF(7)", "a + 1", "a modulus and a generator name are given only for GF(p^k) with k >= 2"),
        ("ZZ", None, "unknown field spec 'ZZ'"),
        ("QQ", None, "unknown field spec 'QQ'"),
        (f"GF({2**255 - 21})", None, "is not a prime"),
        ("GF(2^8, modulus='a^8+a^4+a^3+a+1')", None, "unknown field spec"),
    ],
)
def test_bad_specs_raise_value_error_naming_the_problem(spec, modulus, message):
    with pytest.raises(ValueError, match=message.replace("(", r"\(").replace(")", r"\)").replace("^", r"\^")):
        fw.field(spec, modulus=modulus)


@pytest.mark.parametrize("spec", [7.0, None, b"GF(7)", True, [7]])
def test_field_specs_of_the_wrong_type_raise_type_error(spec):
    with pytest.raises(TypeError, match="a field spec is"):
        fw.field(spec)


def test_a_modulus_of_the_wrong_type_or_twice_is_refused():
    with pytest.raises(TypeError, match="modulus must be a str"):
        fw.field("GF(2^8)", modulus=0x11B)
    with pytest.raises(ValueError, match="already has its modulus"):
        fw.field(galois.GF(2**8), modulus="a^8+a^4+a^3+a+1")


def test_subfields():
    # GF(p^j) is a subfield of GF(p^k) exactly when j divides k (a handbook fact).
    assert fw.field("GF(2^8)").contains("GF(2^4)") and fw.field("GF(2^8)").contains(2)
    assert not fw.field("GF(2^8)").contains("GF(2^3)") and not fw.field("GF(3^2)").contains(2)
    assert fw.field("Q").contains("Q") and not fw.field("Q").contains(7) and not fw.field(7).contains("Q")


def test_galois_conversions_check_the_modulus():
    F = fw.field("GF(2^8)")
    arr = F.to_galois([0, 1, 2, 0x57])
    assert F.from_galois(arr) == [0, 1, 2, 0x57]
    assert F.from_galois(F.to_galois(0x83)) == 0x83
    other = galois.GF(2**8)  # Conway modulus: a different field representation
    with pytest.raises(ValueError):
        F.from_galois(other([1, 2]))
    R = fw.Space(F, "x")
    # galois elements of the same field are accepted as coefficients; of another modulus not.
    assert R.from_terms([((1,), F.to_galois(0x57))]).terms() == [((1,), 0x57)]
    with pytest.raises(ValueError, match="another modulus"):
        R.from_terms([((1,), other(3))])
    with pytest.raises(ValueError, match="integer representation"):
        R.from_terms([((1,), 256)])


def test_integers_in_text_are_integers():
    R = fw.Space("GF(9)", "x")
    assert (
        R.polynomial(3) == R.polynomial(0)
        and R.parse("3*x") == R.polynomial(0)
        and R.polynomial(4) == R.polynomial(1)
    )
    assert str(R.parse("a^2")) == "2"  # default modulus of GF(9) is a^2 + 1
    assert str(R.parse("a^3*x + 1")) == "2*a*x + 1"


@pytest.mark.parametrize("q", [2, 3, 4])
def test_hermitian_curve_point_counts(q):
    R = fw.Space(f"GF({q * q})", "x, y")
    f = R.parse(f"y^{q} + y - x^{q + 1}")
    n = q * q
    count = sum(1 for x in range(n) for y in range(n) if f.evaluate([x, y]) == 0)
    assert count == q**3


NAMES = ["x", "y", "z"]


def random_rational_poly(rng, nvars):
    terms = []
    for _ in range(rng.randint(2, 4)):
        exps = [0] * nvars
        for _ in range(rng.randint(0, 2)):
            exps[rng.randrange(nvars)] += 1
        mono = "*".join(f"{NAMES[i]}^{e}" for i, e in enumerate(exps) if e) or "1"
        c = Fraction(rng.choice([-1, 1]) * rng.randint(1, 9), rng.randint(1, 5))
        terms.append(f"({c})*{mono}")
    return " + ".join(terms)


def normalized(polys):
    """Each polynomial as a set of terms scaled so that the lex-largest term has coefficient 1."""
    out = set()
    for terms in polys:
        top = max(terms)[1]
        out.add(frozenset((e, c / top) for e, c in terms))
    return out


def sympy_terms(texts, nvars, order, **domain):
    gens = sympy.symbols(NAMES[:nvars])
    polys = [sympy.sympify(t.replace("^", "**")) for t in texts]
    gb = sympy.groebner(polys, *gens, order=order, **domain)
    result = []
    for g in gb.exprs:
        poly = sympy.Poly(g, *gens, **domain)
        result.append([(tuple(m), c) for m, c in poly.terms()])
    return result


@pytest.mark.parametrize("seed", range(40))
def test_rational_bases_match_sympy(seed):
    rng = random.Random(1000 + seed)
    nvars = 2 + seed % 2
    order = ["lex", "grlex", "grevlex"][seed % 3]
    texts = [random_rational_poly(rng, nvars) for _ in range(rng.randint(1, 3))]
    R = fw.Space("Q", NAMES[:nvars], order=order)
    ours = [[(e, Fraction(c)) for e, c in g.terms()] for g in R.system(texts).basis()]
    theirs = [
        [(e, Fraction(int(c.p), int(c.q))) for e, c in t]
        for t in sympy_terms(texts, nvars, order, domain="Q")
    ]
    assert normalized(ours) == normalized(theirs), texts


P255 = 2**255 - 19


@pytest.mark.parametrize("seed", range(12))
def test_bases_modulo_a_255_bit_prime_match_sympy(seed):
    rng = random.Random(2000 + seed)
    nvars = 2 + seed % 2
    order = ["lex", "grlex", "grevlex"][seed % 3]
    texts = [
        random_rational_poly(rng, nvars).replace("(", "").replace(")", "") for _ in range(rng.randint(1, 3))
    ]
    texts = [t.replace("/", "*") for t in texts]  # integer coefficients only: sympy's modulus domain
    R = fw.Space(P255, NAMES[:nvars], order=order)
    ours = [[(e, c % P255) for e, c in g.terms()] for g in R.system(texts).basis()]
    theirs = [[(e, int(c) % P255) for e, c in t] for t in sympy_terms(texts, nvars, order, modulus=P255)]
    as_sets = lambda polys: {frozenset(t) for t in polys}  # noqa: E731 (both reduced and monic)
    assert as_sets(ours) == as_sets(theirs), texts


def test_rational_coefficients_are_fractions():
    R = fw.Space("Q", "x, y")
    f = R.parse("3/4*x - 2*y + 1/3")
    assert f.terms() == [((1, 0), Fraction(3, 4)), ((0, 1), Fraction(-2)), ((0, 0), Fraction(1, 3))]
    assert f.evaluate([Fraction(4, 3), 1]) == Fraction(1, 3) - 1
    assert R.from_terms(f.terms()) == f
    with pytest.raises(TypeError, match="Fraction"):
        f.evaluate([0.5, 1])


@pytest.mark.parametrize("seed", range(24))
def test_extension_bases_of_prime_field_systems_match_sympy(seed):
    # A reduced Gröbner basis does not depend on the field extension: for generators with
    # coefficients in GF(p), the basis over GF(p^k) is the one over GF(p) (Buchberger's algorithm
    # never leaves the coefficient field). sympy computes the latter with modulus=p.
    rng = random.Random(3000 + seed)
    spec, p = [("GF(2^8)", 2), ("GF(9)", 3), ("GF(3^5)", 3), ("GF(2^16)", 2), ("GF(5^9)", 5)][seed % 5]
    nvars = 2 + seed % 2
    order = ["lex", "grlex", "grevlex"][seed % 3]
    texts = [random_poly(rng, NAMES[:nvars], p) for _ in range(rng.randint(1, 3))]
    R = fw.Space(spec, NAMES[:nvars], order=order)
    # Integer representations of GF(p) elements are the residues themselves.
    ours = {frozenset(g.terms()) for g in R.system(texts).basis()}
    theirs = {frozenset((e, int(c) % p) for e, c in t) for t in sympy_terms(texts, nvars, order, modulus=p)}
    assert ours == theirs, (spec, texts)


def test_galois_conversions_of_prime_fields_and_qq():
    F = fw.field(7)
    assert F.modulus is None
    assert F.from_galois(F.to_galois([8, -1, 3])) == [1, 6, 3]
    assert fw.field(galois.GF(7)).galois_field() is galois.GF(7)
    big = fw.field(P255)
    assert big.from_galois(big.to_galois([P255 + 5])) == [5]
    with pytest.raises(ValueError, match="Q has no galois counterpart"):
        fw.field("Q").galois_field()
    # A galois class for GF(p^k) with its own modulus keeps it, and reads back from str().
    G = galois.GF(3**5, irreducible_poly="x^5 + 2x + 1")
    F = fw.field(G)
    assert F.modulus == "a^5 + 2*a + 1" and fw.field(str(F)) == F
    assert F.from_galois(G([1, 2, 242])) == [1, 2, 242]
