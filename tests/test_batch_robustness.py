"""Batch runs never lose data: the output is never the input, an output file that is not ours is
left alone, timed-out jobs keep their finished tasks, failed jobs can be rerun in place, and a
worker dies with its batch even deep in native code.

Check values: the dimension of a surface in 3-space is 2 and of the hyperbola x*y = 1 is 1
(textbook facts); the reduced grevlex basis of (x*y - 1, x^2 - y) over GF(7) is
[x^2 - y, x*y - 1, y^2 - x] (as in tests/test_batch.py, compared with sympy there).
"""

from __future__ import annotations

import json
import os
import random
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from fibrewise.batch import read_results
from fibrewise.cli import main

HYPERBOLA = {
    "id": "hyperbola",
    "field": "GF(7)",
    "variables": ["x", "y"],
    "polynomials": ["x*y - 1", "x^2 - y"],
    "tasks": ["basis"],
}
HYPERBOLA_BASIS = ["x^2 - y", "x*y - 1", "y^2 - x"]


def write_jobs(path: Path, jobs: list[dict], prefix: bytes = b"") -> Path:
    path.write_bytes(prefix + "".join(json.dumps(job) + "\n" for job in jobs).encode("utf-8"))
    return path


def records(path: Path) -> list[dict]:
    return [json.loads(line) for line in path.read_text(encoding="utf-8").splitlines()]


# The output is never the input ------------------------------------------------------------------


@pytest.mark.parametrize("how", ["same path", "symbolic link", "hard link", "other spelling"])
def test_an_output_that_is_the_input_is_refused_and_the_jobs_survive(tmp_path, capsys, how):
    source = write_jobs(tmp_path / "in.jsonl", [HYPERBOLA])
    before = source.read_bytes()
    output = {"same path": source, "other spelling": tmp_path / "." / "in.jsonl"}.get(
        how, tmp_path / "out.jsonl"
    )
    if how == "symbolic link":
        output.symlink_to(source)
    elif how == "hard link":
        os.link(source, output)
    assert main(["batch", str(source), "-o", str(output), "--quiet"]) == 2
    assert "the output file is the input file" in capsys.readouterr().err
    assert source.read_bytes() == before


# An output file that is not ours is left alone --------------------------------------------------

GOOD_LINE = b'{"id":"old","status":"ok","result":{},"seconds":0.1}\n'


@pytest.mark.parametrize(
    "tail, line",
    [
        (b'{"note": "not a result"}\n', 2),  # complete JSON that is not a result line
        (b"some notes of mine\n", 2),  # any other text
        (b"some notes of mine", 2),  # ... even without its newline: not a torn result line
        (b"[1, 2, 3]", 2),
    ],
)
def test_an_output_whose_last_line_is_not_a_result_is_an_error_and_untouched(tmp_path, capsys, tail, line):
    source = write_jobs(tmp_path / "in.jsonl", [HYPERBOLA])
    output = tmp_path / "out.jsonl"
    output.write_bytes(GOOD_LINE + tail)
    assert main(["batch", str(source), "-o", str(output), "--quiet"]) == 2
    assert f"{output}:{line}: not a result line" in capsys.readouterr().err
    assert output.read_bytes() == GOOD_LINE + tail


def test_only_a_torn_result_line_is_cut(tmp_path):
    output = tmp_path / "out.jsonl"
    for torn in (b'{"id":"b","sta', b'{"i', b'{"id":"b","status":"ok"\0\0\0', b"\0\0\0\0"):
        output.write_bytes(GOOD_LINE + torn)
        assert [r["id"] for r, _ in read_results(str(output))] == ["old"]
        assert output.read_bytes() == GOOD_LINE


# Timeouts keep the finished tasks -----------------------------------------------------------------


def dense_quadrics(count: int, n: int, p: int = 65521) -> list[str]:
    rng = random.Random(3)
    names = [f"x{i}" for i in range(n)]
    monomials = [f"{a}*{b}" for i, a in enumerate(names) for b in names[i:]] + names + ["1"]
    return [" + ".join(f"{rng.randrange(1, p)}*{m}" for m in monomials) for _ in range(count)]


def test_a_timed_out_job_keeps_the_tasks_it_finished(tmp_path):
    # Seven dense quadrics in nine variables: the basis, the dimension (9 - 7 = 2, a complete
    # intersection) and the projection's summary come in a fraction of a second, while the 128
    # monic equations of degree 128 of the full certificate take far longer (six quadrics in
    # eight variables finished within the limit on an idle machine).
    job = {
        "id": "quadrics",
        "field": "GF(65521)",
        "variables": ["x0..x8"],
        "polynomials": dense_quadrics(7, 9),
        "tasks": ["dimension", "projection", "normalize"],
    }
    source, output = write_jobs(tmp_path / "in.jsonl", [job, HYPERBOLA]), tmp_path / "out.jsonl"
    assert main(["batch", str(source), "-o", str(output), "--workers", "1", "--timeout", "3", "--quiet"]) == 0
    by_id = {r["id"]: r for r in records(output)}
    assert by_id["quadrics"]["status"] == "timeout"
    finished = by_id["quadrics"]["result"]
    assert set(finished) == {"dimension", "projection"} and finished["dimension"] == 2
    assert finished["projection"]["rank"] == 2**7  # Bézout: the generic fibre has 2^7 points
    assert by_id["hyperbola"]["result"]["basis"] == HYPERBOLA_BASIS


# --retry-failed -----------------------------------------------------------------------------------


def test_retry_failed_reruns_error_and_timeout_lines_in_place(tmp_path, capsys):
    jobs = [HYPERBOLA, {**HYPERBOLA, "id": "again", "tasks": ["dimension"]}, {**HYPERBOLA, "id": "fine"}]
    source, output = write_jobs(tmp_path / "in.jsonl", jobs), tmp_path / "out.jsonl"
    lines = [
        {"id": "hyperbola", "status": "error", "error": "the worker process died", "seconds": None},
        {"id": "again", "status": "timeout", "error": "over the time limit of 1 s", "seconds": 1},
        {"id": "fine", "status": "ok", "result": {"basis": ["kept as it was"]}, "seconds": 0.1},
        {"id": "not-in-this-input", "status": "error", "error": "kept", "seconds": 0.1},
    ]
    output.write_text("".join(json.dumps(line) + "\n" for line in lines), encoding="utf-8")

    assert main(["batch", str(source), "-o", str(output), "--quiet"]) == 0  # a plain resume
    capsys.readouterr()
    assert records(output) == lines
    assert main(["batch", str(source), "-o", str(output), "--quiet", "--retry-failed", "--json"]) == 0
    summary = json.loads(capsys.readouterr().out)
    assert summary["retried"] == 2 and summary["ok"] == 2 and summary["skipped"] == 1
    after = records(output)
    assert sorted(r["id"] for r in after) == [
        "again",
        "fine",
        "hyperbola",
        "not-in-this-input",
    ]  # one line per id
    by_id = {r["id"]: r for r in after}
    assert by_id["hyperbola"]["status"] == "ok" and by_id["hyperbola"]["result"]["basis"] == HYPERBOLA_BASIS
    assert by_id["again"]["result"] == {"dimension": 0}  # two curves meeting in finitely many points
    assert by_id["fine"] == lines[2] and by_id["not-in-this-input"] == lines[3]


# Input reading ------------------------------------------------------------------------------------


def test_a_byte_order_mark_is_accepted(tmp_path):
    source = write_jobs(tmp_path / "in.jsonl", [HYPERBOLA], prefix="\ufeff".encode("utf-8"))
    output = tmp_path / "out.jsonl"
    assert main(["batch", str(source), "-o", str(output), "--quiet"]) == 0
    assert records(output)[0]["result"]["basis"] == HYPERBOLA_BASIS


@pytest.mark.parametrize(
    "line, column",
    [
        ('\ufeff{"id": 1,, "field": "GF(7)"}', 10),  # after a byte-order mark
        ('{"id": "état", "field": GF(7)}', 25),  # after non-ASCII text: columns count characters
        ('\t{"id": 1, "field": }', 21),
    ],
)
def test_malformed_json_is_reported_at_its_column(tmp_path, capsys, line, column):
    source = tmp_path / "in.jsonl"
    source.write_text(line + "\n", encoding="utf-8")
    assert main(["batch", str(source), "-o", str(tmp_path / "out.jsonl")]) == 2
    assert f"{source}:1:{column}: malformed JSON" in capsys.readouterr().err


# A worker dies with its batch -----------------------------------------------------------------------


def children_of(pid: int) -> list[int]:
    found = []
    for task in Path(f"/proc/{pid}/task").iterdir():
        found += [int(c) for c in (task / "children").read_text().split()]
    return found


def alive(pid: int) -> bool:
    try:
        state = Path(f"/proc/{pid}/stat").read_text().split(") ")[1][0]
    except (FileNotFoundError, IndexError):
        return False
    return state != "Z"


@pytest.mark.skipif(not sys.platform.startswith("linux"), reason="reads /proc")
def test_a_worker_killed_with_its_batch_while_parsing_dies_at_once(tmp_path):
    # Reading this polynomial expands a power with about 1.9 million terms: many seconds inside
    # the parser, which is where a worker used to outlive its batch by 25 s.
    names = [f"x{i}" for i in range(6)]
    job = {
        "id": "long-parse",
        "field": "GF(32003)",
        "variables": names,
        "polynomials": ["(" + " + ".join(names) + " + 1)^30"],
        "tasks": ["dimension"],
    }
    source, output = write_jobs(tmp_path / "in.jsonl", [job]), tmp_path / "out.jsonl"
    proc = subprocess.Popen(
        [
            sys.executable,
            "-m",
            "fibrewise.cli",
            "batch",
            str(source),
            "-o",
            str(output),
            "--workers",
            "1",
            "--quiet",
        ],
        stdout=subprocess.DEVNULL,
        stderr=subprocess.PIPE,
    )
    try:
        deadline = time.monotonic() + 30
        workers = []
        while not workers and time.monotonic() < deadline:
            time.sleep(0.1)
            workers = children_of(proc.pid)
        assert workers, "the batch started no worker"
        time.sleep(1.5)  # the worker is parsing now
        assert alive(workers[0])
        proc.kill()
        proc.wait()
        killed = time.monotonic()
        while alive(workers[0]) and time.monotonic() < killed + 10:
            time.sleep(0.02)
        lived = time.monotonic() - killed
        print(f"the worker outlived its batch by {lived:.3f} s")
        assert not alive(workers[0])
    finally:
        if proc.poll() is None:
            proc.kill()
        for pid in children_of(proc.pid) if proc.poll() is None else []:
            os.kill(pid, signal.SIGKILL)
