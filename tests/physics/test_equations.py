"""Every registered equation: units from its docstring, a printable form that typesets."""

import pytest

from calcreport.physics.equation import registered

EQUATIONS = sorted(registered().items())


@pytest.mark.parametrize(("name", "eq"), EQUATIONS, ids=[n for n, _ in EQUATIONS])
def test_equation_metadata_is_complete(name, eq):
    assert eq.symbol and eq.text and eq.latex and eq.reference
    assert set(eq.params) and all(unit for unit in eq.params.values()), name
    assert eq.unit


@pytest.mark.parametrize(("name", "eq"), EQUATIONS, ids=[n for n, _ in EQUATIONS])
def test_latex_typesets(name, eq):
    # The report lays every equation out with matplotlib's mathtext; a syntax error there
    # would only show when a report first prints that step.
    from calcreport.report.mathtext import _layout

    width, ascent, _, glyphs, _ = _layout(eq.latex, 10.0)
    assert width > 0 and ascent > 0 and glyphs, name


def test_every_reference_key_is_in_the_catalog():
    from calcreport import catalog

    refs = catalog.references()
    for name, eq in EQUATIONS:
        assert eq.reference in refs, name
