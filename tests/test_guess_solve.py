"""Solving by guessing (`fibrewise solve --guess`, fibrewise.guess_solve): the points equal the
solver's own list without guessing and brute force (every point of GF(q)^n substituted, with
galois's arithmetic: ``test_solutions.brute_force``), on one process, on a local process pool
and on a Dask LocalCluster (loopback); a run stopped anywhere (by --limit, by Ctrl-C or SIGTERM
while a point is being written or while chunks are computed, by the consumer dropping the
iterator, by a cluster worker going away) and resumed from its progress file delivers every
point of brute force exactly once over all its runs."""

import io
import json
import re
import signal
import sys

import pytest
from test_solutions import brute_force

import fibrewise as fw
from fibrewise.cli import main
from fibrewise.guess_solve import GuessedRun, guessed_points


def cipher() -> fw.System:
    """A toy two-round cipher of our own over GF(7) with two key variables (k1, k2) and two
    plaintext/ciphertext pairs; its states s, t."""
    V = fw.Space("GF(7)", "k1, k2, s, t")
    return V.system(["s - (1 + k1)^3 - k2", "t - (s + k2)^3 - k1 - 2", "(k1 + k2)^2*s - t + 3"])


def spread() -> fw.System:
    """A curve in GF(7)^3 of our own whose points lie over many values of x, several over some."""
    V = fw.Space("GF(7)", "x, y, z")
    return V.system(["y^2 - x^3 - 2*x - 3 - z", "z^2 - x*y - 1"])


def exactly_once(runs: list[list[tuple]], expected: list[tuple]) -> bool:
    """Whether the points of all runs together are ``expected``, none twice."""
    union = [tuple(int(c) for c in p) for run in runs for p in run]
    return sorted(union) == expected


def test_the_spread_curve_has_points_to_cut(rng):
    expected = brute_force(spread())
    over_x = [sum(p[0] == x for p in expected) for x in range(7)]
    assert len(expected) >= 6 and max(over_x) >= 2  # some guess has two points or more


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


def test_runs_cut_by_a_limit_and_resumed_give_every_point_once(tmp_path):
    """Runs of at most two points each, resumed from one progress file until a run finds
    nothing: the cuts fall inside chunks (chunks of three guesses hold several points)."""
    S = spread()
    expected = brute_force(S)
    progress = str(tmp_path / "p.jsonl")
    runs = []
    while run := list(guessed_points(S, ["x"], chunk=3, progress=progress, limit=2)):
        assert len(run) <= 2
        runs.append(run)
    assert exactly_once(runs, expected) and len(runs) == -(-len(expected) // 2)
    lines = [json.loads(line) for line in open(progress).read().splitlines()[1:]]
    assert any("written" in line for line in lines)  # a chunk was cut and resumed inside


def test_a_limit_on_a_process_pool_then_a_resume_gives_every_point_once(tmp_path):
    S = spread()
    expected = brute_force(S)
    progress = str(tmp_path / "p.jsonl")
    first = list(guessed_points(S, ["x"], workers=2, chunk=7, progress=progress, limit=3))
    rest = list(guessed_points(S, ["x"], workers=2, chunk=7, progress=progress))
    assert len(first) == 3 and exactly_once([first, rest], expected)


def test_a_consumer_that_stops_after_a_point_gets_the_others_on_resume(tmp_path):
    S = spread()
    expected = brute_force(S)
    progress = str(tmp_path / "p.jsonl")
    first: list[tuple] = []
    with pytest.raises(KeyboardInterrupt):
        for point in guessed_points(S, ["x"], chunk=7, progress=progress):
            first.append(point)
            raise KeyboardInterrupt  # the consumer is interrupted holding its first point
    points = guessed_points(S, ["x"], chunk=7, progress=progress)
    second = [next(points)]
    points.close()  # the consumer drops the iterator after one more point
    rest = list(guessed_points(S, ["x"], chunk=7, progress=progress))
    assert exactly_once([first, second, rest], expected)


def test_ctrl_c_while_a_point_is_written_takes_effect_once_it_is_counted(tmp_path):
    """A real SIGINT raised inside ``write``: it is held until the point is counted, then
    raises KeyboardInterrupt; the resumed run writes only the other points."""
    S = spread()
    expected = brute_force(S)
    progress = str(tmp_path / "p.jsonl")
    written: list[tuple] = []

    def write(point: tuple) -> None:
        written.append(point)
        if len(written) == 2:
            signal.raise_signal(signal.SIGINT)

    with pytest.raises(KeyboardInterrupt):
        for _ in GuessedRun(S, ["x"], chunk=7, progress=progress, write=write):
            pass
    assert len(written) == 2
    rest = list(guessed_points(S, ["x"], chunk=7, progress=progress))
    assert exactly_once([written, rest], expected)


def test_a_dask_run_cut_by_limits_and_resumed_gives_every_point_once(tmp_path, loopback_cluster):
    S = spread()
    expected = brute_force(S)
    address = loopback_cluster.scheduler_address
    progress = str(tmp_path / "p.jsonl")
    runs = []
    while run := list(guessed_points(S, ["x"], scheduler=address, chunk=3, progress=progress, limit=3)):
        runs.append(run)
    assert exactly_once(runs, expected)


def system_file(tmp_path, S: fw.System) -> str:
    source = tmp_path / "system.txt"
    names = ", ".join(S.space.names)
    source.write_text(
        f"field: {S.space.field}\nvariables: {names}\n" + "\n".join(map(str, S.equations)) + "\n"
    )
    return str(source)


class InterruptingStdout(io.StringIO):
    """Standard output on which writing the first point line sends Ctrl-C (SIGINT) to the process."""

    signalled = False

    def write(self, text: str) -> int:
        count = super().write(text)
        if text.startswith("x = ") and not self.signalled:
            self.signalled = True
            signal.raise_signal(signal.SIGINT)
        return count


def point_lines(text: str) -> list[tuple]:
    lines = [line for line in text.splitlines() if line.startswith("x = ")]
    return [tuple(int(part.split(" = ")[1]) for part in line.split(", ")) for line in lines]


def test_solve_command_interrupted_while_printing_resumes_without_repeating(tmp_path, capsys, monkeypatch):
    S = spread()
    expected = brute_force(S)
    source, progress = system_file(tmp_path, S), str(tmp_path / "p.jsonl")
    command = ["solve", source, "--guess", "x", "--progress", progress, "--quiet"]
    stdout = InterruptingStdout()
    with monkeypatch.context() as m:
        m.setattr(sys, "stdout", stdout)
        assert main(command) == 130  # interrupted, after the summary
    first = point_lines(stdout.getvalue())
    assert len(first) == 1 and "interrupted by SIGINT" in stdout.getvalue()
    assert main(command) == 0
    out = capsys.readouterr().out
    assert exactly_once([first, point_lines(out)], expected) and re.search(r"complete\s+yes", out)


def test_solve_command_after_sigterm_and_a_limit_in_json(tmp_path, capsys, monkeypatch):
    """SIGTERM while the second chunk is computed ends the run with exit status 143 and the JSON
    object of what was written; a run with --limit 1 and one without limit write the rest."""
    import fibrewise.guess_solve as guess_solve

    S = spread()
    expected = brute_force(S)
    source, progress = system_file(tmp_path, S), str(tmp_path / "p.jsonl")
    command = ["solve", source, "--guess", "x", "--progress", progress, "--json", "--quiet"]
    solve_chunk = guess_solve.solve_chunk
    handler = signal.getsignal(signal.SIGTERM)

    def terminated_on_the_second_chunk(job, index):
        if index == 1:
            signal.raise_signal(signal.SIGTERM)
        return solve_chunk(job, index)

    with monkeypatch.context() as m:
        m.setattr(guess_solve, "solve_chunk", terminated_on_the_second_chunk)
        assert main([*command, "--workers", "1"]) == 143
    stopped = json.loads(capsys.readouterr().out)
    assert stopped["interrupted"] == "SIGTERM" and stopped["chunks_done"] == 1
    assert signal.getsignal(signal.SIGTERM) == handler  # the handler is given back
    assert main([*command, "--limit", "1"]) == 0
    one = json.loads(capsys.readouterr().out)
    assert len(one["points"]) == 1 and one["truncated"]
    assert main(command) == 0
    rest = json.loads(capsys.readouterr().out)
    runs = [[tuple(int(c) for c in p) for p in r["points"]] for r in (stopped, one, rest)]
    assert exactly_once(runs, expected) and rest["chunks_done"] == rest["chunks"]
