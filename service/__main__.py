"""`python -m service serve | openapi [FILE] | check FILE`."""

from __future__ import annotations

import argparse
import json
import os
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def serve(_args) -> int:
    """Run gunicorn with deploy/gunicorn.conf.py on the embedded defaults (127.0.0.1:8000)."""
    if not os.environ.get("PROMETHEUS_MULTIPROC_DIR"):
        os.environ["PROMETHEUS_MULTIPROC_DIR"] = tempfile.mkdtemp(prefix="faultpath-metrics-")
    conf = ROOT / "deploy" / "gunicorn.conf.py"
    os.execvp(sys.executable, [sys.executable, "-m", "gunicorn", "-c", str(conf)])
    return 0  # not reached


def openapi(args) -> int:
    """Write the OpenAPI document generated from the code (to FILE, or standard output)."""
    from service.app import create_app, spec_dict
    from service.settings import Settings

    app = create_app({"SETTINGS": Settings()})
    with app.app_context():
        text = json.dumps(spec_dict(app.extensions["faultpath_api"]), indent=2, ensure_ascii=False) + "\n"
    if args.file:
        Path(args.file).write_text(text, encoding="utf-8")
    else:
        sys.stdout.write(text)
    return 0


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(
        prog="python -m service", description="Faultpath: earth fault checks to BS 7671 / IEC 60364"
    )
    sub = parser.add_subparsers(dest="command", required=True)
    sub.add_parser("serve", help="run the HTTP service (gunicorn) on its environment settings").set_defaults(func=serve)
    p = sub.add_parser("openapi", help="write the OpenAPI contract generated from the code")
    p.add_argument("file", nargs="?", help="where to write it (default: standard output)")
    p.set_defaults(func=openapi)
    from service.cli import design
    from service.cli.schedule import add_parser

    add_parser(sub)
    design.add_parser(sub)
    args = parser.parse_args(argv)
    if args.command in (
        "check",
        "design",
    ):  # the runtime policy, set once, as a worker sets it (service/serving/runtime.py)
        from service.serving import runtime

        runtime.apply()
    return args.func(args)


if __name__ == "__main__":
    raise SystemExit(main())
