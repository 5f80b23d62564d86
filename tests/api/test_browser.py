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
    assert "greater than or equal to" in browser.find_element(By.ID, "err-ze").text
    assert not browser.find_element(By.ID, "result").is_displayed()
