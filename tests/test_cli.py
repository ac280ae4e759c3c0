"""End-to-end tests of the command line on real files (subprocesses, as a user runs it).

Check values come from outside the project: brute-force enumeration in plain Python (points of
curves, keys of the toy cipher), Bézout's bound, and textbook examples (named beside each value).
Tests of subcommands whose Python method lands from another branch are skipped until it is there.
"""

from __future__ import annotations

import io
import json
import subprocess
import sys
from pathlib import Path

import pytest

import fibrewise as fw
from fibrewise.progress import Progress

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples"
SUBCOMMANDS = ["analyze", "basis", "normalize", "integral", "points", "curve", "check", "batch"]


def fibrewise(*args: str, cwd: Path | None = None) -> subprocess.CompletedProcess:
    return subprocess.run(
        [sys.executable, "-m", "fibrewise.cli", *map(str, args)],
        capture_output=True,
        text=True,
        cwd=cwd,
        timeout=120,
    )


def fibrewise_json(*args: str) -> dict:
    done = fibrewise(*args, "--json")
    assert done.returncode == 0, done.stderr
    return json.loads(done.stdout)


def write(tmp_path: Path, name: str, text: str) -> Path:
    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return path


# Brute-force references -------------------------------------------------------------------------


def curve_affine_points(p: int) -> int:
    """Points of y^2 = x^3 + 3x + 2 in GF(p)^2, by enumeration."""
    return sum(1 for x in range(p) for y in range(p) if (y * y - x**3 - 3 * x - 2) % p == 0)


def curve_projective_points(p: int) -> int:
    """Points of y^2 z = x^3 + 3x z^2 + 2 z^3 in P^2(GF(p)), one normalized representative each."""
    reps = [(x, y, 1) for x in range(p) for y in range(p)] + [(x, 1, 0) for x in range(p)] + [(1, 0, 0)]
    return sum(1 for x, y, z in reps if (y * y * z - x**3 - 3 * x * z * z - 2 * z**3) % p == 0)


def cipher_keys(plaintext: int, ciphertext: int, constants: list[int], p: int = 101) -> list[int]:
    """Keys of the toy cube cipher (examples/toy_cipher_*.txt) mapping plaintext to ciphertext."""

    def encrypt(key: int) -> int:
        s = plaintext
        for c in constants:
            s = pow(s + key + c, 3, p)
        return s

    return [key for key in range(p) if encrypt(key) == ciphertext]


# Every subcommand ------------------------------------------------------------------------------


@pytest.mark.parametrize("command", SUBCOMMANDS)
def test_help_shows_an_example(command):
    done = fibrewise(command, "--help")
    assert done.returncode == 0
    assert f"example: fibrewise {command} " in done.stdout
    assert "--json" in done.stdout


def test_basis_lex_gives_the_cipher_keys_as_roots():
    # The lex basis of the 3-round toy cipher is triangular; its last element is a univariate
    # polynomial in the key whose roots in GF(101) are exactly the keys found by trying all 101 keys.
    result = fibrewise_json("basis", EXAMPLES / "toy_cipher_gf101.txt", "--order", "lex")
    assert result["order"] == "lex" and result["field"] == "GF(101)"
    R = fw.Space("GF(101)", "s1, s2, key", order="lex")
    last = R.parse(result["basis"][-1])
    assert last.degree() == 27  # 3^3: Bézout's bound for three cubics, attained by the triangular system
    roots = [key for key in range(101) if last.evaluate([0, 0, key]) == 0]
    assert roots == cipher_keys(2, 27, [3, 5, 7]) and 42 in roots


def test_basis_human_report_lists_the_basis():
    done = fibrewise("basis", EXAMPLES / "toy_cipher_gf101.txt")
    assert done.returncode == 0, done.stderr
    lines = done.stdout.splitlines()
    assert lines[0].startswith("reduced Groebner basis: 3 polynomials over GF(101) in s1, s2, key (lex)")
    assert lines[1].strip().startswith("s1 - key^3")


def test_analyze_curve_for_a_code():
    # y^2 = x^3 + 3x + 2 over GF(7): a plane cubic, dimension 1, degree 3 (Bézout: a line meets it
    # in 3 points), affine Hilbert polynomial 3s (a plane curve of degree d: d*s - d(d-3)/2 = 3s).
    result = fibrewise_json("analyze", EXAMPLES / "curve_code_gf7.txt")
    assert result["dimension"] == 1 and result["degree"] == 3
    assert result["hilbert"]["polynomial"] == [0, 3]
    assert result["points"]["affine"] == curve_affine_points(7) == 8
    assert result["summary"].startswith("dimension 1, degree 3")


def test_analyze_four_round_cipher_report():
    # Four cubic rounds: zero-dimensional, degree 3^4 = 81 (Bézout's bound, attained since the
    # system is triangular in s1, s2, s3); the GF(101) points are the keys found by brute force.
    path = EXAMPLES / "toy_cipher_4round_gf101.txt"
    done = fibrewise("analyze", path)
    assert done.returncode == 0, done.stderr
    lines = done.stdout.splitlines()
    assert lines[0].startswith(f"{path}: dimension 0, degree 81")
    assert "  points                 2 affine over GF(101)" in lines
    result = fibrewise_json("analyze", path)
    assert result["quotient_dimension"] == 81
    assert result["points"]["affine"] == len(cipher_keys(2, 31, [3, 5, 7, 11])) == 2


def test_analyze_summary_names_the_projection():
    # Zero-dimensional: R/I is finite over k itself, of rank dim_k R/I = 81 (Bézout, as above);
    # the curve is finite over a polynomial ring in one parameter, of rank 2 (y^2 monic over
    # k[x]) or 3 (x^3 monic over k[y]) or 3 after a linear change (a general projection of a cubic).
    cipher = fibrewise_json("analyze", EXAMPLES / "toy_cipher_4round_gf101.txt")
    assert cipher["summary"].startswith("dimension 0, degree 81; finite over GF(101) of rank 81 (")
    curve = fibrewise_json("analyze", EXAMPLES / "curve_code_gf7.txt")
    assert curve["summary"].startswith("dimension 1, degree 3; finite over GF(7)[")
    assert curve["projection"]["rank"] in (2, 3)


def test_analyze_plot_writes_a_png(tmp_path):
    pytest.importorskip("matplotlib")
    # The twisted cubic's affine cone (2x2 minors of [[x, y, z], [y, z, w]]): dimension 2, and its
    # Hilbert function is 3s + 1 (Hilbert polynomial of the twisted cubic; Cox-Little-O'Shea).
    system = write(
        tmp_path, "cubic.txt", "field: GF(32003)\nvariables: x, y, z, w\nx*z - y^2\nx*w - y*z\ny*w - z^2\n"
    )
    png = tmp_path / "steps.png"
    result = fibrewise_json("analyze", system, "--plot", png)
    assert result["dimension"] == 2
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_normalize_saves_a_certificate_that_check_accepts(tmp_path):
    cert = tmp_path / "cert.json"
    result = fibrewise_json("normalize", EXAMPLES / "curve_code_gf7.txt", "-o", cert, "--seed", "1")
    assert result["verified"] is True
    assert result["certificate"]["dimension"] == 1
    assert len(result["certificate"]["parameters"]) == 1
    checked = fibrewise_json("check", cert, EXAMPLES / "curve_code_gf7.txt")
    assert checked["valid"] is True


def test_check_rejects_a_tampered_certificate(tmp_path):
    cert = tmp_path / "cert.json"
    fibrewise_json("normalize", EXAMPLES / "curve_code_gf7.txt", "-o", cert)
    data = json.loads(cert.read_text())
    data["rank"] += 1  # a false claim about the degree of the projection
    cert.write_text(json.dumps(data))
    done = fibrewise("check", cert, EXAMPLES / "curve_code_gf7.txt")
    assert done.returncode == 1, done.stdout + done.stderr
    assert "certificate REJECTED" in done.stdout


def test_integral_textbook_cases(tmp_path):
    # On y^2 = x^3 + 3x + 2, y is integral over k[x] with the monic equation of degree 2
    # (the curve's own equation). On the hyperbola xy = 1, x is not integral over k[y]
    # (Atiyah-Macdonald, ch. 5: k[y, 1/y] is not a finite k[y]-module).
    result = fibrewise_json("integral", EXAMPLES / "curve_code_gf7.txt", "--element", "y", "--over", "x")
    assert result["integral"] is True and result["degree"] == 2
    hyperbola = write(tmp_path, "hyperbola.txt", "field: GF(7)\nvariables: x, y\nx*y - 1\n")
    result = fibrewise_json("integral", hyperbola, "--element", "x", "--over", "y")
    assert result["integral"] is False


def test_points_affine_and_projective():
    assert fibrewise_json("points", EXAMPLES / "curve_code_gf7.txt")["points"] == curve_affine_points(7)
    projective = fibrewise_json("points", EXAMPLES / "curve_code_gf7_projective.txt", "--projective")
    assert projective["points"] == curve_projective_points(7) == 9


def field_available(spec: str) -> bool:
    try:
        fw.field(spec)
    except ValueError:
        return False
    return True


@pytest.mark.skipif(not field_available("GF(2^3)"), reason="GF(2^3) not in this build yet")
def test_points_klein_quartic_over_gf8():
    # The Klein quartic has 24 points over GF(8) (classical, from memory): it attains the Serre
    # bound q + 1 + g*floor(2*sqrt(q)) = 8 + 1 + 3*5 = 24 for genus 3.
    result = fibrewise_json("points", EXAMPLES / "klein_quartic_gf8.txt", "--projective")
    assert result["points"] == 24 == klein_quartic_points_by_galois()


def klein_quartic_points_by_galois() -> int:
    """Projective points of x^3 y + y^3 z + z^3 x over GF(8), enumerated with the galois library
    (the coefficients lie in GF(2), so the count does not depend on the modulus of GF(8))."""
    galois = pytest.importorskip("galois")
    F = galois.GF(2**3)
    reps = [(x, y, 1) for x in range(8) for y in range(8)] + [(x, 1, 0) for x in range(8)] + [(1, 0, 0)]
    count = 0
    for x, y, z in reps:
        x, y, z = F(x), F(y), F(z)
        count += int(x**3 * y + y**3 * z + z**3 * x == 0)
    return count


# Bad input -------------------------------------------------------------------------------------


def test_bad_field_names_file_line_and_column(tmp_path):
    system = write(tmp_path, "bad.txt", "# a comment\nfield:  GF(10)\nvariables: x\nx - 1\n")
    done = fibrewise("analyze", system)
    assert done.returncode == 2
    assert f"{system}:2:9:" in done.stderr and "GF(10)" in done.stderr
    assert done.stdout == ""


def test_unknown_variable_names_file_line_and_column(tmp_path):
    system = write(tmp_path, "bad.txt", "field: GF(7)\nvariables: x, y\nx*y - 1\n  x^2 + z\n")
    done = fibrewise("basis", system, "--json")
    assert done.returncode == 2
    assert f"{system}:4:9:" in done.stderr and "unknown variable 'z'" in done.stderr
    assert "unknown variable" in json.loads(done.stdout)["error"]


def test_missing_file(tmp_path):
    done = fibrewise("points", tmp_path / "nowhere.txt")
    assert done.returncode == 2
    assert "nowhere.txt: No such file or directory" in done.stderr


def test_malformed_certificate_json(tmp_path):
    cert = write(tmp_path, "cert.json", '{"dimension": 1,\n "rank": }\n')
    done = fibrewise("check", cert, EXAMPLES / "curve_code_gf7.txt")
    assert done.returncode == 2
    assert f"{cert}:2:10: malformed JSON" in done.stderr


# Start-up and progress -------------------------------------------------------------------------


def test_startup_imports_no_heavy_package():
    code = (
        "import sys, contextlib, io\n"
        "from fibrewise.cli import main\n"
        "with contextlib.redirect_stdout(io.StringIO()):\n"
        f"    main(['basis', {str(EXAMPLES / 'toy_cipher_gf101.txt')!r}, '--json'])\n"
        "print(sorted(m for m in ('galois', 'numba', 'dask', 'distributed', 'matplotlib') if m in sys.modules))\n"
    )
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, timeout=60)
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip() == "[]"


class FakeTerminal(io.StringIO):
    def isatty(self) -> bool:
        return True


def test_progress_draws_only_on_a_terminal_and_not_when_quiet():
    tty = FakeTerminal()
    progress = Progress(4, stream=tty, delay=0.0, interval=0.0)
    progress.advance()
    progress.advance()
    assert "batch  2/4 jobs" in tty.getvalue() and "jobs/s" in tty.getvalue() and "left" in tty.getvalue()
    progress.close()
    for stream, quiet in ((FakeTerminal(), True), (io.StringIO(), False)):
        silent = Progress(4, stream=stream, quiet=quiet, delay=0.0, interval=0.0)
        silent.advance()
        silent.close()
        assert stream.getvalue() == ""


def test_progress_waits_a_second_before_drawing():
    tty = FakeTerminal()
    progress = Progress(10, stream=tty, interval=0.0)  # default delay: 1 s
    progress.advance()
    assert tty.getvalue() == ""


def test_check_outcomes_in_either_shape():
    # A check answers a bool or the list of problems it found (empty when the certificate holds).
    from fibrewise.cli import verdict

    assert verdict(True) == (True, [])
    assert verdict([]) == (True, [])
    assert verdict(False) == (False, ["the certificate does not hold"])
    assert verdict(["rank 4 claimed, 3 found"]) == (False, ["rank 4 claimed, 3 found"])


def test_basis_engine_choice():
    # The sampled engine returns the same reduced basis as the default one (the lex basis whose
    # roots are the cipher keys, checked by brute force above); an unknown engine is a usage error.
    default = fibrewise_json("basis", EXAMPLES / "toy_cipher_gf101.txt", "--order", "lex")
    sampled = fibrewise_json(
        "basis", EXAMPLES / "toy_cipher_gf101.txt", "--order", "lex", "--engine", "f4-sampled"
    )
    assert sampled["basis"] == default["basis"]
    # engine "auto" is the default, and the stats say what it chose and why
    assert sampled["stats"]["engine"] == "f4-sampled" and default["stats"]["engine"] == "auto"
    assert default["stats"]["choice"].startswith("grevlex basis (f4-")
    # an explicit engine makes the grevlex basis, the order is changed after
    assert sampled["stats"]["choice"].startswith("grevlex basis by f4-sampled, then FGLM")
    done = fibrewise("basis", EXAMPLES / "toy_cipher_gf101.txt", "--engine", "f5")
    assert done.returncode == 2 and "f4-sampled" in done.stderr
