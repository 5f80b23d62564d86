"""Every setting of the service, read from the environment, each with its documented default."""

from __future__ import annotations

import ipaddress
import os
from dataclasses import dataclass, field

# name: (default, meaning) -- DEVELOPERS.md and the README list these
SETTINGS = {
    "FAULTPATH_BIND": ("127.0.0.1", "address to listen on"),
    "FAULTPATH_PORT": ("8000", "port to listen on"),
    "FAULTPATH_WORKERS": ("", "gunicorn worker processes; empty: 2 x CPU count + 1, at most 8"),
    "FAULTPATH_THREADS": ("8", "threads per worker (gthread); 1: sync workers"),
    "FAULTPATH_COALESCE_MS": (
        "2",
        "concurrent single checks in one worker wait this long to be computed together; 0: never wait",
    ),
    "FAULTPATH_TIMEOUT_S": ("60", "seconds one request may take: past it, a 503 (enforced between a request's parts)"),
    "FAULTPATH_MAX_REQUESTS": ("20000", "a worker is replaced after this many requests (with jitter); 0: never"),
    "FAULTPATH_MAX_BODY_BYTES": ("16777216", "largest request body (16 MiB); larger gets 413"),
    "FAULTPATH_BATCH_LIMIT": ("10000", "most circuits in one check-batch request"),
    "FAULTPATH_API_KEYS": ("", "comma-separated API keys accepted in the X-API-Key header"),
    "FAULTPATH_REQUIRE_KEYS": ("auto", "auto: keys required unless bound to loopback; on; off"),
    "FAULTPATH_CORS_ORIGINS": ("", "comma-separated origins allowed to call from a browser"),
    "FAULTPATH_RATE_LIMIT": (
        "1200/minute",
        "requests allowed per API key (or client address without a key); empty: no limit",
    ),
    "FAULTPATH_RATE_LIMIT_STORAGE": (
        "memory://",
        "where the counts live: memory:// counts per worker; redis://host:6379 shares them across workers and replicas",
    ),
    "FAULTPATH_PROXIES": ("0", "how many proxies (load balancer, ingress) stand in front and set X-Forwarded-For"),
    "FAULTPATH_LOG_LEVEL": ("info", "log level"),
    "FAULTPATH_OPEN_PATHS": (
        "probes,metrics,docs",
        "what answers without a key where keys are required: probes (/healthz, /readyz), metrics (/metrics), docs "
        "(/docs, /openapi.json, the example form); remove metrics or docs to close them",
    ),
    "FAULTPATH_KEY_FAILURES": ("10/minute", "wrong keys a client may send before its requests wait (429)"),
    "PROMETHEUS_MULTIPROC_DIR": ("", "folder shared by gunicorn workers for metrics; set by `serve`"),
}


def env(name: str) -> str:
    return os.environ.get(name, SETTINGS[name][0])


def is_loopback(address: str) -> bool:
    if address in ("localhost", ""):
        return True
    try:
        return ipaddress.ip_address(address.strip("[]")).is_loopback
    except ValueError:
        return False


def _split(value: str) -> tuple[str, ...]:
    return tuple(v.strip() for v in value.split(",") if v.strip())


@dataclass(frozen=True)
class Settings:
    bind: str = "127.0.0.1"
    port: int = 8000
    max_body_bytes: int = 16 * 1024 * 1024
    batch_limit: int = 10_000
    api_keys: tuple[str, ...] = field(default=())
    require_keys: str = "auto"
    cors_origins: tuple[str, ...] = field(default=())
    rate_limit: str = ""
    rate_limit_storage: str = "memory://"
    proxies: int = 0
    coalesce_ms: float = 2.0
    open_paths: tuple[str, ...] = ("probes", "metrics", "docs")
    timeout_s: float = 60.0
    key_failures: str = "10/minute"

    @classmethod
    def from_env(cls) -> Settings:
        return cls(
            bind=env("FAULTPATH_BIND"),
            port=int(env("FAULTPATH_PORT")),
            max_body_bytes=int(env("FAULTPATH_MAX_BODY_BYTES")),
            batch_limit=int(env("FAULTPATH_BATCH_LIMIT")),
            api_keys=_split(env("FAULTPATH_API_KEYS")),
            require_keys=env("FAULTPATH_REQUIRE_KEYS").lower(),
            cors_origins=_split(env("FAULTPATH_CORS_ORIGINS")),
            rate_limit=env("FAULTPATH_RATE_LIMIT"),
            rate_limit_storage=env("FAULTPATH_RATE_LIMIT_STORAGE"),
            proxies=int(env("FAULTPATH_PROXIES")),
            coalesce_ms=float(env("FAULTPATH_COALESCE_MS")),
            open_paths=_split(env("FAULTPATH_OPEN_PATHS")),
            key_failures=env("FAULTPATH_KEY_FAILURES"),
            timeout_s=float(env("FAULTPATH_TIMEOUT_S")),
        )

    @property
    def keys_required(self) -> bool:
        if self.require_keys not in ("auto", "on", "off"):
            raise ValueError("FAULTPATH_REQUIRE_KEYS is auto, on or off")
        if self.require_keys == "auto":
            return not is_loopback(self.bind)
        return self.require_keys == "on"
