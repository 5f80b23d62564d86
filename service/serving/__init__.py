"""How the service runs: the gunicorn worker class and access log (``worker``), the single checks served
together (``coalescer``) and the process's runtime policy set once at worker start (``runtime``).

Built on gunicorn's threaded worker (``gunicorn.workers.gthread.ThreadWorker``: its ``accept``,
``nr_conns`` and ``wait_for_and_dispatch_events``) and Python's ``gc``; the pins in pyproject.toml and
constraints.txt hold gunicorn to the releases these were written and measured against.
"""
