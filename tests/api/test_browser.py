"""The example quotation form in a real browser: headless Chromium (Debian's chromium and
chromium-driver) driven by selenium. .ci/run installs the browser; the test is skipped, saying why,
only when it is not installed."""

import shutil
import threading

import pytest

from service.app import create_app
from service.settings import Settings

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
DRIVER = shutil.which("chromedriver")
pytestmark = pytest.mark.skipif(
    not (CHROMIUM and DRIVER),
    reason="Debian's chromium and chromium-driver are not installed (apt-get install chromium chromium-driver)",
)


@pytest.fixture(scope="module")
def base_url():
    from werkzeug.serving import make_server

    server = make_server("127.0.0.1", 0, create_app({"SETTINGS": Settings()}), threaded=True)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    yield f"http://127.0.0.1:{server.server_port}"
    server.shutdown()
    thread.join(timeout=10)


@pytest.fixture(scope="module")
def browser(tmp_path_factory):
    from selenium import webdriver
    from selenium.webdriver.chrome.service import Service

    options = webdriver.ChromeOptions()
    options.binary_location = CHROMIUM
    for flag in (
        "--headless=new",
        "--no-sandbox",
        "--disable-gpu",
        "--disable-background-networking",
        "--disable-component-update",
        "--no-first-run",
        "--disable-sync",
        "--window-size=1100,2200",
        f"--user-data-dir={tmp_path_factory.mktemp('chromium-profile')}",
    ):
        options.add_argument(flag)
    driver = webdriver.Chrome(service=Service(executable_path=DRIVER), options=options)
    yield driver
    driver.quit()


def wait_for(driver, condition, seconds=30):
    from selenium.webdriver.support.ui import WebDriverWait

    return WebDriverWait(driver, seconds).until(condition)


def test_the_form_sizes_checks_and_draws(browser, base_url, tmp_path):
    from selenium.webdriver.common.by import By

    browser.get(base_url + "/example/quote-form/")
    assert browser.find_element(By.CSS_SELECTOR, "label[for=ze]").text.startswith("Ze")
    browser.find_element(By.ID, "submit").click()
    wait_for(browser, lambda d: d.find_element(By.ID, "result").is_displayed())
    verdict = browser.find_element(By.ID, "verdict").text
    assert verdict == "Verdict: pass", verdict
    assert "25 A" in browser.find_element(By.ID, "price-device").text  # 24 A of sockets: the next rating
    assert browser.find_element(By.ID, "price-cable").text.startswith("4 mm² line, 1.5 mm² cpc")
    assert "411.4.4" in browser.find_element(By.ID, "checks").text
    wait_for(
        browser,
        lambda d: d.execute_script(
            "const i = document.getElementById('picture'); return i.complete && i.naturalWidth > 0;"
        ),
    )
    assert browser.find_element(By.ID, "cautions").text
    shot = tmp_path / "quote-form.png"
    browser.save_screenshot(str(shot))
    assert shot.stat().st_size > 10_000


def test_the_form_shows_api_errors_next_to_their_fields(browser, base_url):
    from selenium.webdriver.common.by import By

    browser.get(base_url + "/example/quote-form/")
    ze = browser.find_element(By.ID, "ze")
    ze.clear()
    ze.send_keys("-1")
    browser.find_element(By.ID, "submit").click()
    wait_for(browser, lambda d: d.find_element(By.ID, "err-ze").text != "")
    assert ze.get_attribute("aria-invalid") == "true"
    assert "must be from" in browser.find_element(By.ID, "err-ze").text
    assert not browser.find_element(By.ID, "result").is_displayed()


def three_level_estate() -> bytes:
    """An invented three-phase estate of three levels: a main board, two distribution boards, four sub-boards."""
    import json

    from bench.payload import installation

    body = installation(n_circuits=40, groups=2, per_group=2, seed=3)
    body["job"] = {"name": "Quarry Road estate (invented)", "designer": "T. Ibsen (invented)", "revision": "C"}
    return json.dumps(body).encode()


@pytest.mark.parametrize("which", ["example", "three-level estate"])
def test_the_installation_report_prints_to_pdf_with_every_circuit(base_url, tmp_path, which):
    """POST /v1/installations/report, printed by the headless browser (--print-to-pdf) to A4 landscape, read back
    with pypdf: the cover's figures, the edition, every board and circuit, and the notes."""
    import json
    import re
    import subprocess
    import unicodedata
    import urllib.request

    from pypdf import PdfReader

    from tests.paths import EXAMPLES

    body = (EXAMPLES / "installations-check.json").read_bytes() if which == "example" else three_level_estate()
    request = urllib.request.Request(
        f"{base_url}/v1/installations/report", data=body, headers={"Content-Type": "application/json"}
    )
    with urllib.request.urlopen(request, timeout=60) as response:
        assert response.headers.get_content_type() == "text/html"
        page = tmp_path / "report.html"
        page.write_bytes(response.read())
    pdf = tmp_path / "report.pdf"
    subprocess.run(
        [CHROMIUM, "--headless=new", "--no-sandbox", "--disable-gpu", "--no-pdf-header-footer",
         f"--user-data-dir={tmp_path / 'profile'}", f"--print-to-pdf={pdf}", page.as_uri()],
        capture_output=True, timeout=120, check=True,
    )  # fmt: skip
    reader = PdfReader(pdf)  # text without the printer's ligatures (ffi, fi) below
    text = re.sub(r"\s+", " ", unicodedata.normalize("NFKC", " ".join(p.extract_text() for p in reader.pages)))
    sent = json.loads(body)
    width, height = reader.pages[0].mediabox.width, reader.pages[0].mediabox.height
    assert width > height  # A4 landscape
    assert len(reader.pages) >= 2 + len(sent["boards"])  # the cover, each board from a new page, the notes
    assert "BS 7671:2018+A4:2026" in text and sent["job"]["name"] in text and sent["job"]["revision"] in text
    assert "Largest fault at the origin" in text and "Supply rated current" in text and "Notes" in text
    for board in sent["boards"]:
        assert f"Board {board['id']}" in text
        for circuit in board["circuits"]:
            assert circuit["id"] in text, circuit["id"]
