"""Running the service under gunicorn: a JSON-lines access log and the metrics folder."""

from __future__ import annotations

import datetime
import json

from gunicorn.glogging import Logger


class JsonLinesLogger(Logger):
    """gunicorn's logger, writing one JSON object per request to the access log.

    Only these fields are written: no request headers, so API keys never reach a log.
    """

    def access(self, resp, req, environ, request_time):
        if not (self.cfg.accesslog or self.cfg.logconfig or self.cfg.logconfig_dict or self.cfg.syslog):
            return
        headers = dict((k.lower(), v) for k, v in (resp.headers or []))
        record = {
            "time": datetime.datetime.now(datetime.UTC).isoformat(timespec="milliseconds"),
            "request_id": headers.get("x-request-id", ""),
            "method": environ.get("REQUEST_METHOD"),
            "path": environ.get("PATH_INFO"),
            "status": int(str(resp.status).split()[0]) if resp.status else None,
            "bytes": getattr(resp, "sent", None),
            "duration_ms": round(request_time.total_seconds() * 1000, 3),
            "remote": environ.get("REMOTE_ADDR"),
        }
        try:
            self.access_log.info(json.dumps(record))
        except Exception:  # noqa: BLE001 - a log line must never fail a request
            self.exception("could not write the access log line")
