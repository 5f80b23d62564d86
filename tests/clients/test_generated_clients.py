"""Clients generated from the committed contract, run against a live service (gunicorn, API key required).

Python: openapi-python-client (the test extra). TypeScript: openapi-typescript with openapi-fetch, type-checked
by tsc and run by tsx, installed with Debian's npm (.ci/run installs nodejs and npm); skipped, saying why, only
where npm or the npm registry is not there. The demo scripts beside this file are what the README shows.
"""

import json
import os
import re
import shutil
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pytest

from tests.paths import CONTRACT, EXAMPLES, ROOT

HERE = Path(__file__).parent
KEY = "client-test-key"
BIN = Path(sys.executable).parent
NPM_PACKAGES = [
    "openapi-typescript@7.13.0",
    "openapi-fetch@0.17.0",
    "tsx@4.23.15",
    "typescript@5.9.3",
    "@types/node@20",
]
EXPECTED = [
    "check: larkspur-oven pass Zs 0.5066 ohm",
    "batch: 2 invalid /circuits/2/device/rating_a",
    "size: 25",
    "problem: 422 /supply/u0_v must be from 50 to 1000",
]


@pytest.fixture(scope="module")
def live(tmp_path_factory):
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        port = s.getsockname()[1]
    env = dict(
        os.environ,
        FAULTPATH_PORT=str(port),
        FAULTPATH_WORKERS="2",
        FAULTPATH_API_KEYS=KEY,
        FAULTPATH_REQUIRE_KEYS="on",
        FAULTPATH_RATE_LIMIT="",
        PROMETHEUS_MULTIPROC_DIR=str(tmp_path_factory.mktemp("metrics")),
    )
    conf = ROOT / "deploy" / "gunicorn.conf.py"
    command = [sys.executable, "-m", "gunicorn", "-c", str(conf), "--access-logfile", os.devnull, "service.wsgi:app"]
    server = subprocess.Popen(command, cwd=ROOT, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    url = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + 30
    while time.monotonic() < deadline:
        try:
            urllib.request.urlopen(f"{url}/healthz", timeout=1)
            break
        except OSError:
            time.sleep(0.2)
    yield url
    server.terminate()
    server.wait(timeout=30)


def demo_env(url: str, **extra) -> dict:
    return dict(os.environ, FAULTPATH_URL=url, FAULTPATH_KEY=KEY, FAULTPATH_EXAMPLES=str(EXAMPLES), **extra)


def said(done: subprocess.CompletedProcess) -> str:
    assert done.returncode == 0, done.stdout + done.stderr
    return done.stdout


def test_the_python_client_has_every_operation_and_runs(live, tmp_path):
    generator = BIN / "openapi-python-client"
    if not generator.exists():
        pytest.skip("openapi-python-client is not installed (the test extra installs it)")
    path = dict(os.environ, PATH=f"{BIN}{os.pathsep}{os.environ['PATH']}")  # it formats with ruff
    generate = [str(generator), "generate", "--path", str(CONTRACT), "--meta", "none"]
    generate += ["--output-path", "faultpath_client"]
    said(subprocess.run(generate, cwd=tmp_path, env=path, capture_output=True, text=True, timeout=300))
    modules = {p.stem for p in (tmp_path / "faultpath_client" / "api").rglob("*.py") if p.stem != "__init__"}
    spec = json.loads(CONTRACT.read_text(encoding="utf-8"))
    ids = [op["operationId"] for ops in spec["paths"].values() for m, op in ops.items() if m in ("get", "post")]
    snake = {re.sub(r"(?<!^)(?=[A-Z])", "_", name).lower() for name in ids}
    assert modules == snake  # no operation skipped
    run = [sys.executable, str(HERE / "python_demo.py")]
    env = demo_env(live, PYTHONPATH=str(tmp_path))
    out = said(subprocess.run(run, cwd=ROOT, env=env, capture_output=True, text=True, timeout=120))
    for line in EXPECTED:
        assert line in out, out


@pytest.fixture(scope="module")
def node_project(tmp_path_factory):
    npm = shutil.which("npm")
    if npm is None:
        pytest.skip("npm is not installed (Debian: apt-get install nodejs npm; .ci/run does)")
    folder = tmp_path_factory.mktemp("typescript")
    install = [npm, "install", "--no-audit", "--no-fund", "--silent", *NPM_PACKAGES]
    done = subprocess.run(install, cwd=folder, capture_output=True, text=True, timeout=600)
    if done.returncode != 0:
        pytest.skip(f"the npm registry could not be reached: {done.stderr.strip()[:200]}")
    return folder


def test_the_typescript_types_check_and_the_client_runs(live, node_project):
    npx = shutil.which("npx")
    folder = node_project
    types = [npx, "openapi-typescript", str(CONTRACT), "-o", "faultpath.d.ts", "--default-non-nullable", "false"]
    said(subprocess.run(types, cwd=folder, capture_output=True, text=True, timeout=120))
    shutil.copy(HERE / "typescript_demo.ts", folder / "typescript_demo.ts")
    (folder / "tsconfig.json").write_text(
        '{"compilerOptions": {"strict": true, "noEmit": true, "module": "nodenext", "moduleResolution": "nodenext",'
        ' "target": "es2022", "types": ["node"], "skipLibCheck": true}, "files": ["typescript_demo.ts"]}'
    )
    said(subprocess.run([npx, "tsc", "-p", "tsconfig.json"], cwd=folder, capture_output=True, text=True, timeout=300))
    run = [npx, "tsx", "typescript_demo.ts"]
    out = said(subprocess.run(run, cwd=folder, env=demo_env(live), capture_output=True, text=True, timeout=120))
    for line in EXPECTED:
        assert line in out, out
