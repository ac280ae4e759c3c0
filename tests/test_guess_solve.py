"""Solving by guessing (`fibrewise solve --guess`, fibrewise.guess_solve): the points equal the
solver's own list without guessing and brute force (every point of GF(q)^n substituted, with
galois's arithmetic: ``test_solutions.brute_force``), on one process, on a local process pool
and on a Dask LocalCluster (loopback); an interrupted run resumes from its progress file with
every point exactly once, also when a cluster worker goes away mid-run."""

import json

import pytest
from test_solutions import brute_force

import fibrewise as fw
from fibrewise.cli import main
from fibrewise.guess_solve import guessed_points


def cipher() -> fw.System:
    """A toy two-round cipher of our own over GF(7) with two key variables (k1, k2) and two
    plaintext/ciphertext pairs; its states s, t."""
    V = fw.Space("GF(7)", "k1, k2, s, t")
    return V.system(["s - (1 + k1)^3 - k2", "t - (s + k2)^3 - k1 - 2", "(k1 + k2)^2*s - t + 3"])


def test_guessing_gives_the_points_of_the_solver_and_of_brute_force():
    S = cipher()
    expected = brute_force(S)
    assert expected == sorted(S.points())
    assert sorted(guessed_points(S, ["k1", "k2"], chunk=5)) == expected
    assert sorted(guessed_points(S, ["s"])) == expected
    assert len(list(guessed_points(S, ["k1"], limit=1))) == min(1, len(expected))


def test_guessing_on_a_boolean_space_gives_every_point_of_brute_force(rng):
    """On a Boolean space the field equations are implicit: the guessed run must still find
    exactly the points of GF(2)^8, compared with evaluating every one of the 256 points."""
    import itertools

    V = fw.Space("GF(2)", "x0..x7", boolean=True)
    names = V.names
    polys = []
    for _ in range(4):  # fewer equations than unknowns after the guesses: finite only with x^2 = x
        quadratic = [f"{a}*{b}" for i, a in enumerate(names) for b in names[i + 1 :] if rng.random() < 0.3]
        polys.append(" + ".join(quadratic + [a for a in names if rng.random() < 0.5] + ["1"]))
    S = V.system(polys)
    expected = [
        point
        for point in itertools.product((0, 1), repeat=8)
        if all(g.evaluate(dict(zip(names, point))) == 0 for g in S.equations)
    ]
    assert expected, "the seeded system has points"
    found = sorted(tuple(int(v) for v in p) for p in guessed_points(S, ["x0", "x1"], chunk=1))
    assert found == expected


def test_a_local_process_pool_gives_the_same_points():
    S = cipher()
    assert sorted(guessed_points(S, ["k1", "k2"], workers=2, chunk=4)) == brute_force(S)


def test_an_interrupted_run_resumes_with_every_point_once(tmp_path):
    S = cipher()
    progress = str(tmp_path / "progress.jsonl")
    first: list[tuple] = []

    def interrupt(done, total):
        if done == 3:
            raise KeyboardInterrupt

    with pytest.raises(KeyboardInterrupt):
        for p in guessed_points(S, ["k1", "k2"], chunk=4, progress=progress, on_chunk=interrupt):
            first.append(p)
    lines = open(progress).read().splitlines()
    assert len(lines) == 1 + 3  # the header and three chunks
    rest = list(guessed_points(S, ["k1", "k2"], chunk=4, progress=progress))
    assert sorted(first + rest) == brute_force(S)  # every point exactly once
    assert list(guessed_points(S, ["k1", "k2"], chunk=4, progress=progress)) == []  # all done
    with pytest.raises(ValueError, match="another run"):
        list(guessed_points(S, ["k1"], chunk=4, progress=progress))


def test_guess_arguments_are_checked():
    S = cipher()
    for guess, message in ((["w"], "unknown variable"), (["k1", "k1"], "twice"), ([], "at least one")):
        with pytest.raises(ValueError, match=message):
            list(guessed_points(S, guess))


def test_a_dask_cluster_gives_the_same_points_and_survives_a_lost_worker(tmp_path, loopback_cluster):
    S = cipher()
    expected = brute_force(S)
    address = loopback_cluster.scheduler_address
    assert sorted(guessed_points(S, ["k1", "k2"], scheduler=address, chunk=3)) == expected

    def lose_a_worker(done, total):
        if done == 2:
            loopback_cluster.scale(1)  # one worker leaves mid-run; its chunks go to the other

    progress = str(tmp_path / "progress.jsonl")
    found = list(
        guessed_points(S, ["k1", "k2"], scheduler=address, chunk=3, progress=progress, on_chunk=lose_a_worker)
    )
    assert sorted(found) == expected and len(found) == len(set(found))


def test_solve_command_with_guesses(tmp_path, capsys):
    source = tmp_path / "cipher.txt"
    S = cipher()
    source.write_text(
        "field: GF(7)\nvariables: k1, k2, s, t\n" + "\n".join(str(g) for g in S.equations) + "\n"
    )
    progress = tmp_path / "p.jsonl"
    assert (
        main(
            [
                "solve",
                str(source),
                "--guess",
                "k1,k2",
                "--workers",
                "2",
                "--progress",
                str(progress),
                "--quiet",
            ]
        )
        == 0
    )
    out = capsys.readouterr().out
    points = [line for line in out.splitlines() if line.startswith("k1 = ")]
    assert len(points) == len(brute_force(S))
    assert "complete" in out and "yes" in out
    assert main(["solve", str(source), "--guess", "k1,k2", "--json", "--quiet"]) == 0
    result = json.loads(capsys.readouterr().out)
    assert sorted(tuple(int(c) for c in p) for p in result["points"]) == brute_force(S)
    assert main(["solve", str(source), "--guess", "k1,k2", "--limit", "6", "--json", "--quiet"]) == 0
    assert json.loads(capsys.readouterr().out)["truncated"] is False  # exactly 6 points: nothing cut
    assert main(["solve", str(source), "--guess", "k1,k2", "--limit", "2", "--json", "--quiet"]) == 0
    cut = json.loads(capsys.readouterr().out)
    assert cut["truncated"] is True and len(cut["points"]) == 2
    assert main(["solve", str(source), "--guess", "k9", "--quiet"]) == 2
    assert main(["solve", str(source), "--workers", "2", "--quiet"]) == 2
