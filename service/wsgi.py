"""The WSGI entry point gunicorn loads: one app per worker, configured from the environment."""

from service.app import create_app

app = create_app()
