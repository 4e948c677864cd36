"""The design report (coldplate report): HTML that parses, figures present, numbers equal to the JSON result,
self-contained, traceable; the Markdown layout; the curves export; the file-writing contract."""
from __future__ import annotations

import csv
import hashlib
import io
import json
import re
import subprocess
import sys
import xml.etree.ElementTree as ET
from html.parser import HTMLParser

import pint
import pytest

from coldplate.cli import main
from coldplate.plate.curves import fit_flow_curves, flow_curve
from coldplate.design.reader import load_design
from coldplate.findings.base import DEFER
from coldplate.uncertainty.run import check_file_with_band as check_file  # what the report command solves
from reports.jsonout import render_json, result_to_dict

from .helpers import EXAMPLES, ROOT, example_dict, modified, write

VOID = {"meta", "br", "hr", "img", "input", "link", "area", "base", "col", "embed", "source", "track", "wbr"}
SVG_NS = "{http://www.w3.org/2000/svg}"


class Page(HTMLParser):
    """A strict reader: every non-void element closes in order; collects rows, figures, findings."""

    def __init__(self):
        super().__init__(convert_charrefs=True)
        self.stack, self.errors = [], []
        self.rows, self.figures, self.finding_ids, self.sections = {}, [], [], []
        self._key, self._cells, self._cell = None, [], None
        self.text = []

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if tag not in VOID:
            self.stack.append(tag)
        if tag == "tr" and "data-key" in a:
            self._key, self._cells = a["data-key"], []
        if tag in ("td", "th") and self._key:
            self._cell = []
        if tag == "figure":
            self.figures.append(a.get("id"))
        if tag == "div" and "finding" in a.get("class", ""):
            self.finding_ids.append(a["data-id"])
        if tag == "section":
            self.sections.append(a.get("id"))

    def handle_startendtag(self, tag, attrs):  # <path ... /> inside inline SVG
        pass

    def handle_endtag(self, tag):
        if tag in VOID:
            return
        if not self.stack or self.stack[-1] != tag:
            self.errors.append(f"</{tag}> closes {self.stack[-1] if self.stack else 'nothing'}")
            return
        self.stack.pop()
        if tag in ("td", "th") and self._key is not None and self._cell is not None:
            self._cells.append("".join(self._cell).strip())
            self._cell = None
        if tag == "tr" and self._key:
            self.rows[self._key] = self._cells
            self._key = None

    def handle_data(self, data):
        if self._cell is not None:
            self._cell.append(data)
        self.text.append(data)


def parse(html_text: str) -> Page:
    p = Page()
    p.feed(html_text)
    p.close()
    assert not p.errors, p.errors[:5]
    assert p.stack == [], p.stack
    return p


#: Examples also reported in US units: a plain plate, a supply circuit and a thermoelectric stage.
US_TOO = ("detector-cavity-glycol", "tap-to-drain-circuit", "sample-stage-thermoelectric")


@pytest.fixture(scope="module")
def reports(tmp_path_factory):
    """Each example as an SI report, and the first one in US units too (through the CLI)."""
    out = {}
    d = tmp_path_factory.mktemp("reports")
    for path in EXAMPLES:
        for units in ("si", "us") if path.stem in US_TOO else ("si",):
            target = d / f"{path.stem}-{units}.html"
            assert main(["report", str(path), "-o", str(target), "--units", units]) == 0
            out[(path.stem, units)] = (path, target.read_text(encoding="utf-8"))
    return out


def _svgs(html_text):
    return re.findall(r"<svg\b.*?</svg>", html_text, flags=re.S)


def test_html_parses_and_has_every_section(reports):
    for (name, _), (path, text) in reports.items():
        page = parse(text)
        for sec in ("results", "findings", "inputs", "breakdown", "profile", "flow", "methods", "assumptions",
                    "trace"):
            assert sec in page.sections, (name, sec)
        expected = {"fig-plate", "fig-breakdown", "fig-profile", "fig-flow"}
        r = check_file(path)
        if r.design.supply.once_through or r.planning is not None:
            expected.add("fig-water")
            assert "water" in page.sections
        for part in ("module", "circuit", "air"):
            if getattr(r, part) is not None:
                expected.add(f"fig-{part}")
                assert part in page.sections
            else:
                assert part not in page.sections
        if r.uncertainty is not None:  # an [uncertainty] table: the band's section and its tornado chart
            expected.add("fig-tornado")
            assert "uncertainty" in page.sections
        else:
            assert "uncertainty" not in page.sections
        if r.field is not None:  # the field solve: its map section, the face map and (with coolant) the bulk plot
            expected.add("fig-facemap")
            if r.field.bulk.size:
                expected.add("fig-coolant")
            assert "field" in page.sections
        else:
            assert "field" not in page.sections
        if r.channel_flows:  # the flow split across channels: its section and its figure
            expected.add("fig-flow_split")
            assert "flow-split" in page.sections
        else:
            assert "flow-split" not in page.sections
        assert set(page.figures) == expected, name
        assert text.startswith("<!DOCTYPE html>")


def test_every_figure_is_non_empty_svg(reports):
    for (name, _), (_, text) in reports.items():
        svgs = _svgs(text)
        assert len(svgs) == len(parse(text).figures)
        ids = []
        for svg in svgs:
            root = ET.fromstring(svg)  # each inline figure is well-formed XML
            assert root.tag == SVG_NS + "svg"
            paths = root.findall(f".//{SVG_NS}path")
            lines = [g for g in root.iter(SVG_NS + "g") if g.get("id", "").split("-")[-1].startswith(
                ("line2d", "patch"))]
            assert len(paths) > 50 and len(lines) > 5, name  # axes, ticks, labels (as paths) and data
            ids += [e.get("id") for e in root.iter() if e.get("id")]
        assert len(ids) == len(set(ids)), "element ids repeat across figures"


def test_self_contained(reports):
    for _, text in reports.values():
        lowered = text.lower()
        for banned in ("<script", "<link", "<iframe", "<img", "@import", "@font-face", " src=", "<object"):
            assert banned not in lowered, banned
        urls = set(re.findall(r"(?:https?|ftp)://[^\s\"'<>)]+", text))
        assert urls <= {"http://www.w3.org/2000/svg", "http://www.w3.org/1999/xlink"}, urls  # namespaces
        assert not re.search(r"url\((?!#)", text)  # only references inside the page


# JSON key -> (unit of the JSON value, SI display unit, US display unit), converted with a fresh pint registry
JSON_UNITS = {
    "thermal_resistance_K_per_W": ("K/W", "K/W", "delta_degF/(Btu_it/hour)"),
    "surface_temperature_max_C": ("degC", "degC", "degF"),
    "inlet_temperature_C": ("degC", "degC", "degF"),
    "outlet_temperature_C": ("degC", "degC", "degF"),
    "dew_point_C": ("degC", "degC", "degF"),
    "boiling_point_C": ("degC", "degC", "degF"),
    "hot_spot_from_inlet_edge_m": ("m", "mm", "inch"),
    "heat_load_W": ("W", "W", "Btu_it/hour"),
    "flow_m3_per_s": ("m**3/s", "L/min", "gallon/minute"),
    "pressure_drop_Pa": ("Pa", "kPa", "psi"),
    "velocity_m_per_s": ("m/s", "m/s", "ft/s"),
    "reynolds": ("dimensionless", "dimensionless", "dimensionless"),
    "heat_transfer_coefficient_W_per_m2K": ("W/(m**2*K)", "W/(m**2*K)", "Btu_it/(hour*ft**2*delta_degF)"),
    "heat_transfer_coefficient_hot_spot_W_per_m2K": ("W/(m**2*K)", "W/(m**2*K)", "Btu_it/(hour*ft**2*delta_degF)"),
    "water_use_L_per_day": ("L/day", "L/day", "gallon/day"),
    "uncertainty.surface_temperature_max_C.nominal": ("degC", "degC", "degF"),  # the band's rows: the nominal
    "uncertainty.outlet_temperature_C.nominal": ("degC", "degC", "degF"),
    "uncertainty.pressure_drop_Pa.nominal": ("Pa", "kPa", "psi"),
    "uncertainty.water_use_L_per_day.nominal": ("L/day", "L/day", "gallon/day"),
    "water_use_m3_per_year": ("m**3/year", "m**3/year", "gallon/year"),
    # thermoelectric modules (result.module)
    "module_current_A": ("A", "A", "A"),
    "module_voltage_V": ("V", "V", "V"),
    "cold_face_temperature_C": ("degC", "degC", "degF"),
    "hot_face_temperature_C": ("degC", "degC", "degF"),
    "module.cold_load_W": ("W", "W", "Btu_it/hour"),
    "heat_into_plate_W": ("W", "W", "Btu_it/hour"),
    "electrical_power_W": ("W", "W", "Btu_it/hour"),
    "cop": ("dimensionless", "dimensionless", "dimensionless"),
    "coldest_current_A": ("A", "A", "A"),
    "module.best_cop_current_A": ("A", "A", "A"),
    "module.coldest_cold_face_temperature_C": ("degC", "degC", "degF"),
    "module.hot_side_limit_C": ("degC", "degC", "degF"),
    "module.dew_point_C": ("degC", "degC", "degF"),
    "module.dew_margin_K": ("K", "K", "delta_degF"),
    # supply circuit and planning (result.circuit, result.planning)
    "operating_flow_m3_per_s": ("m**3/s", "L/min", "gallon/minute"),
    "supply_pressure_used_Pa": ("Pa", "kPa", "psi"),
    "circuit.needed_supply_pressure_Pa": ("Pa", "kPa", "psi"),
    "circuit.plate_inlet_pressure_Pa": ("Pa", "kPa", "psi"),
    "circuit.plate_outlet_pressure_Pa": ("Pa", "kPa", "psi"),
    "circuit.plate_pressure_rating_Pa": ("Pa", "kPa", "psi"),
    "minimum_flow_m3_per_s": ("m**3/s", "L/min", "gallon/minute"),
    "planning.face_limit_C": ("degC", "degC", "degF"),
    "planning.discharge_limit_C": ("degC", "degC", "degF"),
    "planning.surface_temperature_at_minimum_C": ("degC", "degC", "degF"),
    "planning.outlet_temperature_at_minimum_C": ("degC", "degC", "degF"),
    "planning.water_L_per_day": ("L/day", "L/day", "gallon/day"),
    "planning.water_m3_per_year": ("m**3/year", "m**3/year", "gallon/year"),
    "planning.water_m3_per_year_at_minimum": ("m**3/year", "m**3/year", "gallon/year"),
    "planning.flow_over_minimum": ("dimensionless", "dimensionless", "dimensionless"),
    "water_cost_per_year": ("dimensionless", "dimensionless", "dimensionless"),  # money, as given
    "planning.water_cost_per_year_at_minimum": ("dimensionless", "dimensionless", "dimensionless"),
    "planning.chiller.power_W": ("W", "W", "Btu_it/hour"),
    "planning.chiller.electricity_cost_per_year": ("dimensionless", "dimensionless", "dimensionless"),
    "planning.chiller.saving_per_year": ("dimensionless", "dimensionless", "dimensionless"),
    "planning.chiller.breakeven_flow_m3_per_s": ("m**3/s", "L/min", "gallon/minute"),
    "planning.chiller.breakeven_water_tariff_per_m3": ("dimensionless", "dimensionless", "dimensionless"),
    "planning.chiller.payback_years": ("dimensionless", "dimensionless", "dimensionless"),
    # the air-cooled alternative (result.air)
    "air.hottest_face_C": ("degC", "degC", "degF"),
    "air.sink.mass_kg": ("kg", "g", "lb"),
    "air.resistances_K_per_W.total": ("K/W", "K/W", "delta_degF/(Btu_it/hour)"),
    "air.fan_air_power_W": ("W", "W", "Btu_it/hour"),
}
TEXT_KEYS = {"planning.binding_limit"}


def _json_value(data, key):
    for part in key.split("."):
        data = data[part]
    return data


def _half_last_digit(shown: str) -> float:
    mant, _, exp = shown.replace(",", "").partition("e")
    decimals = len(mant.split(".")[1]) if "." in mant else 0
    return 0.5 * 10.0 ** (-decimals) * 10.0 ** (int(exp) if exp else 0)


def test_numbers_equal_the_json_result(reports):
    ureg = pint.UnitRegistry()
    checked = set()
    for (name, units), (path, text) in reports.items():
        data = json.loads(render_json(check_file(path)))
        rows = parse(text).rows
        for key, cells in rows.items():
            assert key in JSON_UNITS or key in TEXT_KEYS, f"row {key!r} is not checked against the JSON"
            shown, value = cells[1], _json_value(data, key)
            if key in TEXT_KEYS:
                assert shown == value
                continue
            if value is None:
                assert shown.startswith(("not defined", "none")), (name, key, shown)
                continue
            json_unit, si_unit, us_unit = JSON_UNITS[key]
            expected = ureg.Quantity(value, json_unit).to(si_unit if units == "si" else us_unit).magnitude
            assert float(shown.replace(",", "")) == pytest.approx(expected, abs=_half_last_digit(shown) * 1.0001), \
                (name, units, key, shown, expected)
            checked.add(key)
        for key in ("thermal_resistance_K_per_W", "surface_temperature_max_C", "pressure_drop_Pa"):
            assert key in rows, (name, key)
    # every kind of row was met in the examples: plate, modules, circuit and planning
    assert {"water_use_L_per_day", "cold_face_temperature_C", "supply_pressure_used_Pa",
            "minimum_flow_m3_per_s", "planning.chiller.saving_per_year"} <= checked


def test_findings_in_order_with_their_actions(reports):
    for (name, units), (path, text) in reports.items():
        data = result_to_dict(check_file(path))
        page = parse(text)
        assert page.finding_ids == [f["id"] for f in data["findings"]]
        if units == "si":
            for f in data["findings"]:
                assert f["action"].replace("'", "&#x27;") in text or f["action"] in text
        assert text.count(DEFER.replace("'", "&#x27;")) >= sum(DEFER in f["action"] for f in data["findings"])


def test_methods_and_trace(reports):
    for (name, _), (path, text) in reports.items():
        r = check_file(path)
        body = "".join(parse(text).text)
        for m in r.methods:
            assert m.method in body and m.validity in body and m.reference in body
        assert hashlib.sha256(path.read_bytes()).hexdigest() in body
        from coldplate import __version__

        assert f"coldplate {__version__}" in body
        assert r.design.title in body


def test_us_report_uses_us_units(reports):
    _, text = reports[(EXAMPLES[0].stem, "us")]
    body = "".join(parse(text).text)
    for label in ("°F", "gpm", "psi", "BTU/h", "in"):
        assert label in body
    assert "°C" not in "".join(parse(text).rows["surface_temperature_max_C"])


def test_report_is_deterministic(tmp_path):
    a, b = tmp_path / "a.html", tmp_path / "b.html"
    assert main(["report", str(EXAMPLES[1]), "-o", str(a)]) == 0
    assert main(["report", str(EXAMPLES[1]), "-o", str(b)]) == 0
    assert a.read_bytes() == b.read_bytes()


def test_markdown_report_and_its_figures(tmp_path):
    out = tmp_path / "plate.md"
    source = ROOT / "examples" / "reagent-block-channels.toml"  # once-through: has the water-use figure
    assert main(["report", str(source), "-o", str(out)]) == 0
    text = out.read_text(encoding="utf-8")
    links = re.findall(r"!\[[^\]]*\]\(([^)]+)\)", text)
    # and the flow split across its channels, and (the field being the default model) the face map and coolant
    assert set(links) == {"plate.plate.svg", "plate.breakdown.svg", "plate.profile.svg", "plate.flow.svg",
                          "plate.water.svg", "plate.flow_split.svg", "plate.facemap.svg", "plate.coolant.svg"}
    for link in links:
        root = ET.parse(tmp_path / link).getroot()
        assert root.tag == SVG_NS + "svg" and len(root.findall(f".//{SVG_NS}path")) > 50
    data = result_to_dict(check_file(source))
    assert f"| {data['thermal_resistance_K_per_W']:.4g} | K/W |" in text
    assert hashlib.sha256(source.read_bytes()).hexdigest() in text
    for f in data["findings"]:
        assert f["message"] in text


def test_refuses_to_overwrite_and_writes_atomically(tmp_path, capsys):
    out = tmp_path / "r.html"
    out.write_text("keep me")
    assert main(["report", str(EXAMPLES[0]), "-o", str(out)]) == 2
    err = capsys.readouterr().err
    assert err.count("\n") == 1 and "--force" in err
    assert out.read_text() == "keep me"
    assert main(["report", str(EXAMPLES[0]), "-o", str(out), "--force"]) == 0
    assert out.read_text().startswith("<!DOCTYPE html>")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["r.html"]  # no temporary file left behind


@pytest.mark.parametrize("argv_tail, field", [
    (["-o", "{d}/r.pdf"], "-o"),
    (["-o", "{d}/missing/r.html"], "-o"),
    (["-o", "{d}/r.html", "--min-flow", "2 bar"], "--min-flow"),
    (["-o", "{d}/r.html", "--min-flow", "3 L/min", "--max-flow", "1 L/min"], "--min-flow"),
    (["-o", "{d}/r.html", "--points", "2"], "--points"),
])
def test_bad_report_arguments(tmp_path, capsys, argv_tail, field):
    argv = ["report", str(EXAMPLES[0])] + [a.format(d=tmp_path) for a in argv_tail]
    assert main(argv) == 2
    err = capsys.readouterr().err
    assert err.startswith("coldplate: error: ") and field in err and err.count("\n") == 1
    assert list(tmp_path.iterdir()) == []


def test_bad_design_writes_nothing(tmp_path, capsys):
    path = write(tmp_path, modified(example_dict(), coolant__flow="2 bar"))
    out = tmp_path / "r.html"
    assert main(["report", str(path), "-o", str(out)]) == 2
    assert "[coolant] flow" in capsys.readouterr().err
    assert not out.exists()


def test_curves_export(tmp_path, capsys):
    d = load_design(EXAMPLES[0])
    curve = flow_curve(d)
    fit = fit_flow_curves(curve)
    assert main(["curves", str(EXAMPLES[0])]) == 0
    rows = list(csv.DictReader(io.StringIO(capsys.readouterr().out)))
    assert len(rows) == len(curve.V_dot)
    for row, V, R, dp in zip(rows, curve.V_dot, curve.R_th, curve.dp):
        assert float(row["flow_m3_per_s"]) == pytest.approx(V, rel=1e-7)
        assert float(row["thermal_resistance_K_per_W"]) == pytest.approx(R, rel=1e-7)
        assert float(row["pressure_drop_Pa"]) == pytest.approx(dp, rel=1e-7)
        assert float(row["flow_L_per_min"]) == pytest.approx(V * 6e4, rel=1e-7)
    out = tmp_path / "c.json"
    assert main(["curves", str(EXAMPLES[0]), "-o", str(out)]) == 0
    data = json.loads(out.read_text())
    assert data["fit"]["pressure_drop"]["a_Pa_s_per_m3"] == pytest.approx(fit.a)
    assert data["fit"]["thermal_resistance"]["n"] == pytest.approx(fit.n)
    assert data["fit"]["thermal_resistance"]["max_relative_error"] == pytest.approx(fit.R_max_error)
    # the flow curve runs on the network model
    assert data["design_point"]["thermal_resistance_K_per_W"] == pytest.approx(
        check_file(EXAMPLES[0], model="network").R_th)
    assert main(["curves", str(EXAMPLES[0]), "-o", str(out)]) == 2  # exists, no --force
    capsys.readouterr()
    assert main(["curves", str(EXAMPLES[0]), "--min-flow", "0.5 L/min", "--max-flow", "3 L/min",
                 "--points", "6", "--format", "json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert len(data["points"]) == 7 and data["points"][0]["flow_L_per_min"] == pytest.approx(0.5)


def test_check_text_in_us_units(capsys):
    assert main(["check", str(EXAMPLES[0]), "--units", "us"]) == 0
    text = capsys.readouterr().out
    r = check_file(EXAMPLES[0])
    f = pint.UnitRegistry().Quantity(r.T_face_max, "K").to("degF").magnitude
    assert f"{f:.2f}" in text and "gpm" in text and "psi" in text
    assert main(["check", str(EXAMPLES[0]), "--units", "us", "--format", "json"]) == 0
    assert json.loads(capsys.readouterr().out)["surface_temperature_max_C"] == pytest.approx(r.T_face_max - 273.15)


def test_check_does_not_import_matplotlib():
    code = ("import sys; from coldplate.cli import main; main(['check', %r, '--units', 'us']); "
            "sys.stderr.write(str(sorted(m for m in sys.modules if m.split('.')[0] == 'matplotlib')))") % str(EXAMPLES[0])
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT, check=True)
    assert proc.stderr == "[]"


def test_report_says_which_flows_were_left_out(tmp_path):
    # 1.5 kW at 0.8 L/min warms the water by about 27 K; at a quarter of the flow it would boil (computed:
    # 1500 W / (0.2/60e3 m^3/s x 998 kg/m^3 x 4180 J/(kg K)) = 108 K above an 18 degC inlet)
    path = write(tmp_path, modified(example_dict("laser-mount-tube"), heat__load="1500 W"))
    out = tmp_path / "hot.html"
    assert main(["report", str(path), "-o", str(out)]) == 0
    body = "".join(parse(out.read_text(encoding="utf-8")).text)
    assert re.search(r"Left out \d+ flows? at or below [\d.]+ L/min, where the flow is too small for the load", body)


def test_check_text_sections_in_us_units(capsys):
    # library: a fresh pint registry converts the solved SI values; the text must show them
    ureg = pint.UnitRegistry()
    circuit = ROOT / "examples" / "tap-to-drain-circuit.toml"
    assert main(["check", str(circuit), "--units", "us"]) == 0
    text = capsys.readouterr().out
    c = check_file(circuit).circuit
    assert f"{ureg.Quantity(c.supply_pressure, 'Pa').to('psi').magnitude:.3f}  psi (gauge)" in text
    assert f"{ureg.Quantity(c.V_dot, 'm**3/s').to('gallon/minute').magnitude:.4g}  gpm" in text
    assert not re.search(r"\d bar\b(?! \()", text) and "L/min" not in text.split("Findings")[0]  # a bar in a finding carries its psi
    stage = ROOT / "examples" / "sample-stage-thermoelectric.toml"
    assert main(["check", str(stage), "--units", "us"]) == 0
    text = capsys.readouterr().out
    m = check_file(stage).module
    assert f"{ureg.Quantity(m.Q_hot, 'W').to('Btu_it/hour').magnitude:.4g}  BTU/h" in text
    assert f"{ureg.Quantity(m.T_cold, 'K').to('degF').magnitude:.2f} / " in text
    assert "degC" not in text.split("Thermoelectric modules")[1].split("Correlations used")[0]
