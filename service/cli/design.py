"""`python -m service design installation.json [-o completed.json] [--answer answer.json] [--bill bill.csv]
[--report report.html]`: design an installation from a file.

The file is the body of POST /v1/installations/design (installations/check's, with ratings and sizes left out).
It writes the completed installation (the body installations/check takes; standard output unless ``-o``), the
whole answer (``--answer``), the bill of quantities as CSV (``--bill``) and the printable report with the bill
(``--report``). Exit status 0 where the design passes, 1 where no design passes (the failures are said on
standard error), 2 where the file cannot be read.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

from marshmallow import ValidationError

from service.cli.status import EXIT_FAIL, EXIT_PASS, EXIT_UNREADABLE
from service.contract.design_schemas import bill_csv, design_inputs, designed
from service.contract.problems import core_errors, flatten, json_bytes
from service.contract.strictjson import strict_loads
from service.electrical.errors import ElectricalError


def _refused(path: Path, errors: list[dict[str, str]]) -> int:
    for e in errors:
        print(f"cannot design {path}: {e['pointer'] or '/'}: {e['message']}", file=sys.stderr)
    return EXIT_UNREADABLE


def main(args) -> int:
    path = Path(args.file)
    try:
        raw = strict_loads(path.read_bytes())
        answer = designed(raw)
    except OSError as err:
        print(f"cannot read {path}: {err}", file=sys.stderr)
        return EXIT_UNREADABLE
    except json.JSONDecodeError as err:
        print(f"cannot read {path}: {err.msg}", file=sys.stderr)
        return EXIT_UNREADABLE
    except ValidationError as err:
        return _refused(path, flatten(err.messages))
    except ElectricalError as err:
        return _refused(path, core_errors(err))
    completed = json.dumps(answer["installation"], indent=2, ensure_ascii=False) + "\n"
    if args.output:
        Path(args.output).write_text(completed, encoding="utf-8")
    else:
        sys.stdout.write(completed)
    if args.answer:
        Path(args.answer).write_bytes(json_bytes(answer) + b"\n")
    if args.bill:
        Path(args.bill).write_text(bill_csv(answer["bill_of_quantities"]), encoding="utf-8")
    if args.report:
        _report(answer, Path(args.report))
    for failure in answer["failures"]:
        print(f"no design passes: board {failure['board']}, {failure['id']}: {failure['check']}; "
              f"would: {failure['would']}", file=sys.stderr)  # fmt: skip
    print(" ".join(f"{k}={v}" for k, v in answer["checked"]["summary"].items()), file=sys.stderr)
    return EXIT_PASS if answer["feasible"] else EXIT_FAIL


def _report(answer: dict, path: Path) -> None:
    """The report of the completed installation, with the design's bill of quantities."""
    from service.electrical.network.installation import check_installation
    from service.report import report_html

    _, loaded, inst, _ = design_inputs(answer["installation"])  # the completed body: nothing left out
    html = report_html(
        inst, check_installation(inst), job=loaded.get("job"), bill=answer["bill_of_quantities"],
        traded=answer["traded"],
    )  # fmt: skip
    path.write_text(html, encoding="utf-8")


def add_parser(sub) -> None:
    p = sub.add_parser("design", help="design an installation: every rating and size left out chosen")
    p.add_argument("file", help="the body of POST /v1/installations/design (JSON)")
    p.add_argument("-o", "--output", help="write the completed installation here (default: standard output)")
    p.add_argument("--answer", metavar="FILE.json", help="write the whole answer (choices, bill, check) here")
    p.add_argument("--bill", metavar="FILE.csv", help="write the bill of quantities here as CSV")
    p.add_argument("--report", metavar="FILE.html", help="write the printable report, with the bill, here")
    p.set_defaults(func=main)
