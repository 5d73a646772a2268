"""A real office hub on loopback on a free port, in a thread (``RunningHub``) or in a process of
its own (``HubProcess``, ``fieldcol hub serve``); tests and the bench use them."""

from __future__ import annotations

import os
import signal
import socket
import subprocess
import sys
import threading
import time
from pathlib import Path

import uvicorn

from fieldcol.sync._hubapi import open_hub
from fieldcol.sync.hub import create_app


def free_port() -> int:
    """A TCP port free on 127.0.0.1 right now.

    Example:
        >>> 0 < free_port() < 65536
        True
    """
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class RunningHub:
    """A hub serving ``folder`` on 127.0.0.1: ``url``, ``hub`` (its ``HubBackend``),
    ``token(name)``, ``stop()``. With ``database`` the records live in that PostgreSQL database.

    Example:
        >>> h = RunningHub(Path("hubdata")); h.url.startswith("http://127.0.0.1:")
        True
        >>> h.stop()
    """

    def __init__(self, folder: Path, database: str | None = None):
        self.folder = folder
        self.hub = open_hub(folder, database)
        self.port = free_port()
        self.url = f"http://127.0.0.1:{self.port}"
        config = uvicorn.Config(create_app(self.hub), host="127.0.0.1", port=self.port,
                                log_level="error", lifespan="off")
        self.server = uvicorn.Server(config)
        self.thread = threading.Thread(target=self.server.run, daemon=True)
        self.thread.start()
        deadline = time.monotonic() + 20
        while not self.server.started:
            if time.monotonic() > deadline or not self.thread.is_alive():
                raise RuntimeError("the hub did not start")
            time.sleep(0.02)

    def token(self, name: str) -> str:
        """A new device token."""
        return self.hub.add_device(name)

    def stop(self) -> None:
        """Stop serving and close the hub's store."""
        self.server.should_exit = True
        self.thread.join(timeout=20)
        self.hub.close()


class HubProcess:
    """``fieldcol hub serve`` in a process of its own on a free loopback port: ``url``, ``pid``,
    ``kill()`` (SIGKILL, as a crash), ``stop()`` (SIGTERM, then wait).

    Example: ``p = HubProcess(Path("hubdata"), "postgresql://..."); ...; p.stop()``.
    """

    def __init__(self, folder: Path, database: str | None = None):
        self.port = free_port()
        self.url = f"http://127.0.0.1:{self.port}"
        cmd = [sys.executable, "-m", "fieldcol", "hub", "serve", "--data", str(folder),
               "--port", str(self.port)]
        if database:
            cmd += ["--database", database]
        self.log = Path(folder).with_name(Path(folder).name + f"-{self.port}.log")
        Path(folder).parent.mkdir(parents=True, exist_ok=True)
        with open(self.log, "wb") as out:
            self.proc = subprocess.Popen(cmd, stdout=out, stderr=subprocess.STDOUT,
                                         env={**os.environ, "PYTHONUNBUFFERED": "1"})
        self.pid = self.proc.pid
        deadline = time.monotonic() + 60
        while True:
            if self.proc.poll() is not None:
                raise RuntimeError(f"the hub exited ({self.proc.returncode}): "
                                   f"{self.log.read_text(errors='replace')[-1500:]}")
            try:
                with socket.create_connection(("127.0.0.1", self.port), timeout=0.5):
                    break
            except OSError:
                if time.monotonic() > deadline:
                    self.kill()
                    raise RuntimeError("the hub did not start") from None
                time.sleep(0.05)

    def kill(self) -> None:
        """Kill the process outright (no clean-up of its own)."""
        if self.proc.poll() is None:
            self.proc.send_signal(signal.SIGKILL)
        self.proc.wait(timeout=20)

    def stop(self) -> None:
        """Ask the process to stop, then wait for it (killed after 20 s)."""
        if self.proc.poll() is None:
            self.proc.send_signal(signal.SIGTERM)
            try:
                self.proc.wait(timeout=20)
            except subprocess.TimeoutExpired:
                self.kill()
