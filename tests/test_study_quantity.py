"""The quantity path into results.json (fem.study.quantity): syntax, look-up, clear misses."""

from __future__ import annotations

import pytest

from fem.study.quantity import QuantityError, Step, parse_path, resolve, resolve_values

DATA = {
    "section": {"tau_max_fe": 19.6, "I": {"xx": 3.0}, "shear_centre": [-1.5, 0.25]},
    "cuts": [{"x": 50.0, "tau_max_fe": 15.3}, {"x": 250.0, "sigma_x_max_fe": 30.0}],
    "convergence": {"quantities": {"peak principal": {"values": [1.0, 2.0, 4.0]}}},
    "verdict": "holds",
}


def test_paths_parse_into_steps():
    assert parse_path("cuts[x=250].sigma_x_max_fe") == [
        Step("cuts", (("x", 250.0),)), Step("sigma_x_max_fe")]
    assert parse_path('convergence.quantities."peak principal".values[-1]')[2] == Step(
        "peak principal")
    assert parse_path("section.shear_centre[0]")[1] == Step("shear_centre", (0,))


@pytest.mark.parametrize("path, value", [
    ("section.tau_max_fe", 19.6), ("section.I.xx", 3.0), ("section.shear_centre[0]", -1.5),
    ("section.shear_centre[-1]", 0.25), ("cuts[x=250].sigma_x_max_fe", 30.0),
    ("cuts[x=5e1].tau_max_fe", 15.3), ('convergence.quantities."peak principal".values[1]', 2.0),
])
def test_resolve(path: str, value: float):
    assert resolve(DATA, path) == value


@pytest.mark.parametrize("path, words", [
    ("section.tau", "has no key 'tau' (it has: I, shear_centre, tau_max_fe)"),
    ("cuts[x=100].tau_max_fe", "no item(s) with x = 100; it has x = [50.0, 250.0]"),
    ("section.shear_centre[2]", "has 2 items; index 2 is out of range"),
    ("verdict", "verdict is str, not a number"),
    ("section.I", "section.I is dict, not a number"),
    ("section.tau_max_fe.x", "section.tau_max_fe is not a table"),
    ("section[0]", "section is not a list"),
    ("a..b", "expected a key at character 3"),
    ("a[x]", "an index is [N] or [name=number]"),
    ("", "empty"),
])
def test_misses_say_where(path: str, words: str):
    with pytest.raises(QuantityError) as e:
        resolve(DATA, path)
    assert words in str(e.value)


def test_resolve_values():
    assert resolve_values(DATA, 'convergence.quantities."peak principal".values') == [1, 2, 4]
    with pytest.raises(QuantityError, match="not a list"):
        resolve_values(DATA, "section.tau_max_fe")
