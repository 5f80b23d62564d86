"""The printable report of an installation: every board and circuit in it, pictures inline, nothing fetched."""

import copy
import json
import re

import pytest

from service.contract.installation_schemas import InstallationRequestSchema, installation_of, problem_messages
from service.electrical.network.installation import check_installation
from service.report import report_html
from tests.paths import EXAMPLES

DEMO = json.loads((EXAMPLES / "installations-check.json").read_text())


def rendered(body):
    inst, problems = installation_of(InstallationRequestSchema().load(copy.deepcopy(body)))
    return report_html(inst, check_installation(inst), problem_messages(problems), job=body.get("job"))


@pytest.fixture(scope="module")
def html():
    return rendered(DEMO)


def test_every_board_and_circuit_is_in_the_report(html):
    assert re.findall(r'<section class="board" id="board-([^"]+)"', html) == ["MAIN", "WORKSHOP", "OFFICE"]
    ids = re.findall(r'<tr class="circuit" data-circuit="([^"]*)"', html)
    assert ids == [c["id"] for b in DEMO["boards"] for c in b["circuits"]]


def test_the_pictures_are_inline_and_nothing_is_fetched(html):
    # one coordination picture per pair of devices on a board: three on MAIN, three on WORKSHOP, two on OFFICE
    assert html.count("<svg") == 8 and html.count("<figure>") == 8
    assert not re.search(r'(src|href)="(https?:)?//', html) and "@page" in html and "@import" not in html


def test_the_figures_and_verdicts_read_as_the_answer_does(html):
    assert "Board WORKSHOP" in html and "0.2883 ohm" in html and "3.897 kA" in html
    assert "none" in html and "reported, not in the verdict" in html
    assert 'class="v fail">fail' in html


def test_the_cover_says_the_job_the_edition_and_the_supply(html):
    cover = html.split('<section class="board"')[0]
    job = DEMO["job"]
    for said in (job["name"], job["address"], job["reference"], job["designer"], job["date"], job["revision"]):
        assert said in cover
    assert "BS 7671:2018+A4:2026" in cover and "Faultpath " in cover and "TN-C-S" in cover
    assert "Supply rated current" in cover and "100 A" in cover and "BS 88-2 gG 125 A" in cover  # the main fuse
    assert "<th>Circuits</th>" in cover and "Demand against what feeds the board at the origin" in cover


def test_the_schedule_says_what_a_designer_records(html):
    header = html.split("<thead>")[1].split("</thead>")[0]
    for column in ("Supplies", "Method, cable", "RCD", "R1+R2", "Largest measured Zs at 20 degC", "Selectivity"):
        assert column in header
    # the yard lights fail on voltage drop, 3 % for lighting (BS 7671 Appendix 4 Table 4Ab): in words, with figures
    assert "Voltage drop: fail (5.99 of 3 %)" in html
    assert "30 mA A" in html  # the bench sockets' RCBO: IΔn and type
    assert not re.search(r"\d\.\d{6,}", html)  # no float noise
    assert "let_through" not in html and "x_over_r" not in html  # field names said in words


def test_each_note_is_said_once_and_referred_to_by_number(html):
    notes = re.findall(r'<li value="(\d+)">([^<]+)</li>', html)
    assert notes and len({text for _, text in notes}) == len(notes)
    assert [int(n) for n, _ in notes] == list(range(1, len(notes) + 1))


def test_a_circuit_that_did_not_validate_is_listed_with_its_problem():
    body = copy.deepcopy(DEMO)
    body["boards"][2]["circuits"][1]["conductors"]["length_m"] = "far"
    page = rendered(body)
    assert "/boards/2/circuits/1/conductors/length_m: must be a number" in page
    assert page.count('class="circuit"') == 8


def test_user_text_is_escaped():
    body = copy.deepcopy(DEMO)
    body["id"] = "<script>alert(1)</script>"
    assert "<script>" not in rendered(body)
