"""The floor for the single-check figure: a bare Flask JSON endpoint under the same gunicorn settings."""

import flask

app = flask.Flask("bare")


@app.get("/ping")
def ping():
    return {"ok": True}


@app.post("/echo")
def echo():
    body = flask.request.get_json()
    return {"keys": sorted(body)}
