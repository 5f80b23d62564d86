"""The WSGI entry point gunicorn loads: one app per worker, configured from the environment."""

from .app import create_app

app = create_app()
