"""The module under test comes from the build tree (ctest sets PYTHONPATH)."""
import os

import pytest

import tauforge


@pytest.fixture
def one_shot():
    """The catalogue's example one-shot: R 100 kOhm +/-1 %, C 10 nF +/-10 %, 5 V, threshold 2/3."""
    return tauforge.TimerMonostable.example()


@pytest.fixture
def repo_root():
    return os.environ.get("TAUFORGE_SOURCE_DIR", os.path.join(os.path.dirname(__file__), "..", ".."))
