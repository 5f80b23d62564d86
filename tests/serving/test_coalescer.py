"""Concurrent single checks computed together: each request gets exactly its own answer."""

import json
import threading

import pytest

from service.contract.circuit_schemas import CheckRequestSchema
from service.electrical.pipeline import check_circuit
from service.serving.coalescer import Coalescer
from tests.paths import EXAMPLES

BODY = CheckRequestSchema().load(json.loads((EXAMPLES / "circuits-check.json").read_text()))


def lengths(n):
    import dataclasses

    circuit = BODY["circuit"]
    return [
        dataclasses.replace(circuit, conductors=dataclasses.replace(circuit.conductors, length_m=5 + i))
        for i in range(n)
    ]


def test_concurrent_checks_are_gathered_and_each_gets_its_own_result():
    coalescer = Coalescer(window_s=0.05)
    circuits = lengths(12)
    answers = [None] * len(circuits)
    start = threading.Barrier(len(circuits))

    def ask(i):
        start.wait()
        answers[i] = coalescer.check(BODY["supply"], circuits[i], None)

    threads = [threading.Thread(target=ask, args=(i,)) for i in range(len(circuits))]
    for t in threads:
        t.start()
    for t in threads:
        t.join(timeout=30)
    assert coalescer.batches >= 1
    for circuit, answer in zip(circuits, answers, strict=True):
        assert answer == check_circuit(BODY["supply"], circuit)


def test_a_check_alone_is_not_kept_waiting_and_errors_reach_the_caller(monkeypatch):
    import time

    coalescer = Coalescer(window_s=5.0)
    started = time.perf_counter()
    coalescer.check(BODY["supply"], BODY["circuit"], ["max-zs"])
    assert time.perf_counter() - started < 2.0

    from service.serving import coalescer as coalesce

    def explode(*args, **kwargs):
        raise RuntimeError("boom")

    monkeypatch.setattr(coalesce, "check_circuits", explode)
    with pytest.raises(RuntimeError):
        coalescer.check(BODY["supply"], BODY["circuit"], None)
    assert coalescer.in_flight == 0


def test_each_run_is_counted_with_its_circuits_and_the_cores_cpu_time():
    from service.api import metrics

    def counted():
        sample = {s.name: s.value for m in metrics.SINGLE_RUN.collect() for s in m.samples if "bucket" not in s.name}
        cpu = [s.value for m in metrics.SINGLE_RUN_CPU.collect() for s in m.samples if s.name.endswith("_total")]
        return (
            sample["faultpath_single_check_run_circuits_count"],
            sample["faultpath_single_check_run_circuits_sum"],
            cpu[0],
        )

    runs, circuits, cpu = counted()
    Coalescer(window_s=0.0, counted=metrics.count_single_run).check(BODY["supply"], BODY["circuit"], None)
    after = counted()
    assert after[0] == runs + 1 and after[1] == circuits + 1 and after[2] > cpu
