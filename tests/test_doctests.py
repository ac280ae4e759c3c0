"""The examples in the docstrings of the main entry points run and print what they say."""

import doctest
import importlib

import pytest

MODULES = ["fibrewise", "fibrewise.spaces", "fibrewise.systems"]


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    module = importlib.import_module(name)
    result = doctest.testmod(module, optionflags=doctest.ELLIPSIS)
    assert result.attempted > 0, f"{name} has no examples"
    assert result.failed == 0
