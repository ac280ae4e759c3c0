"""Nothing aborts, everything stops: memory budgets, Ctrl-C in long native calls, errors of the
right kind naming the argument, and the command line's smaller promises.

Check values: (x + y + z + 1)^n has C(n + 3, 3) terms (a count of monomials of degree <= n in
three variables, textbook); the seven-round power map x -> (x + k + c)^3 has degree 3^7 = 2187
(Bézout's bound, attained by a triangular system); GF(9) = GF(3)[w]/(w^2 + 1) since -1 is not a
square mod 3 (textbook); the points of y^2 z = x^3 + 3 x z^2 + 2 z^3 over GF(7) are counted by
brute force in tests/test_cli.py.
"""

from __future__ import annotations

import json
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest

import fibrewise as fw

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples"


def fibrewise(*args: str, timeout: float = 300, cwd: Path | None = None) -> subprocess.CompletedProcess:
    return subprocess.run(
        [sys.executable, "-m", "fibrewise.cli", *map(str, args)],
        capture_output=True,
        text=True,
        timeout=timeout,
        cwd=cwd,
    )


def write(tmp_path: Path, name: str, text: str) -> Path:
    path = tmp_path / name
    path.write_text(textwrap.dedent(text).lstrip(), encoding="utf-8")
    return path


# Memory budgets ------------------------------------------------------------------------------------


@pytest.mark.parametrize(
    "text, size",
    [("4GB", 4 * 10**9), ("512MiB", 512 << 20), ("1.5 gib", 3 << 29), ("1000", 1000), (123456, 123456)],
)
def test_memory_sizes_read_as_documented(text, size):
    assert fw.Space("GF(7)", "x", memory=text).memory == size


@pytest.mark.parametrize(
    "value, kind",
    [
        ("4 parsecs", ValueError),
        ("-1GB", ValueError),
        (0, ValueError),
        (1.5, TypeError),
        (True, TypeError),
        ("200%", ValueError),
    ],
)
def test_bad_memory_sizes_are_errors_naming_the_argument(value, kind):
    with pytest.raises(kind, match="memory"):
        fw.Space("GF(7)", "x", memory=value)


def test_a_power_over_the_budget_is_a_resource_limit_naming_what_was_built():
    V = fw.Space("GF(7)", "x, y, z", memory="10MB")
    x, y, z = V.variables
    with pytest.raises(
        fw.ResourceLimit, match="memory budget of .* exceeded: a polynomial of 4 terms to the power 3000"
    ):
        (x + y + z + 1) ** 3000
    with pytest.raises(fw.ResourceLimit, match="memory budget"):
        V.parse("(x + y + z + 1)^3000")
    # C(3 + 3, 3) = 20 terms: well inside the budget, as is everything ordinary
    assert len(((x + y + z + 1) ** 3).terms()) == 20


def test_the_budget_follows_the_space_into_bases_and_projections():
    import random

    rng = random.Random(3)
    names = [f"x{i}" for i in range(7)]
    monomials = [f"{a}*{b}" for i, a in enumerate(names) for b in names[i:]] + names + ["1"]
    dense = [" + ".join(f"{rng.randrange(1, 32003)}*{m}" for m in monomials) for _ in range(7)]
    # Seven dense quadrics in seven unknowns: 2^7 solutions (Bézout); the largest F4 matrix has
    # tens of thousands of entries, far over a budget of 100 kB and well within the default.
    V = fw.Space("GF(32003)", names, memory="100kB")
    with pytest.raises(fw.ResourceLimit, match="memory budget of 97.7 KiB exceeded: the matrix of F4 step"):
        V.system(dense).basis()
    assert V.with_order("lex").memory == V.memory == 10**5
    assert fw.Space("GF(32003)", names).system(dense).quotient_dimension() == 2**7


def test_huge_exponents_raise_instead_of_aborting():
    V = fw.Space("GF(7)", "x, y, z")
    x, y, z = V.variables
    with pytest.raises(ValueError, match="degree above 2\\^32 - 1"):
        (x + y + 1) ** 2**32
    with pytest.raises(ValueError, match="below 2\\^64"):
        (x + y) ** 2**64
    # The univariate x^(2^32 - 1) - 1 itself is two terms, and fine.
    assert len(V.parse("x^4294967295 - 1").terms()) == 2


def test_a_system_file_with_a_huge_power_is_a_resource_limit_naming_the_line(tmp_path):
    path = write(
        tmp_path,
        "power.txt",
        """
        field: GF(7)
        variables: x, y, z
        x*y - 1
        (x + y + z + 1)^3000
        """,
    )
    done = fibrewise("basis", path, "--memory", "100MB")
    assert done.returncode == 1, done.stderr
    assert f"{path}:4: memory budget of 95.4 MiB exceeded" in done.stderr


def test_an_integral_equation_of_a_huge_power_raises(tmp_path):
    V = fw.Space("GF(7)", "x, y", memory="200MB")
    S = V.system(["x*y - 1"])
    with pytest.raises((fw.ResourceLimit, ValueError)):
        S.integral_equation("x^4294967295", over=["y"])


# Ctrl-C in long native calls -------------------------------------------------------------------------

LONG_CALLS = {
    "parse": "V.parse('(x0 + x1 + x2 + x3 + x4 + x5 + 1)^40')",
    "power": "(sum(x[1:], x[0]) + 1) ** 40",
    "substitute": "(x[0] ** 64).substitute({'x0': sum(x[2:], x[1]) + 1})",
    "normal form": "B.normal_form(x[0] ** 16777216)",
    "membership": "x[0] ** 16777216 in S",
    # The default modulus of GF(2^20000): a search over thousands of candidates, each tested by
    # 20000 squarings modulo it.
    "field construction": "fw.field('GF(2^20000)')",
}

# Every call above runs for many seconds (a power with 9.3 million terms, a normal form of
# x0^(2^24) in a quotient of dimension 64); the setup is instant.
SETUP = """
import fibrewise as fw, sys
V = fw.Space("GF(32003)", "x0..x5")
x = V.variables
S = V.system(["x0^2 - x1", "x1^2 - x2", "x2^2 - x3", "x3^2 - x4", "x4^2 - x5", "x5^2 - x0 - 1"])
B = S.basis()
print("ready", flush=True)
try:
    CALL
except KeyboardInterrupt:
    print("interrupted", flush=True)
    sys.exit(0)
print("finished", flush=True)
"""


@pytest.mark.skipif(sys.platform == "win32", reason="SIGINT")
@pytest.mark.parametrize("name", list(LONG_CALLS))
def test_ctrl_c_stops_a_long_native_call(name):
    code = SETUP.replace("CALL", LONG_CALLS[name])
    proc = subprocess.Popen(
        [sys.executable, "-c", code], stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True
    )
    try:
        assert proc.stdout.readline().strip() == "ready", proc.stderr.read()
        time.sleep(0.5)  # inside the call now
        sent = time.monotonic()
        proc.send_signal(signal.SIGINT)
        out, err = proc.communicate(timeout=60)  # generous: the target is 0.5 s
        print(f"{name}: stopped {time.monotonic() - sent:.3f} s after SIGINT")
    finally:
        if proc.poll() is None:
            proc.kill()
    assert out.strip() == "interrupted", (out, err)


# Errors of the right kind ------------------------------------------------------------------------

V7 = fw.Space("GF(7)", "x, y, z")
S7 = V7.system(["x*y - 1"])


@pytest.mark.parametrize(
    "call, kind, name",
    [
        (lambda: S7.basis(max_degree=-1), ValueError, "max_degree"),
        (lambda: S7.basis(max_degree=2**40), ValueError, "max_degree"),
        (lambda: S7.basis(threads=-1), ValueError, "threads"),
        (lambda: S7.basis(max_matrix=2**70), ValueError, "max_matrix"),
        (lambda: S7.basis(max_degree="3"), TypeError, "max_degree"),
        (lambda: V7.from_terms([((-1, 0, 0), 1)]), ValueError, "exponent"),
        (lambda: V7.from_terms([((2**40, 0, 0), 1)]), ValueError, "exponent"),
        (lambda: V7.variables[0] ** 2**64, ValueError, "exponent"),
        (lambda: V7.variables[0] ** -1, ValueError, "exponent"),
        (lambda: S7.ideal_contains(None), TypeError, "System"),
        (lambda: S7.same_ideal(None), TypeError, "System"),
        (lambda: fw.System(None, ["x"]), TypeError, "Space"),
        (lambda: fw.System(V7, None), TypeError, "equations"),
        (lambda: fw.WeightOrder([1.5, 1, 1]), TypeError, "weights"),
        (lambda: fw.Space("GF(7)", [None]), TypeError, "variable names"),
        (lambda: fw.Space("GF(7)", ["x", 3]), TypeError, "variable names"),
        (lambda: S7.projection(seed=-1), ValueError, "seed"),
        (lambda: S7.projection(equations="later"), ValueError, "equations"),
        (lambda: S7.projection(equations=1), TypeError, "equations"),
        (lambda: S7.count_points(projective="yes"), TypeError, "projective"),
        (lambda: S7.is_finite_over(None), TypeError, "over"),
        (lambda: S7.integral_equation("x", over=3), TypeError, "over"),
        (lambda: fw.field("GF(9)", generator=3), TypeError, "generator"),
        (lambda: fw.field("GF(9)", generator="2b"), ValueError, "generator"),
    ],
)
def test_odd_arguments_get_the_right_error_naming_the_argument(call, kind, name):
    with pytest.raises(kind, match=name):
        call()


# Lazy projections (issue 21) ---------------------------------------------------------------------


def test_lazy_equations_equal_the_eager_ones_and_lie_in_the_ideal():
    V = fw.Space("GF(101)", "x, y, z")
    S = V.system(["x^2 - y*z + 1", "y^3 - x*z - 2"])
    lazy = S.projection()
    assert not lazy.has_equations
    summary = lazy.summary()
    assert (
        "equations" not in summary and summary["rank"] == lazy.rank and summary["dimension"] == 1
    )  # 2 equations in 3-space
    eager = S.projection(equations="now")
    assert eager.has_equations
    assert lazy.equations == eager.equations  # computed here, on first use
    assert lazy.to_dict() == eager.to_dict()
    for name in V.names:  # each monic equation lies in the ideal: its normal form is 0
        assert lazy.equation(name) in S
    assert lazy.verify()


def test_batch_task_projection_is_the_summary_and_normalize_keeps_the_certificate(tmp_path):
    from fibrewise.cli import main

    job = {
        "id": 1,
        "field": "GF(101)",
        "variables": ["x", "y", "z"],
        "polynomials": ["x^2 - y*z + 1", "y^3 - x*z - 2"],
        "tasks": ["projection", "normalize"],
    }
    source, out = tmp_path / "in.jsonl", tmp_path / "out.jsonl"
    source.write_text(json.dumps(job) + "\n")
    assert main(["batch", str(source), "-o", str(out), "--quiet"]) == 0
    result = json.loads(out.read_text())["result"]
    assert "equations" not in result["projection"] and result["normalize"]["equations"]
    assert {k: v for k, v in result["normalize"].items() if k != "equations"} == result["projection"]


def test_engine_auto_is_the_default_and_the_stats_say_what_it_chose():
    import inspect
    from typing import get_args

    assert get_args(fw.Engine)[0] == "auto"
    assert inspect.signature(fw.System.basis).parameters["engine"].default == "auto"
    gb = fw.Space("GF(7)", "x, y").system(["x*y - 1", "x^2 - y"]).basis()
    assert gb.stats.engine == "auto" and gb.stats.choice  # what auto chose, and why
    assert gb.stats.to_dict()["choice"] == gb.stats.choice
    assert fw.Space("GF(7)", "x, y").system(["x*y - 1"]).basis(engine="f4").stats.choice == ""


# The generator's name (issue 15) ------------------------------------------------------------------


def test_the_generator_of_gf_p_k_can_have_another_name():
    F = fw.field("GF(9)", generator="w")
    assert F.generator == "w" and F.modulus == "w^2 + 1"  # the default modulus of GF(9)
    assert str(F) == "GF(3)[w]/(w^2 + 1)" and fw.field(str(F)) == F
    assert F != fw.field("GF(9)")
    V = fw.Space(F, "x, a")  # "a" is free for a variable now
    f = V.parse("w*x + a")
    assert str(f) == "w*x + a"
    assert str(V.parse("w^2")) == "2"  # w^2 = -1 = 2 in GF(3)
    G = fw.field("GF(8)", modulus="z^3 + z + 1", generator="z")
    assert str(G) == "GF(2)[z]/(z^3 + z + 1)" and G.size == 8
    with pytest.raises(ValueError, match="generator"):
        fw.field("GF(7)", generator="w")
    with pytest.raises(ValueError, match="unknown variable 'a'"):
        fw.Space(F, "x").parse("a*x")


# The command line ------------------------------------------------------------------------------


def test_check_accepts_the_normalize_json_output_as_it_is(tmp_path):
    system = EXAMPLES / "curve_code_gf7.txt"
    done = fibrewise("normalize", system, "--json")
    assert done.returncode == 0, done.stderr
    saved = tmp_path / "normalize.json"
    saved.write_text(done.stdout)
    checked = fibrewise("check", saved, system, "--json")
    assert checked.returncode == 0, checked.stderr
    assert json.loads(checked.stdout)["valid"] is True


def test_plot_without_matplotlib_says_how_to_install_it(tmp_path):
    code = (
        "import sys; sys.modules['matplotlib'] = None; from fibrewise.cli import main; "
        f"sys.exit(main(['analyze', {str(EXAMPLES / 'curve_code_gf7.txt')!r}, '--plot', 'x.png']))"
    )
    done = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, timeout=120, cwd=tmp_path
    )
    assert done.returncode == 2
    assert "pip install matplotlib" in done.stderr and "Traceback" not in done.stderr


def test_every_help_example_runs(tmp_path):
    from fibrewise.cli import SUBCOMMANDS

    for name, command in SUBCOMMANDS.items():
        example = command.example
        if name in ("check", "batch", "analyze"):  # need files made by another step, or a plot
            continue
        words = example.removeprefix("example: fibrewise ").split()
        done = fibrewise(*[str(ROOT / w) if w.startswith("examples/") else w for w in words], cwd=tmp_path)
        assert done.returncode == 0, (example, done.stderr)


def test_one_element_is_singular():
    with pytest.raises(ValueError) as e:
        fw.field("GF(1)")
    assert "1 element" in str(e.value) and "1 elements" not in str(e.value)


def test_a_variable_named_k_does_not_read_as_the_field(tmp_path):
    path = write(
        tmp_path,
        "k.txt",
        """
        field: GF(7)
        variables: k, m
        k^2 - m^3 - 1
        """,
    )
    done = fibrewise("normalize", path)
    assert done.returncode == 0, done.stderr
    assert "finite over GF(7)[k]" in done.stdout and "k[k]" not in done.stdout


def test_non_utf8_input_names_the_file_and_line(tmp_path):
    path = tmp_path / "latin1.txt"
    path.write_bytes(b"field: GF(7)\nvariables: x\n# caf\xe9\nx - 1\n")
    done = fibrewise("basis", path)
    assert done.returncode == 2
    assert f"{path}:3:6: not UTF-8" in done.stderr
    cert = tmp_path / "cert.json"
    cert.write_bytes(b'{"dimension": "\xff"}')
    done = fibrewise("check", cert, EXAMPLES / "curve_code_gf7.txt")
    assert done.returncode == 2 and f"{cert}:1: not UTF-8" in done.stderr


def test_a_long_field_name_does_not_pad_every_label(tmp_path):
    path = write(
        tmp_path,
        "big.txt",
        """
        field: GF(2^127 - 1)
        variables: x, y
        x*y - 1
        x - 2
        """,
    )
    done = fibrewise("analyze", path)
    assert done.returncode == 0, done.stderr
    rows = [line for line in done.stdout.splitlines()[1:] if line.startswith("  ") and line[2] != " "]
    widths = {len(line) - len(line[2:].split("  ", 1)[1].lstrip()) for line in rows if "  " in line[2:]}
    assert max(widths) < 40, done.stdout
    assert "1 affine over GF(170141183460469231731687303715884105727)" in done.stdout


def power_map_cipher(tmp_path: Path, rounds: int = 7, p: int = 65519) -> Path:
    """A toy cipher of our own: x -> (x + k + c_i)^3 for seven rounds over GF(65519), key k."""
    constants = [(17 * i * i + 5 * i + 3) % p for i in range(rounds)]
    state, key = 12345, 777
    for c in constants:
        state = pow(state + key + c, 3, p)
    names = ["k"] + [f"s{i}" for i in range(1, rounds)]
    previous, lines = "12345", []
    for i, c in enumerate(constants):
        current = names[i + 1] if i + 1 < rounds else str(state)
        lines.append(f"{current} - ({previous} + k + {c})^3")
        previous = names[i + 1] if i + 1 < rounds else None
    return write(
        tmp_path,
        "power_map.txt",
        f"field: GF({p})\nvariables: {', '.join(names)}\n" + "\n".join(lines) + "\n",
    )


def test_analyze_skips_what_it_cannot_afford_and_says_so(tmp_path):
    path = power_map_cipher(tmp_path)
    done = fibrewise("analyze", path, "--json", timeout=600)  # a hang guard, not a speed test
    assert done.returncode == 0, done.stderr
    result = json.loads(done.stdout)
    assert result["degree"] == 3**7 and result["dimension"] == 0
    assert "points" in result["skipped"] and "2187" in result["skipped"]["points"]
    skipped = fibrewise("analyze", path, "--skip", "normalize,points", "--json", timeout=600)
    result = json.loads(skipped.stdout)
    assert "projection" not in result and "points" not in result
    assert set(result["skipped"]) == {"normalize", "points"}
    assert fibrewise("analyze", path, "--skip", "nothing").returncode == 2


def test_galois_classes_of_other_moduli_get_a_true_primitive_element():
    # The galois class of GF(9) on a^2 + 1 (not galois's default modulus) is built with a
    # primitive element found here (galois's own search took tens of seconds); it must generate
    # the multiplicative group: its powers are the 8 nonzero elements (brute force).
    for spec in ("GF(9)", "GF(2^8)", "GF(7^3)"):
        F = fw.field(spec)
        GF = F.galois_field()
        g = GF(GF.primitive_element)
        powers, x = set(), GF(1)
        for _ in range(F.size - 1):
            x = x * g
            powers.add(int(x))
        assert powers == set(range(1, F.size)), spec
        assert F.galois_field() is GF  # built once
    W = fw.Space("GF(9)", "x, y")
    M = W.system(["x^2 + a", "y^3 - x"]).multiplication_matrix("x")
    assert type(M) is W.field.galois_field()
    assert int((M @ M)[0, 0]) == int(W.field.to_galois(W.parse("-a").terms()[0][1]))  # x^2 = -a
