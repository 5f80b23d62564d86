"""`python -m service check installation.json [--report FILE.html]`: a whole installation from a file.

The file is the body of POST /v1/installations/check; the answer is the same JSON, and ``--report`` writes the
printable HTML report as well. Exit status as for a schedule (:func:`service.cli.status.exit_status`), and 1 where a
board's own rating fails; a file whose tree or supply is refused exits 2 with the fields named.
"""

from __future__ import annotations

import sys
from pathlib import Path

from marshmallow import ValidationError

from service.cli.status import EXIT_FAIL, EXIT_UNREADABLE, exit_status
from service.contract import batch
from service.contract.installation_schemas import InstallationRequestSchema, installation_of, problem_messages, records
from service.contract.problems import core_errors, flatten, json_bytes
from service.electrical.errors import ElectricalError
from service.electrical.network.installation import check_installation
from service.electrical.results.verdicts import Verdict

SCHEMA = InstallationRequestSchema()


def _refused(path: Path, errors: list[dict[str, str]]) -> int:
    for e in errors:
        print(f"cannot check {path}: {e['pointer'] or '/'}: {e['message']}", file=sys.stderr)
    return EXIT_UNREADABLE


def run(body: dict, path: Path, args, progress) -> int:
    """Check the installation in ``body``; write the answer (and the report); return the exit status."""
    try:
        loaded = SCHEMA.load(body)
    except ValidationError as err:
        return _refused(path, flatten(err.messages))
    inst, problems = installation_of(loaded)
    count = sum(len(board.circuits) for board in inst.boards)
    bar = progress(count)
    try:
        result = check_installation(inst, loaded.get("checks"), progress=bar.update, chunk=batch.CHUNK)
    except ElectricalError as err:
        return _refused(path, core_errors(err))
    answer = json_bytes(records(inst, result, problems)) + b"\n"
    if args.output:
        Path(args.output).write_bytes(answer)
    else:
        sys.stdout.buffer.write(answer)
        sys.stdout.flush()
    if args.report:
        from service.report import report_html

        html = report_html(inst, result, problem_messages(problems), job=loaded.get("job"))
        Path(args.report).write_text(html, encoding="utf-8")
    counts = {k: v for k, v in result.summary.items()}
    print(" ".join(f"{k}={v}" for k, v in counts.items()), file=sys.stderr)
    return EXIT_FAIL if result.verdict == Verdict.FAIL else exit_status(counts)
