"""The examples in the docstrings of the input-reading modules run."""

import doctest

import pytest

from noblegap import units
from noblegap.materials import alloys
from noblegap.methods import nernst


@pytest.mark.parametrize("module", [units, alloys, nernst], ids=lambda m: m.__name__)
def test_docstring_examples(module):
    result = doctest.testmod(module)
    assert result.attempted > 0 and result.failed == 0
