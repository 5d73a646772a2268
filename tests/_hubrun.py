"""A real office hub on loopback for the sync tests: uvicorn in a thread on a free port."""

from __future__ import annotations

import socket
import threading
import time
from pathlib import Path

import uvicorn

from fieldcol.sync._hubstore import HubStore
from fieldcol.sync.hub import create_app


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class RunningHub:
    """Start with ``RunningHub(folder)``; ``url``, ``hub`` (its HubStore); ``stop()`` ends it."""

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
        return self.hub.add_device(name)

    def stop(self) -> None:
        self.server.should_exit = True
        self.thread.join(timeout=20)
        self.hub.close()
