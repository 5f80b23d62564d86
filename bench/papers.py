"""The papers of a job against their numbers: the printable report of the bench's installation (50 boards, 2 000
circuits, bench/payload.py) against the check it reports, and its design with every size left out against the check
of the design; in process, the two sides alternated run by run (medians).

    python bench/papers.py      (prints its rows alone; bench/run.py prints them with the rest)
"""

from __future__ import annotations

import json
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


def left_out(body: dict) -> dict:
    """The installation with every rating and size left to the design, and the diversity a designer would allow
    on its boards (Appendix 1; invented figures: each sub-board 0.2, each distribution board 0.3)."""
    out = json.loads(json.dumps(body))
    out["premises"] = "other"  # invented: a commercial estate
    for board in out["boards"]:
        if board["fed_from"] is not None:
            board["diversity"] = 0.3 if board["fed_from"] == "MAIN" else 0.2
        for circuit in board["circuits"]:
            if "installation" not in circuit:  # how the cable is run, which a design needs (invented: clipped direct)
                cable = (
                    "flat-twin-earth-70c"
                    if circuit["conductors"]["insulation"].endswith("70")
                    else "multicore-armoured-90c"
                )
                circuit["installation"] = {"cable": cable, "installation_method": "C"}
            circuit["device"].pop("rating_a", None)
            circuit["conductors"].pop("line_csa_mm2", None)
            circuit["conductors"].pop("cpc_csa_mm2", None)
    return out


def design_rows() -> list[tuple[str, str, str, str, str]]:
    """The design of the bench's installation with every size left out, against the check of what it designed."""
    from service.contract.design_schemas import designed
    from service.contract.installation_schemas import InstallationRequestSchema, installation_of
    from service.electrical.network.installation import check_installation

    body = left_out(installation())
    answer = designed(body)  # warm
    inst, _ = installation_of(InstallationRequestSchema().load(answer["installation"]))
    designs, checks = [], []
    for _ in range(RUNS):
        start = time.perf_counter()
        answer = designed(body)
        designs.append(time.perf_counter() - start)
        start = time.perf_counter()
        check_installation(inst)
        checks.append(time.perf_counter() - start)
    design_s, check_s = statistics.median(designs), statistics.median(checks)
    n = sum(len(b["circuits"]) for b in body["boards"])
    summary = answer["checked"]["summary"]
    return [
        (
            f"design of {len(body['boards'])} boards and {n:,} circuits, every size left out, in process",
            f"{design_s * 1000:,.0f} ms, {summary['fail']:,} of {n:,} fail",
            f"the check of the design {check_s * 1000:,.0f} ms",
            f"{design_s / check_s:.1f}x",
            "<= 3x",
        )
    ]


if __name__ == "__main__":
    for cells in report_rows() + design_rows():
        print(" | ".join(cells))
