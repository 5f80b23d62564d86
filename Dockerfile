# Faultpath service image: build the wheel in one stage, run it on a slim base with no compilers.
FROM python:3.11-slim-bookworm AS build
WORKDIR /src
COPY pyproject.toml constraints.txt README.md ./
COPY service ./service
RUN python -m pip install --no-cache-dir --upgrade "pip==26.0.1" \
 && python -m pip wheel --no-cache-dir --wheel-dir /wheels -c constraints.txt .

FROM python:3.11-slim-bookworm
ENV PYTHONDONTWRITEBYTECODE=1 \
    PYTHONUNBUFFERED=1 \
    FAULTPATH_BIND=0.0.0.0 \
    FAULTPATH_PORT=8000 \
    PROMETHEUS_MULTIPROC_DIR=/tmp/metrics
WORKDIR /app
COPY --from=build /wheels /wheels
COPY constraints.txt ./
RUN python -m pip install --no-cache-dir --no-index --find-links /wheels -c constraints.txt faultpath \
 && rm -rf /wheels
COPY deploy/gunicorn.conf.py ./deploy/gunicorn.conf.py
USER 10001:10001
EXPOSE 8000
HEALTHCHECK --interval=30s --timeout=3s --start-period=10s --retries=3 \
  CMD ["python", "-c", "import os,sys,urllib.request; port = os.environ.get('FAULTPATH_PORT', '8000'); sys.exit(0 if urllib.request.urlopen(f'http://127.0.0.1:{port}/healthz', timeout=2).status == 200 else 1)"]
CMD ["python", "-m", "gunicorn", "-c", "/app/deploy/gunicorn.conf.py"]
