"""The hostile-input corpus (tests/_hostile_cases.py): every case ends with exit 0, 1 or
2, a message and no traceback, within a bounded time and memory.

The cases run in one helper process (tests/_hostile_runner.py) with an address-space
limit; the test waits at most :data:`CASE_TIMEOUT_S` for each answer and fails the case
(and starts a fresh helper) when none comes. That wait is the bound on a case's time:
nothing here measures or asserts a duration.
"""

from __future__ import annotations

import json
import os
import select
import signal
import subprocess
import sys
from pathlib import Path

import pytest
from _hostile_cases import Case, cases

HERE = Path(__file__).parent
#: The longest a single case may take before it counts as unbounded work.
CASE_TIMEOUT_S = 15.0
CORPUS = cases()


class Runner:
    """The helper process, answering one case per line."""

    def __init__(self) -> None:
        env = dict(os.environ)
        root = str(HERE.parent)
        env["PYTHONPATH"] = os.pathsep.join(
            [root, env["PYTHONPATH"]] if env.get("PYTHONPATH") else [root]
        )
        self.proc = subprocess.Popen(
            [sys.executable, str(HERE / "_hostile_runner.py")],
            stdin=subprocess.PIPE,
            stdout=subprocess.PIPE,
            stderr=subprocess.DEVNULL,
            env=env,
            start_new_session=True,
        )

    def run(self, case: Case, cwd: Path) -> dict | None:
        assert self.proc.stdin is not None and self.proc.stdout is not None
        line = json.dumps({"args": list(case.args), "cwd": str(cwd)}) + "\n"
        self.proc.stdin.write(line.encode())
        self.proc.stdin.flush()
        ready, _, _ = select.select([self.proc.stdout], [], [], CASE_TIMEOUT_S)
        if not ready:
            return None
        answer = self.proc.stdout.readline()
        return json.loads(answer) if answer else {"exit": None, "error": "died"}

    def close(self) -> None:
        if self.proc.poll() is None:
            try:
                os.killpg(self.proc.pid, signal.SIGKILL)
            except ProcessLookupError:
                pass
        self.proc.wait()


@pytest.fixture(scope="module")
def runner():
    holder = {"runner": Runner()}
    yield holder
    holder["runner"].close()


def _write(files: dict[str, str], where: Path) -> None:
    for name, content in files.items():
        path = where / name
        if content == "<fifo>":
            os.mkfifo(path)
        elif content == "<dev-zero-link>":
            path.symlink_to("/dev/zero")
        elif content == "<folder>":
            path.mkdir()
        elif content == "<big>":
            path.write_bytes(b"# padding\n" * 600_000)  # 6 MB, past the 4 MiB bound
        elif content == "<latin1>":
            path.write_bytes('[design]\ntitle = "café"\n'.encode("latin-1"))
        else:
            path.write_text(content, encoding="utf-8", errors="surrogatepass")


@pytest.mark.parametrize("case", CORPUS, ids=[c.id for c in CORPUS])
def test_hostile_case_ends_cleanly(case, runner, tmp_path):
    _write(case.files, tmp_path)
    reply = runner["runner"].run(case, tmp_path)
    if reply is None:
        runner["runner"].close()
        runner["runner"] = Runner()
        pytest.fail(f"no answer within {CASE_TIMEOUT_S:g} s: {case.args}")
    assert reply["error"] is None, reply["error"]
    assert reply["exit"] in (0, 1, 2), reply
    output = reply["output"]
    assert "Traceback" not in output, output
    # internal advice of Python itself must not reach the user
    assert "set_int_max_str_digits" not in output, output
