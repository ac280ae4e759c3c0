"""Shared helpers for the Python tests."""

import random

import pytest


@pytest.fixture
def rng():
    """A seeded generator: every random test is reproducible."""
    return random.Random(20261201)


@pytest.fixture
def loopback_cluster():
    """A Dask cluster of two single-threaded workers in this process, reachable on the loopback
    interface only (no dashboard); skipped where the optional package distributed is missing."""
    pytest.importorskip("distributed")
    from distributed import LocalCluster

    with LocalCluster(
        n_workers=2,
        threads_per_worker=1,
        processes=False,
        protocol="tcp://",
        host="127.0.0.1",
        dashboard_address=None,
    ) as cluster:
        yield cluster
