"""Shared helpers for the Python tests."""

import random

import pytest


@pytest.fixture
def rng():
    """A seeded generator: every random test is reproducible."""
    return random.Random(20261201)
