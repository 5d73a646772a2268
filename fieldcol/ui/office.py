"""The office view: the field app served to browsers over the office hub's records.

The hub merges every device's changes into its own store, so the same app, opened on that
store, shows every site from every device; a change made there is the hub's own and reaches
the devices at their next sync. The hub runs it beside its HTTP interface through the callable
``office_runner`` returns (sync never imports ui: ``fieldcol hub serve --office-port`` passes it
in).
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Callable

if TYPE_CHECKING:
    from fieldcol.store import Store


def office_runner(host: str, port: int, *, key: str | None = None,
                  say: Callable[[str], None] = print) -> Callable[["Store"], None]:
    """A callable that serves the app over a store on ``host:port`` until the process ends.

    Beyond loopback every request needs an access key (``key``, or one made up now); the
    addresses ``say`` prints carry it.

    Args:
        host, port: where the office view listens.
        key: the access key (None: none on loopback, a new one beyond).
        say: where the addresses go.

    Returns:
        ``run(store)``, blocking (the hub calls it in a thread of its own).

    Example: ``serve("hubdata", "127.0.0.1", 8765, office=office_runner("127.0.0.1", 8766))``.
    """
    from fieldcol.ui._access import is_loopback, new_key, open_addresses

    if key is None and not is_loopback(host):
        key = new_key()

    def run(store: "Store") -> None:
        from fieldcol.ui.app import run as run_app

        for url in open_addresses(host, port, key):
            say(f"office view: open {url} in a browser")
        run_app(store, host=host, port=port, key=key, office=True)
    return run
