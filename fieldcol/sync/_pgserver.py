"""A real PostgreSQL server of our own in a temporary folder (tests and the bench use it).

``initdb`` into a temporary folder and ``pg_ctl`` on a free loopback port, stopped and removed
at the end. The server programs come from Debian's ``postgresql`` package
(``/usr/lib/postgresql/<version>/bin``, or ``$FIELDCOL_PG_BIN``). PostgreSQL refuses to run
as root, so as root the programs run as the ``postgres`` user and the folder is theirs.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import tempfile
import time
from pathlib import Path

from fieldcol.sync._loopback import free_port

USER = "fieldcol"


def server_programs() -> Path | None:
    """The folder holding ``initdb``, ``pg_ctl`` and ``postgres`` (newest version), or None.

    Example:
        >>> p = server_programs(); p is None or (p / "pg_ctl").is_file()
        True
    """
    env = os.environ.get("FIELDCOL_PG_BIN")
    found = [Path(env)] if env else sorted(
        Path("/usr/lib/postgresql").glob("*/bin"),
        key=lambda p: int(p.parent.name) if p.parent.name.isdigit() else 0, reverse=True)
    for d in found:
        if all((d / n).is_file() for n in ("initdb", "pg_ctl", "postgres")):
            return d
    return None


class TempPostgres:
    """A PostgreSQL server on 127.0.0.1 in a temporary folder: ``url(db)``, ``create(db)``,
    ``stop()``, ``start()`` (again, same data), ``close()`` (stop and remove).

    Args:
        durable: keep fsync on (the bench); tests turn it off for speed (a killed process,
            not a lost machine, is what they check).

    Example: ``pg = TempPostgres(); url = pg.create("hub1"); ...; pg.close()``.
    """

    def __init__(self, *, durable: bool = False):
        bindir = server_programs()
        if bindir is None:
            raise RuntimeError("PostgreSQL server programs not found: install the Debian "
                               "package `postgresql` (apt-get install -y postgresql)")
        self.bin = bindir
        self.root = Path(tempfile.mkdtemp(prefix="fieldcol-pg-"))
        self.data = self.root / "data"
        self.log = self.root / "server.log"
        self.port = free_port()
        self.durable = durable
        self._as: list[str] = []
        if os.geteuid() == 0:
            self._as = ["runuser", "-u", "postgres", "--"]
            shutil.chown(self.root, "postgres", "postgres")
        os.chmod(self.root, 0o700)
        self._run("initdb", "-D", str(self.data), "-A", "trust", "-U", USER, "-E", "UTF8",
                  "--no-sync", "--no-instructions")
        self.running = False
        self.start()

    def _run(self, prog: str, *args: str) -> None:
        cmd = [*self._as, str(self.bin / prog), *args]
        r = subprocess.run(cmd, capture_output=True, text=True, timeout=120)
        if r.returncode != 0:
            log = self.log.read_text(errors="replace")[-2000:] if self.log.is_file() else ""
            raise RuntimeError(f"{prog} failed: {r.stderr.strip()} {log}")

    def start(self) -> None:
        """Start the server (again) on its port and wait until it takes connections."""
        opts = (f"-p {self.port} -k {self.root} -c listen_addresses=127.0.0.1 "
                f"-c max_connections=200 -c fsync={'on' if self.durable else 'off'}")
        self._run("pg_ctl", "-D", str(self.data), "-o", opts, "-l", str(self.log), "-w",
                  "-t", "60", "start")
        self.running = True

    def stop(self) -> None:
        """Stop the server (fast: open sessions are cut), keeping its data."""
        if self.running:
            self._run("pg_ctl", "-D", str(self.data), "-m", "fast", "-w", "stop")
            self.running = False

    def url(self, db: str = "postgres") -> str:
        """The address of database ``db`` on this server."""
        return f"postgresql://{USER}@127.0.0.1:{self.port}/{db}"

    def create(self, db: str) -> str:
        """Make an empty database; returns its address."""
        import psycopg

        with psycopg.connect(self.url(), autocommit=True) as c:
            c.execute(f'CREATE DATABASE "{db}"')
        return self.url(db)

    def close(self) -> None:
        """Stop the server and remove its folder."""
        try:
            self.stop()
        finally:
            deadline = time.monotonic() + 10
            while True:
                try:
                    shutil.rmtree(self.root)
                    break
                except OSError:
                    if time.monotonic() > deadline:
                        break
                    time.sleep(0.2)
