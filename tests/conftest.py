"""Shared fixtures: a real PostgreSQL server for the hub's tests (Debian package ``postgresql``).

The server is started once per test session (``initdb`` into a temporary folder, ``pg_ctl`` on
a free loopback port) and stopped at the end; each test gets a database of its own. Without the
server programs the PostgreSQL tests are skipped on a developer's machine, and fail under CI
(``CI=true``), whose test command installs the package.
"""

from __future__ import annotations

import itertools
import os

import pytest

_names = itertools.count(1)


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
