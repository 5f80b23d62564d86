import pytest

from service.app import create_app
from service.settings import Settings


@pytest.fixture(scope="session")
def app():
    return create_app({"SETTINGS": Settings(batch_limit=50, max_body_bytes=2 * 1024 * 1024)})


@pytest.fixture()
def client(app):
    return app.test_client()
