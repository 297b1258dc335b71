"""Tests of the Python module deltag against published values and properties, as the C++
tests do; run by ctest (tests/CMakeLists.txt) with PYTHONPATH set to build/python."""

import concurrent.futures
import inspect
import math

import pytest

import deltag

RT_LN10_KJ_25C = 8.314462618 * 298.15 * math.log(10) / 1000.0  # CODATA 2018 R
FARADAY = 96485.33212  # CODATA 2018

# A hard ground water, invented for the tests (values of the order a lab reports).
HARD = {"Ca": 120, "Mg": 25, "Na": 30, "K": 3, "Cl": 60, "SO4": 90,
        "Alkalinity": {"value": 280, "as": "CaCO3"}}


# --- speciation --------------------------------------------------------------------------

def test_pure_water_ph_from_kw():
    # Neutral pH = pKw / 2 = 13.995 / 2 = 6.9975 at 25 degC (Bandura & Lvov 2006, the core
    # database's source for OH-; value from memory, as in tests/test_speciation.cpp).
    w = deltag.speciate({}, temperature_c=25.0)
    assert abs(w.pH - 6.998) <= 0.003
    h, oh = w.species["H+"][0], w.species["OH-"][0]
    assert h == pytest.approx(oh, rel=1e-9)  # electroneutrality of pure water
    assert w.ionic_strength == pytest.approx(h, rel=1e-6)


def test_result_attributes_and_consistency():
    w = deltag.speciate(HARD, pH=7.4, temperature_c=15.0, name="well 3")
    assert w.label == "well 3"
    assert w.temperature_c == 15.0
    assert w.pH == 7.4
    assert w.pe is None
    assert w.database == "core (embedded)"
    # species: (molality, activity) with activity = gamma m, gamma < 1 for ions here.
    m, a = w.species["Ca^2+"]
    assert 0 < a < m
    # Calcium mass balance: the Ca species hold 120 mg/L of Ca (40.078 g/mol, IUPAC), to
    # within the kg of water per litre (~0.999).
    ca = sum(mol for name, (mol, _) in w.species.items() if name.startswith("Ca"))
    assert ca == pytest.approx(0.120 / 40.078, rel=2e-3)
    # saturation: (SI, Delta G) with Delta G = RT ln10 SI at the water's temperature.
    rt = 8.314462618 * 288.15 * math.log(10) / 1000.0
    for phase, (si, dg) in w.saturation.items():
        assert dg == pytest.approx(rt * si, rel=1e-9, abs=1e-12), phase
    assert "Calcite" in w.saturation and "Gypsum" in w.saturation
    assert "CO2(g)" in w.gases and "CO2(g)" not in w.saturation
    # Ryznar = 2 pHs - pH and Langelier = pH - pHs (Standard Methods 2330; Ryznar 1944).
    i = w.indices
    assert i["langelier"] == pytest.approx(w.pH - i["ph_s"], abs=1e-12)
    assert i["ryznar"] == pytest.approx(2 * i["ph_s"] - w.pH, abs=1e-12)
    assert i["langelier_available"] and isinstance(i["ccpp_mg_per_l_as_caco3"], float)


def test_to_dict_is_the_run_json_entry():
    w = deltag.speciate(HARD, pH=7.4)
    d = w.to_dict()
    assert (d["label"], d["kind"]) == ("sample", "water")
    assert d["pH"] == w.pH and d["ionic_strength"] == w.ionic_strength
    # The same species and saturation as the attributes, number for number.
    assert {s["name"]: (s["molality"], s["activity"]) for s in d["species"]} == w.species
    assert {s["phase"]: (s["si"], s["delta_g_kj_per_mol"]) for s in d["saturation"]} == w.saturation
    assert {g["name"]: g["log_partial_pressure_atm"] for g in d["gases"]} == w.gases
    assert d["indices"] == w.indices


def test_analyte_forms_of_a_case_file():
    # The same calcium four ways: mg/L, mmol/L (40 mg/L = 0.998 mmol/L, 40.078 g/mol),
    # a {value, unit} dict, and as CaCO3 (100 mg/L as CaCO3 = 40.04 mg/L Ca).
    base = {"Cl": 71}
    ways = [{"Ca": 40.078}, {"Ca": {"value": 1.0, "unit": "mmol/L"}},
            {"Ca": {"value": 100.087, "as": "CaCO3"}}]
    totals = []
    for extra in ways:
        w = deltag.speciate({**base, **extra}, pH=7.0)
        totals.append(sum(m for n, (m, _) in w.species.items() if n.startswith("Ca")))
    for t in totals[1:]:
        assert t == pytest.approx(totals[0], rel=1e-4)
    # Below detection: "<0.1" counts as half the limit by default, the limit with "limit".
    half = deltag.speciate({**base, "Ca": 40, "Mg": "<2.4305"}, pH=7.0)
    full = deltag.speciate({**base, "Ca": 40, "Mg": "<2.4305"}, pH=7.0, below_detection="limit")
    mg = lambda w: sum(m for n, (m, _) in w.species.items() if n.startswith("Mg"))
    # (mg/L to mol/kgw goes through the density and dissolved solids, which differ by the
    # 1.2 mg/L more magnesium: a few parts per million.)
    assert mg(full) == pytest.approx(2 * mg(half), rel=1e-5)
    # Redox states given apart, as a case file writes them.
    fe = deltag.speciate({**base, "Ca": 40, "Fe": {"+2": 0.5, "+3": 0.05}}, pH=6.5)
    assert fe.species["Fe^2+"][0] > fe.species["Fe^3+"][0]


def _calcite_saturated(ph=8.1):
    # The calcium that puts a water (pH fixed, 3 mmol/L HCO3) at calcite saturation, by the
    # secant method on log10 Ca; sodium closes the charge balance.
    def si(log_ca):
        w = deltag.speciate({"Ca": {"value": 1000 * 10 ** log_ca, "unit": "mmol/L"},
                             "HCO3": {"value": 3.0, "unit": "mmol/L"},
                             "Cl": {"value": 0.1, "unit": "mmol/L"},
                             "Na": {"value": 1.0, "unit": "mmol/L"}},
                            pH=ph, charge_balance="Na")
        return w.saturation["Calcite"][0], w
    x0, x1 = -4.0, -3.3
    f0, f1 = si(x0)[0], si(x1)[0]
    for _ in range(50):
        if abs(f1) <= 1e-10:
            break
        x0, x1 = x1, x1 - f1 * (x1 - x0) / (f1 - f0)
        f0, f1 = f1, si(x1)[0]
    return si(x1)[1]


def test_calcite_saturated_water():
    # At calcite saturation SI = 0 and Delta G = 0; the pH of calcite saturation pHs is then
    # the water's pH, so LSI = 0 and RSI = pH (Standard Methods 2330 B's definitions), and
    # no calcium carbonate precipitates or dissolves (CCPP = 0).
    w = _calcite_saturated()
    si, dg = w.saturation["Calcite"]
    assert abs(si) <= 1e-8
    assert abs(dg) <= 1e-8 * RT_LN10_KJ_25C
    assert w.indices["langelier"] == pytest.approx(0.0, abs=1e-4)
    assert w.indices["ryznar"] == pytest.approx(w.pH, abs=2e-4)
    assert w.indices["ccpp_mg_per_l_as_caco3"] == pytest.approx(0.0, abs=0.01)


# --- electrochemistry ---------------------------------------------------------------------

def test_daniell_cell():
    # Cu|Zn at unit activities: E° = 0.33938 - (-0.7618) = 1.101 V with the core database
    # (Wagman et al. 1982 for Cu, Bard, Parsons & Jordan 1985 for Zn); the textbook 1.100 V.
    c = deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)",
                    activities={"Cu^2+": 1, "Zn^2+": 1})
    assert abs(c.e0_v - 1.100) <= 0.002
    assert c.e0_v == pytest.approx(0.33938 + 0.7618, abs=1e-9)
    assert c.n == 2
    assert c.e_v == pytest.approx(c.e0_v, abs=1e-12)  # unit activities
    assert c.delta_g0_kj_per_mol == pytest.approx(-2 * FARADAY * c.e0_v / 1000, rel=1e-12)
    assert c.log_k == pytest.approx(2 * FARADAY * c.e0_v / (8.314462618 * 298.15 * math.log(10)), rel=1e-12)
    assert c.spontaneous
    assert c.to_dict()["e0_v"] == pytest.approx(c.e0_v)
    # Nernst: a(Cu2+) 0.01 lowers E by (RT ln10 / 2F) x 2 = 0.0592 V (CODATA 2018 constants).
    dilute = deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)",
                         activities={"Cu^2+": 0.01, "Zn^2+": 1})
    slope = 8.314462618 * 298.15 * math.log(10) / FARADAY
    assert c.e_v - dilute.e_v == pytest.approx(slope, rel=1e-9)


def test_sce_against_she():
    # SCE +0.241 V vs SHE at 25 degC (common practice, as tests/test_electro.cpp).
    assert deltag.convert_potential(0.0, "SCE", "SHE") == pytest.approx(0.241, abs=1e-12)
    assert deltag.convert_potential(0.241, "SHE", "SCE", temperature_c=25.0) == pytest.approx(0.0, abs=1e-12)
    assert "SCE" in deltag.reference_electrodes()


# --- errors ---------------------------------------------------------------------------------

def test_unknown_analyte_is_an_input_error_with_key_and_suggestion():
    with pytest.raises(deltag.InputError) as e:
        deltag.speciate({"Ca": 40, "Mgg": 10})
    err = e.value
    assert err.file == "deltag.speciate"
    assert err.line == 0
    assert err.key == "analytes.Mgg"
    assert err.suggestion == "Mg"
    assert err.message and err.message in str(err)
    assert isinstance(err, ValueError) and isinstance(err, deltag.Error)


def test_argument_errors_name_the_argument():
    with pytest.raises(deltag.InputError) as e:
        deltag.speciate({"Ca": 40}, temperature_c=150)
    assert e.value.key == "temperature_c"
    with pytest.raises(deltag.InputError) as e:
        deltag.speciate({"Ca": 40}, units="mg/gallon")
    assert e.value.key == "units"
    with pytest.raises(deltag.InputError) as e:
        deltag.speciate({"Ca": 40}, activity_model="extended")
    assert e.value.key == "activity_model"
    with pytest.raises(deltag.InputError) as e:
        deltag.speciate({"Ca": 40}, database="/nonexistent/deltag-db.toml")
    assert e.value.key == "database"
    assert "no database file" in e.value.message


def test_no_solution_error():
    # Charge balance on chloride for a water whose anions already exceed its cations: it
    # would need a negative chloride.
    with pytest.raises(deltag.NoSolutionError) as e:
        deltag.speciate({"Na": 1, "Cl": 500, "SO4": 500}, pH=7.0, charge_balance="Cl")
    assert isinstance(e.value, deltag.InputError)
    assert e.value.file == "sample"  # the solver names the water, as at the command line
    assert e.value.key == "charge_balance" and "negative amount" in e.value.message


def test_python_type_errors():
    with pytest.raises(TypeError, match="analytes must be a dict"):
        deltag.speciate([("Ca", 40)])
    with pytest.raises(TypeError, match="'analytes.Ca': expected a number"):
        deltag.speciate({"Ca": None})
    with pytest.raises(TypeError, match="keys must be strings"):
        deltag.speciate({1: 40})


def test_cell_and_potential_errors():
    with pytest.raises(deltag.InputError) as e:
        deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)", activities={"Cu^2+": 1, "Zn^2+": 0})
    assert e.value.key == "activities" and "positive number" in e.value.message
    with pytest.raises(deltag.InputError) as e:
        deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)", activities={"Cu^2+": 1})
    assert e.value.file == "deltag.cell"  # a missing activity names the species
    assert "Zn^2+" in str(e.value)
    with pytest.raises(deltag.InputError) as e:
        deltag.cell("Cux^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)")
    assert e.value.key == "cathode"
    with pytest.raises(deltag.InputError) as e:
        deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)", pH=15)
    assert e.value.key == "pH" and "0-14" in e.value.message
    with pytest.raises(deltag.InputError) as e:
        deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)", temperature_c=-5)
    assert e.value.key == "temperature_c"
    with pytest.raises(deltag.InputError) as e:
        deltag.convert_potential(0.1, "SCX", "SHE")
    assert e.value.suggestion == "SCE" and e.value.file == "deltag.convert_potential"
    with pytest.raises(deltag.InputError) as e:
        deltag.convert_potential(0.1, "SCE", "SHE", temperature_c=120)
    assert e.value.key == "temperature_c" and "expected a temperature from 0 to 100 °C" in e.value.message
    with pytest.raises(deltag.InputError) as e:
        deltag.convert_potential(float("nan"), "SCE", "SHE")
    assert e.value.key == "value_v"


def test_each_library_error_becomes_its_class_with_its_parts():
    # The translator, fed each C++ error kind: the text is the library's what(), as the
    # command line prints it, and the parts are attributes.
    from deltag import _core
    with pytest.raises(deltag.InputError) as e:
        _core._throw_library_error("input")
    assert type(e.value) is deltag.InputError
    assert str(e.value) == "case.toml:12:3: 'water.tap.analytes.Ca': expected a number (did you mean 'Cl'?)"
    assert (e.value.file, e.value.line, e.value.column) == ("case.toml", 12, 3)
    assert (e.value.key, e.value.message, e.value.suggestion) == ("water.tap.analytes.Ca", "expected a number", "Cl")
    with pytest.raises(deltag.NoSolutionError) as e:
        _core._throw_library_error("no_solution")
    assert e.value.key == "charge_balance" and e.value.suggestion == ""
    with pytest.raises(deltag.ConvergenceError) as e:
        _core._throw_library_error("convergence")
    err = e.value
    assert isinstance(err, RuntimeError) and isinstance(err, deltag.Error)
    assert (err.subject, err.residual_norm, err.reason, err.hint) == ("water 'tap'", 0.25, "line search failed", "give a pH")
    assert str(err) == "water 'tap': did not converge (line search failed; scaled residual 0.25); give a pH"
    with pytest.raises(RuntimeError, match="unknown kind"):  # any other C++ error: a RuntimeError
        _core._throw_library_error("other")


# --- documentation and threads ----------------------------------------------------------------

def test_docstrings_present():
    assert deltag.__doc__ and "PYTHONPATH=build/python" in deltag.__doc__
    for name in deltag.__all__:
        obj = getattr(deltag, name)
        assert inspect.getdoc(obj), name
    for cls in (deltag.Water, deltag.Cell):
        assert inspect.getdoc(cls.to_dict)
    # The reports' cautions, for results that feed safety decisions.
    assert "licensed engineers" in deltag.caution
    assert "cathodic-protection" in deltag.electro_caution


def _sample(i):
    return {"Ca": 20 + 7 * i, "Mg": 5 + i, "Na": 10 + 3 * i, "Cl": 15 + 2 * i, "SO4": 20 + i,
            "Alkalinity": {"value": 60 + 11 * i, "as": "CaCO3"}}


def _fingerprint(w):
    return (w.pH, w.ionic_strength, w.species, w.saturation, w.to_dict())


def test_threads_give_identical_results():
    samples = [(_sample(i), 5.0 + 3 * i) for i in range(16)]
    run = lambda s: _fingerprint(deltag.speciate(s[0], temperature_c=s[1], pH=7.0 + 0.05 * s[1]))
    serial = [run(s) for s in samples]
    with concurrent.futures.ThreadPoolExecutor(max_workers=4) as pool:
        threaded = list(pool.map(run, samples))
    assert threaded == serial


def test_readme_session():
    # The README's notebook session runs as shown (numbers to the digits it prints).
    import doctest
    import pathlib
    readme = (pathlib.Path(__file__).resolve().parents[2] / "README.md").read_text(encoding="utf-8")
    start = readme.index("```python", readme.index("## Using deltag from C++ and Python"))
    block = readme[start + len("```python"):readme.index("```", start + 3)]
    test = doctest.DocTestParser().get_doctest(block, {}, "README session", "README.md", 0)
    runner = doctest.DocTestRunner(optionflags=doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE)
    runner.run(test)
    assert runner.failures == 0 and runner.tries > 10


def test_database_file_errors_keep_their_file_and_line(tmp_path):
    # An error inside a database file points into that file, as at the command line.
    db = tmp_path / "broken.toml"
    db.write_text('[sources.x]\ncitation = "invented for a test"\n[components.H2O\n', encoding="utf-8")
    with pytest.raises(deltag.InputError) as e:
        deltag.speciate({}, database=str(db))
    assert e.value.file == str(db)
    assert e.value.line == 3
    with pytest.raises(deltag.InputError) as e:
        deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)", database=str(db))
    assert e.value.file == str(db) and e.value.line == 3


def test_a_database_that_fails_its_lint_is_refused(tmp_path):
    # The lint gate of the command line: an error-level finding (here a citation too short to
    # find the source) refuses the database, naming the entry and its line.
    db = tmp_path / "short-citation.toml"
    db.write_text("\n".join([
        "[sources.x]", 'citation = "abc"',
        "[components.H2O]", 'source = "x"', "temperature_range_c = [0, 100]",
        '[components."H+"]', 'source = "x"', "temperature_range_c = [0, 100]", "ion_size_angstrom = 9",
        '[components."e-"]', 'source = "x"', "temperature_range_c = [0, 100]", ""]), encoding="utf-8")
    with pytest.raises(deltag.InputError) as e:
        deltag.speciate({}, database=str(db))
    assert e.value.key == "sources.x"
    assert e.value.file == str(db) and e.value.line == 1
    assert "too short" in e.value.message and "deltag database check" in e.value.message


def test_cell_metal_ion_convention():
    # a = 1e-6 for the dissolved ions of each electrode's metal (common practice in corrosion
    # work); a given activity wins. Cu^2+ given 1, Zn^2+ at 1e-6: Nernst gives
    # E = E° - (RT ln10 / 2F) log10(1e-6 / 1) = E° + 3 x 0.05916 V (CODATA 2018 constants).
    c = deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)", activities={"Cu^2+": 1},
                    metal_ion_activity=1e-6)
    slope = 8.314462618 * 298.15 * math.log(10) / FARADAY
    assert c.e_v - c.e0_v == pytest.approx(3 * slope, rel=1e-9)
    with pytest.raises(deltag.InputError) as e:
        deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)", metal_ion_activity=2.0)
    assert e.value.key == "metal_ion_activity" and "at most 1" in e.value.message


def test_results_and_errors_pickle():
    # Results and errors cross process boundaries (multiprocessing, a cluster) intact.
    import pickle
    w = deltag.speciate(HARD, pH=7.4)
    w2 = pickle.loads(pickle.dumps(w))
    assert (w2.pH, w2.species, w2.saturation, w2.indices, w2.to_dict()) == (w.pH, w.species, w.saturation, w.indices, w.to_dict())
    c = deltag.cell("Cu^2+ + 2 e- = Cu(s)", "Zn^2+ + 2 e- = Zn(s)", activities={"Cu^2+": 1, "Zn^2+": 1})
    assert pickle.loads(pickle.dumps(c)).to_dict() == c.to_dict()
    with pytest.raises(deltag.InputError) as e:
        deltag.speciate({"Mgg": 1})
    e2 = pickle.loads(pickle.dumps(e.value))
    assert (str(e2), e2.key, e2.file, e2.suggestion) == (str(e.value), "analytes.Mgg", "deltag.speciate", "Mg")


# --- a whole case ---------------------------------------------------------------------------

import json
import os
import pathlib
import shutil
import subprocess

REPO = pathlib.Path(__file__).resolve().parents[2]
CLI = os.environ.get("DELTAG_BINARY", str(REPO / "build" / "deltag"))


def _cli(args, cwd):
    return subprocess.run([CLI] + args, cwd=cwd, capture_output=True, text=True)


@pytest.mark.parametrize("case", ["hard-well.toml", "cooling-tower.toml", "loop-corrosion.toml"])
def test_run_case_is_the_commands_json(case, tmp_path, monkeypatch):
    # The same case through the command and through Python: the same JSON, value for value
    # (steps, a sweep, cells and diagrams among the three cases).
    path = tmp_path / case
    shutil.copy(REPO / "cases" / case, path)
    monkeypatch.chdir(tmp_path)
    ours = deltag.run_case(str(path))
    assert sorted(p.name for p in tmp_path.iterdir()) == [case]  # nothing written by default
    cli = _cli(["run", str(path), "--format", "json"], tmp_path)
    assert cli.returncode == 0, cli.stderr
    assert ours == json.loads(cli.stdout)


def test_run_case_text_and_files(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    text = (REPO / "cases" / "hard-well.toml").read_text(encoding="utf-8")
    assert deltag.run_case(text) == deltag.run_case(str(REPO / "cases" / "hard-well.toml"))
    # With write_files, the files the case asks for are written, as by the command.
    case = tmp_path / "loop.toml"
    shutil.copy(REPO / "cases" / "loop-corrosion.toml", case)
    report = deltag.run_case(str(case), write_files=True)
    written = [d[k] for d in report["diagrams"] for k in ("svg", "csv")]
    assert written and all(pathlib.Path(f).is_file() for f in written)


def test_run_case_errors_are_the_commands(tmp_path):
    # The message, file, line and key the command prints for a bad case.
    case = tmp_path / "bad.toml"
    case.write_text('title = "invented for a test"\n[water.tap]\npH = 7.2\n'
                    '[water.tap.analytes]\nCa = 40\nMgg = 10\n', encoding="utf-8")
    with pytest.raises(deltag.InputError) as e:
        deltag.run_case(str(case))
    assert (e.value.file, e.value.line, e.value.key) == (str(case), 6, "water.tap.analytes.Mgg")
    cli = _cli(["run", str(case)], tmp_path)
    assert cli.returncode == 2
    assert cli.stderr.strip() == "deltag: error: " + str(e.value)
    with pytest.raises(deltag.InputError) as e:
        deltag.run_case(str(tmp_path / "missing.toml"))
    cli = _cli(["run", str(tmp_path / "missing.toml")], tmp_path)
    assert cli.stderr.strip() == "deltag: error: " + str(e.value)
    # As text: messages name "deltag.run_case" and the line in the text.
    with pytest.raises(deltag.InputError) as e:
        deltag.run_case(case.read_text(encoding="utf-8"))
    assert (e.value.file, e.value.line, e.value.key) == ("deltag.run_case", 6, "water.tap.analytes.Mgg")
