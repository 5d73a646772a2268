"""Shared fixtures: a real PostgreSQL server for the hub's tests (Debian package ``postgresql``).

The server is started once per test session (``initdb`` into a temporary folder, ``pg_ctl`` on
a free loopback port) and stopped at the end; each test gets a database of its own. Without the
server programs the PostgreSQL tests are skipped on a developer's machine, and fail under CI
(``CI=true``), whose test command installs the package.

Browser tests (those that take the ``browser`` fixture) run again, twice at most, when they
fail, as the configuration that playwright's own test runner generates does on CI (two
retries). On this 2-core machine headless chromium's software renderer (SwiftShader) has been seen
to go silent for minutes on a screen it had just drawn (a screenshot timed out), and once to
leave the column pane of a tablet blank while the list beside it was drawn; a fresh page drew
both at once. A test held past ``BROWSER_TIMEOUT`` fails (pytest-timeout) and runs again the
same way. A real fault fails all three runs; every rerun is listed at the end of the run
("RERUN ...", ``-rR``) with the error that made it run again and the test line it was at
("why tests ran again": for a timeout, where the test was held), so it
can be looked into. A rerun finds the app's store as the first attempt did: the module's app
server starts again on a fresh store (``_browser.Served``). Each test's pages are closed after it, so a
silent renderer does not spin on through the tests after it.
"""

from __future__ import annotations

import itertools
import os

import pytest

_names = itertools.count(1)

BROWSER_TIMEOUT = 420  # s; the longest browser test takes about a minute and a half


def pytest_collection_modifyitems(items):
    for item in items:
        if "browser" in getattr(item, "fixturenames", ()):
            item.add_marker(pytest.mark.timeout(BROWSER_TIMEOUT))
            item.add_marker(pytest.mark.flaky(reruns=2))


#: (test, the error lines of the failed attempt) of every rerun in this session
_reruns: list[tuple[str, str]] = []


def _where(text: str) -> str:
    """The last line of a test module the failure passed through: where a hung test was held
    (a timeout's own message says only how long)."""
    import re

    spots = re.findall(r"^(tests/[\w/]+\.py):(\d+)", text, re.M)
    return f" (at {spots[-1][0]}:{spots[-1][1]})" if spots else ""


def pytest_runtest_logreport(report):
    if report.outcome == "rerun":
        text = getattr(report, "longreprtext", "") or ""
        errors = [ln[1:].strip() for ln in text.splitlines() if ln.startswith("E ")]
        why = " | ".join(errors[:3])[:400] or text[-400:]
        _reruns.append((report.nodeid, why + _where(text)))


def pytest_terminal_summary(terminalreporter):
    if _reruns:
        terminalreporter.section("why tests ran again")
        for nodeid, why in _reruns:
            terminalreporter.write_line(f"{nodeid}: {why}")


@pytest.fixture(autouse=True)
def _close_pages(request):
    """A browser test's pages closed after it, even one that failed half way."""
    yield
    if "browser" in request.fixturenames:
        for context in list(request.getfixturevalue("browser").contexts):
            context.close()


@pytest.fixture(scope="session")
def pg_server():
    from fieldcol.sync._pgserver import TempPostgres, server_programs

    if server_programs() is None:
        why = ("PostgreSQL server programs not found (/usr/lib/postgresql/*/bin): "
               "apt-get install -y postgresql")
        if os.environ.get("CI", "").lower() in ("true", "1", "yes"):
            pytest.fail(why)
        pytest.skip(why)
    pg = TempPostgres()
    yield pg
    pg.close()


@pytest.fixture
def pg_database(pg_server) -> str:
    """The address of a new, empty database on the session's server."""
    return pg_server.create(f"t{os.getpid()}_{next(_names)}")


@pytest.fixture(scope="session")
def demo_report_pdf(tmp_path_factory):
    """The demo site's report as the CLI writes it (dated 2026-03-10), made once for every
    test that reads it back page by page."""
    from fieldcol.demo import SITE_NAME, build_demo
    from fieldcol.report import site_report
    from fieldcol.store import Store

    root = tmp_path_factory.mktemp("demo-report")
    with Store(root / "demo.db") as store:
        build_demo(store)
        return site_report(store, store.site_by_name(SITE_NAME).id, root / "demo.pdf",
                           report_date="2026-03-10")
