"""The module under test comes from the build tree (ctest sets PYTHONPATH)."""
import os
import threading
import time

import pytest

import tauforge


@pytest.fixture
def one_shot():
    """The catalogue's example one-shot: R 100 kOhm +/-1 %, C 10 nF +/-10 %, 5 V, threshold 2/3."""
    return tauforge.TimerMonostable.example()


@pytest.fixture
def repo_root():
    return os.environ.get("TAUFORGE_SOURCE_DIR", os.path.join(os.path.dirname(__file__), "..", ".."))


def _ticks_during(call):
    """Runs call() while another thread wakes every millisecond; returns (seconds taken,
    wake-ups). With the GIL held for the whole call the other thread cannot wake."""
    ticks = []
    done = threading.Event()

    def count():
        while not done.is_set():
            ticks.append(1)
            time.sleep(0.001)

    t = threading.Thread(target=count)
    t.start()
    start = time.perf_counter()
    try:
        call()
    finally:
        elapsed = time.perf_counter() - start
        done.set()
        t.join()
    return elapsed, len(ticks)


@pytest.fixture
def ticks_during():
    return _ticks_during
