"""The app bench case runs end to end in Debian chromium (its timings are read from
`fieldcol bench --case app`, never asserted here: no timed tests)."""

from __future__ import annotations

import math

from fieldcol.bench import CASES, _app


def test_app_case_is_found_and_not_first():
    assert "app" in CASES and CASES[0] == "engine"


def test_app_case_measures_first_screen_open_and_save():
    res = _app.run(quick=True)
    assert "app" not in res, res.get("app")  # the test extra and chromium are installed
    keys = {"app_first_screen_s", "bare_flet_first_screen_s", "app_first_screen_ratio",
            "app_open_column_ms", "app_save_recheck_ms"}
    assert set(res) == keys
    assert all(isinstance(res[k], float) and math.isfinite(res[k]) and res[k] > 0
               for k in keys), res
