"""The train page and its batch hook: formatting only, so every shown number is checked against the solved result
it came from; user text is escaped.

Expected values are the solved train's own numbers as the page must show them (an invariant of formatting,
no outside source).
"""
import re
import sys
from pathlib import Path

import yaml

sys.path.insert(0, str(Path(__file__).parent))
from test_train_unitfile import unit_doc  # noqa: E402  (the same invented two-exchanger network unit)

from revamp.batch_train import TRAIN_FILE, index_section, run_train_page  # noqa: E402
from revamp.report.train import train_svg  # noqa: E402
from revamp.unitfile import load  # noqa: E402


def _unit(tmp_path, doc=None):
    doc = doc or unit_doc()
    doc["exchangers"][0]["options"] = [{"type": "clean", "label": "clean <both>", "capex": 50000}]
    doc["economics"] = {"energy_price": "9 USD/GJ", "hours_per_year": "8000 h"}
    path = tmp_path / "unit.yaml"
    path.write_text(yaml.safe_dump(doc, sort_keys=False), encoding="utf-8")
    return path


def test_svg_shows_every_exchanger_and_the_solved_temperatures(tmp_path):
    res = load(_unit(tmp_path)).network.solve()
    svg = train_svg(res, "today <&>")
    assert svg.startswith("<svg") and svg.endswith("</svg>")
    assert "today &lt;&amp;&gt;" in svg and "<&>" not in svg
    for tag in res.exchangers.index:
        assert f">{tag}<" in svg
        # each exchanger's tube outlet as written on the drawing (°C, no decimals)
        assert f">{res.exchangers.loc[tag, 't_out_tube'] - 273.15:.0f} °C<" in svg
    assert f"{res.furnace_inlet - 273.15:.0f} °C → 360 °C" in svg
    assert f"fired {res.furnace_duty / 1e6:.2f} MW" in svg
    assert f"desalter {res.points.loc['desalter', 'temperature'] - 273.15:.0f} °C" in svg


def test_train_page_from_the_batch_hook(tmp_path):
    path = _unit(tmp_path)
    out = tmp_path / "out"
    out.mkdir()
    result = run_train_page({"unit_file": str(path), "out": str(out), "points": 7})
    assert result["status"] == "ok", result["reason"]
    html = (out / TRAIN_FILE).read_text(encoding="utf-8")
    for section in ("train-today", "train-revamp", "train-options", "train-throughput"):
        assert f'id="{section}"' in html
    assert "clean &lt;both&gt;" in html and "clean <both>" not in html
    assert "licensed" in html  # the cautions ride along
    assert not re.search(r"https?://cdn", html)
    unit = load(path)
    today = unit.network.solve(tol=1e-3)
    assert result["summary"]["furnace_inlet"] == today.furnace_inlet or \
        abs(result["summary"]["furnace_inlet"] - today.furnace_inlet) < 1e-3
    link = index_section(result)
    assert f'href="{TRAIN_FILE}"' in link


def test_a_failed_train_page_is_reported_not_raised(tmp_path):
    result = run_train_page({"unit_file": str(tmp_path / "missing.yaml"), "out": str(tmp_path)})
    assert result["status"] == "failed" and result["reason"]
    assert "failed" in index_section(result)
    assert index_section(None) == ""


def test_batch_of_a_network_unit_links_its_train_page(tmp_path):
    from revamp.batch import run_batch

    doc = unit_doc()
    doc["exchangers"] = doc["exchangers"][:2]  # the two exchangers of the network
    result = run_batch(_unit(tmp_path, doc), tmp_path / "out", jobs=2, progress=False)
    assert not result.failures, result.failures
    index = result.index_path.read_text(encoding="utf-8")
    assert f'href="{TRAIN_FILE}"' in index
    page = (result.index_path.parent / TRAIN_FILE).read_text(encoding="utf-8")
    assert 'id="train-today"' in page and "<svg" in page
