"""The cluster address of `sweep --scheduler`: validation up front, a deadline honoured.

A local socket that accepts and never answers, and a local HTTP server, stand in for the
hostile addresses; their deadline is a parameter (1.5 s here) so the suite stays fast. The
real Dask scheduler is exercised in tests/test_study_sweep.py (LocalCluster).
"""

from __future__ import annotations

import socket
import threading
import time
from http.server import BaseHTTPRequestHandler, HTTPServer
from pathlib import Path

import pytest

from fem.errors import CaseError
from fem.study.cluster import parse_scheduler, probe_scheduler
from fem.study.sweep import parse_vary, run_sweep

STUB = """
schema = 1
name = "stub"
kind = "beam"
[material]
E = 200000.0
nu = 0.3
thickness = 10.0
[geometry]
shape = "rectangle"
length = 300.0
depth = 100.0
[[supports]]
edge = "left"
fix = "xy"
[[loads]]
edge = "right"
force = [0.0, -1000.0]
[mesh]
size = 50.0
"""


@pytest.mark.parametrize("given, want", [
    ("tcp://10.0.0.5:8786", "tcp://10.0.0.5:8786"),
    ("10.0.0.5:8786", "tcp://10.0.0.5:8786"),
    ("  TCP://sched-1.example:8786 ", "tcp://sched-1.example:8786"),
    ("tcp://[::1]:8786", "tcp://[::1]:8786"),
])
def test_good_addresses_are_normalised(given, want):
    assert parse_scheduler(given) == want


@pytest.mark.parametrize("given, fragment", [
    ("", "is empty"),
    ("   ", "is empty"),
    ("bogus", "is not HOST:PORT"),
    ("inproc://x", "same process"),
    ("tls://10.0.0.5:8786", "TLS certificates"),
    ("http://10.0.0.5:8786", "'http://' is not a Dask scheduler address"),
    ("tcp://10.0.0.5", "is not HOST:PORT"),
    ("tcp://10.0.0.5:99999", "outside 1-65535"),
    ("tcp://host:port", "is not HOST:PORT"),
])
def test_malformed_addresses_are_refused(given, fragment):
    with pytest.raises(CaseError, match=fragment) as err:
        parse_scheduler(given)
    assert err.value.key == repr(given) and "--scheduler" in str(err.value)


def test_cli_refuses_bad_addresses_with_exit_2_before_running(tmp_path: Path, capsys):
    from fem.cli import main

    case = tmp_path / "c.toml"
    case.write_text(STUB, encoding="utf-8")
    for address in ("", "bogus", "inproc://x", "tls://10.0.0.5:8786"):
        assert main(["sweep", str(case), "--vary", "geometry.length=200:300:2", "--out",
                     str(tmp_path / "s"), "--scheduler", address]) == 2
        err = capsys.readouterr().err.strip().splitlines()
        assert len(err) == 1 and "--scheduler" in err[0], err
    assert not (tmp_path / "s").exists()     # nothing ran, nothing written


@pytest.fixture
def silent_port():
    """A port that accepts connections and never sends a byte."""
    srv = socket.socket()
    srv.bind(("127.0.0.1", 0))
    srv.listen(8)
    held: list[socket.socket] = []
    stop = threading.Event()

    def accept():
        srv.settimeout(0.2)
        while not stop.is_set():
            try:
                held.append(srv.accept()[0])
            except OSError:
                continue

    t = threading.Thread(target=accept, daemon=True)
    t.start()
    yield srv.getsockname()[1]
    stop.set()
    t.join()
    for c in held:
        c.close()
    srv.close()


@pytest.fixture
def http_port():
    class Quiet(BaseHTTPRequestHandler):
        def do_GET(self):  # noqa: N802 (the http.server name)
            self.send_response(200)
            self.end_headers()
            self.wfile.write(b"hello")

        def log_message(self, *a):
            pass

    srv = HTTPServer(("127.0.0.1", 0), Quiet)
    t = threading.Thread(target=srv.serve_forever, daemon=True)
    t.start()
    yield srv.server_address[1]
    srv.shutdown()
    srv.server_close()


def test_silent_port_is_refused_within_the_deadline(silent_port, tmp_path: Path):
    """Once hung 590 s: now exit-2 material within the deadline, naming the address."""
    case = tmp_path / "c.toml"
    case.write_text(STUB, encoding="utf-8")
    address = f"tcp://127.0.0.1:{silent_port}"
    t0 = time.monotonic()
    with pytest.raises(CaseError, match="no Dask greeting within the deadline") as err:
        run_sweep(case, [parse_vary("geometry.length=200:300:2")], tmp_path / "s",
                  scheduler=address, quiet=True, scheduler_deadline=1.5)
    assert time.monotonic() - t0 < 10
    assert address in str(err.value)


def test_http_server_is_not_taken_for_a_scheduler(http_port):
    """Once a 3 EiB allocation (its reply read as a frame length): refused in words."""
    t0 = time.monotonic()
    with pytest.raises(CaseError, match="not a Dask scheduler"):
        probe_scheduler(f"tcp://127.0.0.1:{http_port}", deadline=1.5)
    assert time.monotonic() - t0 < 10


def test_server_that_greets_with_text_is_refused_at_once():
    srv = socket.socket()
    srv.bind(("127.0.0.1", 0))
    srv.listen(1)

    def greet():
        c, _ = srv.accept()
        c.sendall(b"SSH-2.0-something\r\n")
        time.sleep(2)
        c.close()

    threading.Thread(target=greet, daemon=True).start()
    t0 = time.monotonic()
    with pytest.raises(CaseError, match="no Dask handshake"):
        probe_scheduler(f"tcp://127.0.0.1:{srv.getsockname()[1]}", deadline=5.0)
    assert time.monotonic() - t0 < 2
    srv.close()


def test_closed_port_is_refused():
    s = socket.socket()
    s.bind(("127.0.0.1", 0))
    port = s.getsockname()[1]
    s.close()
    with pytest.raises(CaseError, match="cannot connect"):
        probe_scheduler(f"tcp://127.0.0.1:{port}", deadline=1.5)
