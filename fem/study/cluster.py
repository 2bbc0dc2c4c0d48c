"""The cluster address of `sweep --scheduler`: parsed, validated and probed up front.

`parse_scheduler` accepts ``tcp://HOST:PORT`` or ``HOST:PORT`` (the Dask scheduler's plain
TCP transport; other schemes need settings a command line cannot carry: ``tls://`` its
certificates, ``inproc://`` the same process, ``ucx://`` its own library) and refuses an
empty or malformed address with exit 2. `probe_scheduler` then opens one TCP connection
with a deadline and waits, within the same deadline, for the greeting a Dask server sends
first on every new connection (an 8-byte frame length, then a small handshake): a port
that accepts and never answers, or a server of another kind (an HTTP server waits for a
request; an SSH server greets with text), is refused naming the address, instead of
hanging or reading a length of exabytes. `connect_client` makes the Dask client under the
same deadline.
"""

from __future__ import annotations

import re
import socket
import struct
import threading
import time
from typing import Any

from fem.errors import CaseError

__all__ = ["parse_scheduler", "probe_scheduler", "connect_client", "SCHEDULER_DEADLINE",
           "MAX_GREETING"]

SCHEDULER_DEADLINE = 20.0   # seconds to connect and be greeted (and again for the client)
MAX_GREETING = 1 << 20      # a Dask handshake is a few hundred bytes; more is not Dask
_OTHER = {"tls": "needs TLS certificates, which the command line cannot pass",
          "inproc": "is a scheduler inside the same process, not a cluster",
          "ucx": "needs the UCX transport library and its settings",
          "ws": "is the websocket transport; give the scheduler's tcp:// address",
          "wss": "is the websocket transport; give the scheduler's tcp:// address"}


def _refuse(address: str, message: str) -> CaseError:
    return CaseError("--scheduler", repr(address), message)


def parse_scheduler(address: str) -> str:
    """``tcp://HOST:PORT`` for a valid address; CaseError (exit 2) otherwise."""
    text = address.strip()
    if not text:
        raise _refuse(address, "is empty; give tcp://HOST:PORT of a running Dask scheduler, "
                               "or leave --scheduler out to run on this machine")
    m = re.fullmatch(r"(?:([A-Za-z][A-Za-z0-9+.-]*)://)?(.+)", text)
    scheme = (m.group(1) or "tcp").lower() if m else ""
    if scheme in _OTHER:
        raise _refuse(address, f"'{scheme}://' {_OTHER[scheme]}; use tcp://HOST:PORT")
    if scheme != "tcp":
        raise _refuse(address, f"'{scheme}://' is not a Dask scheduler address; use "
                               "tcp://HOST:PORT")
    rest = m.group(2)
    hp = re.fullmatch(r"\[([0-9A-Fa-f:.]+)\]:(\d{1,5})|([A-Za-z0-9._-]+):(\d{1,5})", rest)
    if not hp:
        raise _refuse(address, "is not HOST:PORT; use tcp://HOST:PORT, e.g. "
                               "tcp://10.0.0.5:8786")
    host = hp.group(1) or hp.group(3)
    port = int(hp.group(2) or hp.group(4))
    if not 1 <= port <= 65535:
        raise _refuse(address, f"port {port} is outside 1-65535")
    return f"tcp://[{host}]:{port}" if hp.group(1) else f"tcp://{host}:{port}"


def _host_port(address: str) -> tuple[str, int]:
    hostport = address.removeprefix("tcp://")
    host, _, port = hostport.rpartition(":")
    return host.strip("[]"), int(port)


def probe_scheduler(address: str, deadline: float = SCHEDULER_DEADLINE) -> None:
    """Connect and read a Dask greeting within `deadline` seconds, or refuse the address."""
    host, port = _host_port(address)
    end = time.monotonic() + deadline
    try:
        sock = socket.create_connection((host, port), timeout=deadline)
    except TimeoutError:
        raise _refuse(address, f"no connection within {deadline:g} s") from None
    except OSError as exc:
        raise _refuse(address, f"cannot connect ({exc.strerror or exc.__class__.__name__})"
                      ) from None
    try:
        head = _read(sock, 8, end, address)
        (n,) = struct.unpack("<Q", head)
        if not 0 < n <= MAX_GREETING:
            raise _refuse(address, f"answered, but not as a Dask scheduler (its first bytes "
                                   f"{head[:8]!r} are no Dask handshake)")
        _read(sock, n, end, address)
    finally:
        sock.close()


def _read(sock: socket.socket, n: int, end: float, address: str) -> bytes:
    data = b""
    while len(data) < n:
        left = end - time.monotonic()
        if left <= 0:
            break
        sock.settimeout(left)
        try:
            chunk = sock.recv(n - len(data))
        except TimeoutError:
            break
        except OSError as exc:
            raise _refuse(address, f"the connection failed ({exc.__class__.__name__})"
                          ) from None
        if not chunk:
            raise _refuse(address, "closed the connection without a Dask greeting: not a "
                                   "Dask scheduler")
        data += chunk
    if len(data) < n:
        raise _refuse(address, "accepted the connection but sent no Dask greeting within "
                               "the deadline: not a Dask scheduler, or not answering")
    return data


def connect_client(client_class: Any, address: str,
                   deadline: float = SCHEDULER_DEADLINE) -> Any:
    """``client_class(address)`` made in a helper thread and given up after `deadline`
    seconds (the client's own timeout is not always honoured)."""
    box: dict[str, Any] = {}

    def make() -> None:
        try:
            box["client"] = client_class(address, timeout=f"{deadline}s")
        except BaseException as exc:  # handed to the caller's thread
            box["error"] = exc

    t = threading.Thread(target=make, name="shearcheck-dask-connect", daemon=True)
    t.start()
    t.join(deadline + 5.0)
    if "client" in box:
        return box["client"]
    exc = box.get("error")
    why = f"{exc.__class__.__name__}: {exc}" if exc is not None else \
        f"no answer within {deadline:g} s"
    raise _refuse(address, f"the Dask client could not connect ({why})")
