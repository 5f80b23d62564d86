"""gunicorn settings for Faultpath. Every value comes from an environment variable with a default
(service/settings.py lists them); `python -m service serve` uses this file."""

import multiprocessing
import os

from service.settings import env

bind = f"{env('FAULTPATH_BIND')}:{env('FAULTPATH_PORT')}"
if ":" in env("FAULTPATH_BIND") and not env("FAULTPATH_BIND").startswith("["):
    bind = f"[{env('FAULTPATH_BIND')}]:{env('FAULTPATH_PORT')}"
workers = int(env("FAULTPATH_WORKERS") or min(8, 2 * multiprocessing.cpu_count() + 1))
threads = int(env("FAULTPATH_THREADS"))
# threads let concurrent single checks be computed together; a worker leaves connections beyond its threads to a sibling
worker_class = "service.serving.worker.BalancedThreadWorker" if threads > 1 else "sync"
timeout = int(env("FAULTPATH_TIMEOUT_S"))
# the connections one worker holds at once (gunicorn's own bound; the request's own deadline is api/deadline.py): what
# the server alone can bound; how long a client takes to send its request it cannot (publish behind deploy/nginx.conf)
worker_connections = 128
graceful_timeout = 30
keepalive = 5
max_requests = int(env("FAULTPATH_MAX_REQUESTS"))
max_requests_jitter = max_requests // 10
limit_request_line = 8190
limit_request_fields = 100
accesslog = "-"
errorlog = "-"
loglevel = env("FAULTPATH_LOG_LEVEL")
logger_class = "service.serving.worker.JsonLinesLogger"
wsgi_app = "service.wsgi:app"
proc_name = "faultpath"


def on_starting(server):
    # the multiprocess metrics folder must be empty when the master starts
    folder = os.environ.get("PROMETHEUS_MULTIPROC_DIR")
    if folder:
        os.makedirs(folder, exist_ok=True)
        for name in os.listdir(folder):
            if name.endswith(".db"):
                os.remove(os.path.join(folder, name))


def post_worker_init(worker):
    # matplotlib is imported once per worker before it takes traffic, so the first picture is quick; then the
    # runtime policy is set once (service/runtime.py): what start-up made is frozen out of the collector's sight
    from service.serving import runtime
    from service.picture import warm

    warm()
    runtime.apply()


def child_exit(server, worker):
    if os.environ.get("PROMETHEUS_MULTIPROC_DIR"):
        from prometheus_client import multiprocess

        multiprocess.mark_process_dead(worker.pid)


# no control socket (a read-only root filesystem has nowhere to put it), and no version in the Server header
control_socket_disable = True
import gunicorn.http.wsgi  # noqa: E402

gunicorn.http.wsgi.SERVER = "faultpath"
