"""The README stays true: every Python example in it runs as written (in one namespace, in the
order of the README, from a scratch directory that sees the bundled examples), and the Python
section shows only names the package has."""

import os
import re
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
README = (ROOT / "README.md").read_text(encoding="utf-8")


def python_blocks() -> list[str]:
    return re.findall(r"```python\n(.*?)```", README, flags=re.S)


def test_the_readme_has_the_worked_examples():
    blocks = python_blocks()
    assert len(blocks) >= 6
    for user in ("A cryptanalyst", "A coding theorist", "A batch user"):
        assert f"**{user}**" in README


def test_every_python_example_runs(tmp_path, monkeypatch):
    (tmp_path / "examples").symlink_to(ROOT / "examples")
    monkeypatch.chdir(tmp_path)
    # The batch example calls the `fibrewise` command of this environment.
    monkeypatch.setenv("PATH", str(Path(sys.executable).parent) + os.pathsep + os.environ.get("PATH", ""))
    namespace: dict = {}
    for number, block in enumerate(python_blocks(), 1):
        try:
            exec(compile(block, f"README.md python block {number}", "exec"), namespace)
        except Exception as e:  # noqa: BLE001 - name the block that failed
            pytest.fail(f"README python block {number} failed: {type(e).__name__}: {e}\n{block}")
