# Shared by bench.sh and reliability.sh: Debian's wrk and nginx (load generator and load balancer),
# installed when missing and this machine allows it. Sourced, not run.
if ! command -v wrk >/dev/null 2>&1 || ! command -v nginx >/dev/null 2>&1; then
  if command -v apt-get >/dev/null 2>&1 && [ "$(id -u)" = "0" ]; then
    (apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq wrk nginx-light) >/dev/null 2>&1 \
      || echo "could not install wrk and nginx: the figures that need them are skipped" >&2
  else
    echo "wrk and nginx are not installed (apt-get install wrk nginx-light): the figures that need them are skipped" >&2
  fi
fi
