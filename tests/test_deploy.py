"""The container and deploy files: linted and validated offline."""

import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
BIN = Path(sys.executable).parent


def tool(name):
    path = BIN / name
    if path.exists():
        return str(path)
    found = shutil.which(name)
    if not found:
        pytest.fail(f"{name} is not installed: it comes with the test extra")
    return found


def test_dockerfile_lints_clean():
    result = subprocess.run([tool("hadolint"), str(ROOT / "Dockerfile")], capture_output=True, text=True, timeout=120)
    assert result.returncode == 0, result.stdout + result.stderr


def test_dockerfile_final_stage_is_slim_non_root_with_a_healthcheck():
    text = (ROOT / "Dockerfile").read_text()
    final = text.split("\nFROM ")[-1]
    assert final.startswith("python:3.11-slim")
    assert "USER 10001:10001" in final and "HEALTHCHECK" in final
    for compiler in ("gcc", "build-essential", "g++", "apt-get install"):
        assert compiler not in final


def test_kubernetes_manifests_validate_strictly():
    files = sorted(str(p) for p in (ROOT / "deploy" / "kubernetes").glob("*.yaml"))
    assert len(files) == 4
    result = subprocess.run(
        [tool("kubernetes-validate"), "--strict", *files], capture_output=True, text=True, timeout=300
    )
    assert result.returncode == 0, result.stdout + result.stderr


def test_deployment_has_probes_limits_and_a_read_only_root():
    import yaml

    deployment = yaml.safe_load((ROOT / "deploy" / "kubernetes" / "deployment.yaml").read_text())
    container = deployment["spec"]["template"]["spec"]["containers"][0]
    assert container["livenessProbe"]["httpGet"]["path"] == "/healthz"
    assert container["readinessProbe"]["httpGet"]["path"] == "/readyz"
    assert container["resources"]["requests"] and container["resources"]["limits"]
    assert container["securityContext"]["readOnlyRootFilesystem"] is True
    metrics_dir = next(e["value"] for e in container["env"] if e["name"] == "PROMETHEUS_MULTIPROC_DIR")
    mounts = {m["mountPath"] for m in container["volumeMounts"]}
    assert any(metrics_dir.startswith(m) for m in mounts)
    assert deployment["spec"]["template"]["spec"]["volumes"][0]["emptyDir"] is not None


def test_compose_file_parses():
    import yaml

    compose = yaml.safe_load((ROOT / "deploy" / "compose.yaml").read_text())
    assert compose["services"]["faultpath"]["read_only"] is True


def test_compose_publishes_only_the_buffering_proxy_on_loopback_with_memory_limits():
    import yaml

    services = yaml.safe_load((ROOT / "deploy" / "compose.yaml").read_text())["services"]
    assert "ports" not in services["faultpath"] and services["faultpath"]["mem_limit"]
    assert services["proxy"]["ports"] == ["${FAULTPATH_PUBLISH:-127.0.0.1}:8000:8080"]
    conf = (ROOT / "deploy" / "nginx.conf").read_text()
    for directive in ("proxy_request_buffering on", "client_header_timeout", "client_body_timeout", "limit_conn"):
        assert directive in conf
    ingress = yaml.safe_load((ROOT / "deploy" / "kubernetes" / "ingress.yaml").read_text())
    assert ingress["metadata"]["annotations"]["nginx.ingress.kubernetes.io/proxy-request-buffering"] == "on"


def test_the_image_health_check_reads_the_port_setting():
    assert "FAULTPATH_PORT" in (ROOT / "Dockerfile").read_text().split("HEALTHCHECK")[1]
