"""The papers of a job against their numbers: the printable report of the bench's installation (50 boards, 2 000
circuits, bench/payload.py) against the check it reports, in process, the two alternated run by run (medians).

    python bench/papers.py      (prints its rows alone; bench/run.py prints them with the rest)
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from bench.payload import installation  # noqa: E402

RUNS = 5


def report_rows() -> list[tuple[str, str, str, str, str]]:
    """The report's time against the check's, and the report's bytes a circuit."""
    from service.contract.installation_schemas import InstallationRequestSchema, installation_of, problem_messages
    from service.electrical.network.installation import check_installation
    from service.report import report_html

    body = installation()
    inst, problems = installation_of(InstallationRequestSchema().load(body))
    messages = problem_messages(problems)
    result = check_installation(inst)
    html = report_html(inst, result, messages)  # warm: templates compiled, tables loaded
    checks, reports = [], []
    for _ in range(RUNS):  # alternate the two sides, so the machine's drift falls on both
        start = time.perf_counter()
        result = check_installation(inst)
        checks.append(time.perf_counter() - start)
        start = time.perf_counter()
        html = report_html(inst, result, messages)
        reports.append(time.perf_counter() - start)
    check_s, report_s = statistics.median(checks), statistics.median(reports)
    n = sum(len(b["circuits"]) for b in body["boards"])
    return [
        (
            f"report of {len(body['boards'])} boards and {n:,} circuits, in process (HTML)",
            f"{report_s * 1000:,.0f} ms, {len(html.encode()) / n:,.0f} bytes a circuit",
            f"the check it reports {check_s * 1000:,.0f} ms",
            f"{report_s / check_s:.1f}x",
            "<= 5x, <= 2 000 bytes a circuit",
        )
    ]


if __name__ == "__main__":
    for cells in report_rows():
        print(" | ".join(cells))
