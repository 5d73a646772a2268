"""A real office hub on loopback, in a thread on a free port (tests and the bench use it)."""

from __future__ import annotations

import socket
import threading
import time
from pathlib import Path

import uvicorn

from fieldcol.sync._hubstore import HubStore
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
    """A hub serving ``folder`` on 127.0.0.1: ``url``, ``hub`` (its HubStore), ``token(name)``,
    ``stop()``.

    Example:
        >>> h = RunningHub(Path("hubdata")); h.url.startswith("http://127.0.0.1:")
        True
        >>> h.stop()
    """

    def __init__(self, folder: Path):
        self.folder = folder
        self.hub = HubStore(folder)
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
