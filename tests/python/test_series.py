"""IEC 60063 series and value sets (series.hpp)."""
import pytest

import tauforge as tf

# IEC 60063 E24 and E12 tables (from memory).
E24 = [10, 11, 12, 13, 15, 16, 18, 20, 22, 24, 27, 30, 33, 36, 39, 43, 47, 51, 56, 62, 68, 75, 82, 91]
E12 = [10, 12, 15, 18, 22, 27, 33, 39, 47, 56, 68, 82]
E6 = [10, 15, 22, 33, 47, 68]


def test_iec_60063_tables():
    assert tf.series_mantissas("E24") == E24
    assert tf.series_mantissas(tf.ESeries.E12) == E12
    assert tf.series_mantissas("e6") == E6
    assert [tf.series_size(s) for s in ("E3", "E6", "E12", "E24", "E48", "E96", "E192")] == [3, 6, 12, 24, 48, 96, 192]
    assert tf.series_mantissas("E96")[:4] == [100, 102, 105, 107]   # IEC 60063 E96 (from memory)
    assert tf.preferred_number("E24", 16, 3) == 4700.0


def test_customary_tolerances_common_practice():
    assert tf.customary_tolerance("E24") == tf.Tolerance(0.05)
    assert tf.customary_tolerance("E96") == tf.Tolerance(0.01)
    assert tf.customary_tolerance("E12") == tf.Tolerance(0.10)


def test_membership_and_coarsest_series():
    assert tf.in_series("E24", 5100)
    assert not tf.in_series("E12", 5100)
    assert tf.coarsest_series(4700) == "E3"
    assert tf.coarsest_series(5100) == "E24"
    assert tf.coarsest_series(4990) == "E96"
    assert tf.coarsest_series(4321) is None


def test_value_set_from_series_range():
    r = tf.ResistorValues.from_series("E24", "1k", "1M")
    assert len(r) == 3 * 24 + 1                   # three decades plus 1 MOhm itself
    assert r.values[:24] == [m * 100.0 for m in E24]
    assert r[0] == {"value": 1000.0, "tolerance": tf.Tolerance(0.05), "series": "E24"}
    assert r.nearest("4.8k")["value"] == 4700.0
    below, above = r.bracket(4800)
    assert (below["value"], above["value"]) == (4700.0, 5100.0)
    assert r.round_up(1.2e6) is None
    assert 4700 in r and "4k7" in r and 4800 not in r
    c = tf.CapacitorValues.from_series("E6", "1n", "1u", tolerance="K")
    assert c[0]["tolerance"] == tf.Tolerance(0.10)
    assert len(c) == 3 * 6 + 1


def test_stock_lists():
    stock = tf.CapacitorValues.read_stock("# drawer 3\n100n, 10%\n4u7; K\n2n2\n", default_tolerance="5%")
    assert stock.values == [2.2e-9, 100e-9, 4.7e-6]
    assert stock[0]["tolerance"] == tf.Tolerance(0.05)
    assert stock[2]["series"] is None
    r = tf.ResistorValues.from_list([("4k7", "1%"), (1000.0, 0.05), {"value": "22k", "tolerance": "J"}])
    assert r.values == [1000.0, 4700.0, 22000.0]


def test_best_pairs_and_single():
    r = tf.ResistorValues.from_series("E24", 10, "1M")
    best = r.best_pairs("4k8", "series", 3)
    assert len(best) == 3
    assert best[0]["error"] == 0.0                 # 2.4 k + 2.4 k = 4.8 k exactly
    assert best[0]["value"] == 4800.0
    parallel = r.best_pairs(5000, "parallel", 1)[0]
    assert parallel["connection"] == "parallel"
    a, b = parallel["first"]["value"], parallel["second"]["value"]
    assert parallel["value"] == pytest.approx(a * b / (a + b), rel=1e-15)   # product over sum
    assert r.best_single(4800)["value"] == 4700.0


def test_stock_file_and_lookups(tmp_path):
    path = tmp_path / "resistors.txt"
    path.write_text("4k7, F\n10k, 1%\n# spare\n100R\n", encoding="utf-8")
    r = tf.ResistorValues.read_stock_file(str(path), default_tolerance="5%")
    assert r.values == [100.0, 4700.0, 10000.0]
    assert r.round_down(9999)["value"] == 4700.0
    assert r.round_down(99) is None
    assert r.find("4.7k")["tolerance"] == tf.Tolerance(0.01)
    assert r.find(4800) is None
    assert r.find(4800, rel_tol=0.05)["value"] == 4700.0
    with pytest.raises(tf.InvalidArgument, match="a readable stock file"):
        tf.ResistorValues.read_stock_file(str(tmp_path / "missing.txt"))
