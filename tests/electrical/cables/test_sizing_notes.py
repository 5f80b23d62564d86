"""What a sizing answer says beside its sizes (common practice: a check no size can show is said, not ruled on)."""

from service.electrical.cables.sizing_notes import arrangement_cautions, never_shown
from service.electrical.results.circuit_result import Check


class _Result:
    def __init__(self, verdicts):
        self.checks = [Check(n, v, None, None, "", "", None) for n, v in verdicts.items()]

    def check(self, name):
        return next((c for c in self.checks if c.check == name), None)


def test_a_check_not_verified_for_every_size_is_lenient():
    outcomes = [_Result({"max-zs": "not-verified", "rcd": "pass"}), _Result({"max-zs": "not-verified", "rcd": "fail"})]
    assert never_shown(outcomes, ["max-zs", "rcd"]) == frozenset({"max-zs"})


def test_parallel_cables_and_armour_are_said():
    said = arrangement_cautions(2, "armour")
    assert len(said) == 2 and "523.7" in said[0]
