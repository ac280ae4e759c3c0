"""The wheel a user installs: ``maturin build`` makes one abi3 wheel, which installs into a fresh
virtual environment and runs the command line on an example (marked ``wheel``; ``make test``
runs it)."""

import json
import os
import subprocess
import sys
import sysconfig
import venv
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent


def cargo_version() -> str:
    text = (ROOT / "Cargo.toml").read_text(encoding="utf-8")
    section = text.split("[workspace.package]", 1)[1]
    return section.split('version = "', 1)[1].split('"', 1)[0]


@pytest.mark.wheel
def test_the_wheel_installs_into_a_fresh_environment_and_runs(tmp_path):
    maturin = Path(sys.executable).parent / "maturin"
    # The same interpreter as `maturin develop` used, so that the build reuses its compiled crates.
    subprocess.run(
        [
            str(maturin),
            "build",
            "--release",
            "--quiet",
            "--interpreter",
            sys.executable,
            "--out",
            str(tmp_path / "dist"),
        ],
        cwd=ROOT,
        check=True,
        capture_output=True,
        timeout=1800,
    )
    (wheel,) = (tmp_path / "dist").glob("fibrewise-*.whl")
    version = cargo_version()
    assert wheel.name.startswith(f"fibrewise-{version}-cp310-abi3-"), wheel.name
    env_dir = tmp_path / "env"
    venv.create(env_dir, with_pip=True)
    python = env_dir / "bin" / "python"
    # The run-time dependencies (numpy, galois) come from the test environment, so the test
    # needs no network; fibrewise itself comes only from the wheel.
    site = subprocess.run(
        [str(python), "-c", "import sysconfig; print(sysconfig.get_paths()['purelib'])"],
        check=True,
        capture_output=True,
        text=True,
    ).stdout.strip()
    Path(site, "test-dependencies.pth").write_text(sysconfig.get_paths()["purelib"] + "\n")
    subprocess.run(
        [str(python), "-m", "pip", "install", "--quiet", "--no-deps", "--no-index", str(wheel)],
        check=True,
        capture_output=True,
        timeout=600,
    )
    clean = {k: v for k, v in os.environ.items() if k not in ("VIRTUAL_ENV", "PYTHONPATH")}
    where = subprocess.run(
        [str(python), "-c", "import fibrewise; print(fibrewise.__version__, fibrewise.__file__)"],
        check=True,
        capture_output=True,
        text=True,
        cwd=tmp_path,
        env=clean,
    ).stdout.split()
    assert where[0] == version and where[1].startswith(str(env_dir)), where
    done = subprocess.run(
        [
            str(env_dir / "bin" / "fibrewise"),
            "analyze",
            str(ROOT / "examples" / "curve_code_gf7.txt"),
            "--json",
            "-q",
        ],
        capture_output=True,
        text=True,
        cwd=tmp_path,
        env=clean,
        timeout=600,
    )
    assert done.returncode == 0, done.stderr
    result = json.loads(done.stdout)
    # y^2 = x^3 + 3x + 2 over GF(7): a plane cubic (dimension 1, degree 3) with 8 affine points,
    # as brute force over the 49 pairs counts (tests/test_cli.py).
    assert (result["dimension"], result["degree"], result["points"]["affine"]) == (1, 3, 8)
