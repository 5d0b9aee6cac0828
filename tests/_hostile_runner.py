"""Runs wheelgen commands one after another for the hostile-input corpus.

Started by ``tests/test_hostile_inputs.py`` as a subprocess with a memory limit. It reads
one JSON object per line on stdin, ``{"args": [...], "cwd": "..."}``, runs the command
line in this process (as ``wheelgen ARGS`` would, through click), and answers on stdout
with one JSON object per line:

- ``exit``: the exit status;
- ``error``: the traceback of an exception that escaped the command (a defect), or null;
- ``output``: the end of what the command printed.

One process serves many cases, so the corpus pays Python's and numpy's start-up once;
the test bounds each case by how long it waits for the answer.
"""

from __future__ import annotations

import json
import os
import resource
import sys
import traceback

#: Address space allowed to the whole process (bytes): a case that tries to hold more
#: fails with MemoryError, which the test reports as a defect.
MEMORY_LIMIT = 3 * 2**30


def main() -> None:
    resource.setrlimit(resource.RLIMIT_AS, (MEMORY_LIMIT, MEMORY_LIMIT))
    from click.testing import CliRunner

    from wheelgen.cli import main as wheelgen

    runner = CliRunner()
    answer = sys.stdout
    for line in sys.stdin:
        case = json.loads(line)
        os.chdir(case["cwd"])
        try:
            result = runner.invoke(wheelgen, case["args"], catch_exceptions=True)
            error = None
            if result.exception is not None and not isinstance(
                result.exception, SystemExit
            ):
                error = "".join(traceback.format_exception(*result.exc_info))
            reply = {
                "exit": result.exit_code,
                "error": error,
                "output": result.output[-2000:],
            }
        except BaseException as exc:  # noqa: BLE001  (report anything, keep serving)
            reply = {"exit": None, "error": repr(exc), "output": ""}
        answer.write(json.dumps(reply) + "\n")
        answer.flush()


if __name__ == "__main__":
    main()
