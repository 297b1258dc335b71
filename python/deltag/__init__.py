"""deltag: water chemistry for water-treatment and corrosion engineers, from Python.

Speciation, saturation and water-treatment indices of a lab analysis, electrochemical cells
and reference-electrode conversions, computed by the deltag C++ library (the same code as
the ``deltag`` command). From a build tree, without installing::

    PYTHONPATH=build/python python3 -c 'import deltag'

Example::

    import deltag
    w = deltag.speciate({"Ca": 40, "Mg": 10, "Na": 25, "Cl": 40, "SO4": 30,
                         "Alkalinity": {"value": 120, "as": "CaCO3"}},
                        pH=7.8, temperature_c=15)
    w.pH, w.ionic_strength
    w.saturation["Calcite"]          # (saturation index, Delta G in kJ/mol)
    w.indices["langelier"]

Errors raise the exceptions of ``deltag.errors`` (InputError, NoSolutionError,
ConvergenceError), carrying the message, file, line and key the command line prints.
The functions release the GIL while they compute, so threads run them in parallel.

``deltag.caution`` (every water) and ``deltag.electro_caution`` (cells) are the cautions the
command's reports carry; show them with results that feed decisions on drinking water,
dosing, pressure equipment or cathodic protection, which follow local codes and rest with
licensed engineers.
"""

import json as _json
import math as _math
import numbers as _numbers
from collections.abc import Mapping as _Mapping

from . import _core
from .errors import ConvergenceError, Error, InputError, NoSolutionError

__version__ = _core.__version__
caution = _core.caution
electro_caution = _core.electro_caution

__all__ = ["run_case", "run_samples", "speciate", "Water", "cell", "Cell", "convert_potential", "reference_electrodes",
           "Error", "InputError", "NoSolutionError", "ConvergenceError"]


# --- a whole case ----------------------------------------------------------------------------

def run_case(path_or_toml_text, database=None, write_files=False):
    """Runs a case and returns its report as Python objects: exactly the JSON of
    ``deltag run CASE --format json`` (``"results"``: the waters then the steps; ``"cells"``,
    ``"diagrams"``, ``"sweeps"``; ``"caution"``).

    Args:
        path_or_toml_text: the path of a case file, or the case itself as TOML text (a string
            with a line break is taken as text; paths in it are taken from the current
            directory, and messages name it "deltag.run_case").
        database: replaces the case's database choice ("core" or a path), as ``--database``.
        write_files: also write the files the case asks for (sweep tables and plots,
            diagrams), all or none, as the command does; by default nothing is written.

    Raises:
        deltag.InputError: bad input, with the file, line, column and key the command prints.
        deltag.NoSolutionError, deltag.ConvergenceError: as for :func:`speciate`.
    """
    text = str(path_or_toml_text)
    return _json.loads(_core.run_case_json(text, "\n" in text, database or "", bool(write_files)))


# --- a table of samples ---------------------------------------------------------------------

def _csv_field(v):
    if v is None or (isinstance(v, float) and _math.isnan(v)):
        return ""
    s = repr(v) if isinstance(v, float) else str(v)
    if any(c in s for c in ',"\r\n'):
        s = '"' + s.replace('"', '""') + '"'
    return s


def run_samples(table, case, water=None, threads=1, database=None):
    """Runs a table of samples through one case, as ``deltag batch`` does, and returns one row
    per sample and result (the sample's water, then each step of the case).

    Args:
        table: the samples: a pandas DataFrame, or a list of dicts (one per sample). A
            ``sample`` column names each sample (unique); every other column is a water setting
            or an analyte written as a lab writes it, with its unit and ``as`` in parentheses:
            ``"Ca (mg/L)"``, ``"Alkalinity (mg/L as CaCO3)"``, ``"Temperature (°C)"``, ``"pH"``.
            A bare analyte takes the template water's unit; a missing value (None, NaN, "")
            is "not measured"; ``"<0.05"`` follows the case's below-detection rule.
        case: the path of the case file whose water is the template and whose steps apply to
            every sample.
        water: the template water of the case (default: its only water).
        threads: samples solved at once; the rows and numbers do not depend on it.
        database: replaces the case's database choice ("core" or a path).

    Returns:
        A pandas DataFrame when ``table`` is one, else a list of dicts: the columns ``sample``,
        ``result``, ``status`` (``"ok"``, ``"bad input"``, ``"no convergence"``), ``message``,
        the figures, the indices, and SI and ΔG of every mineral in any row (units in the
        names), exactly the columns of ``deltag batch --output OUT.json``. A bad or unsolvable
        sample never stops the others. A DataFrame carries the summary line the command
        prints on stderr in ``df.attrs["summary"]`` ("4 solved, 1 bad input").

    The samples are independent, so a large table splits into shards run anywhere and
    concatenated in shard order; on a Dask cluster::

        futures = client.map(functools.partial(deltag.run_samples, case=path), shards)
        rows = [row for shard in client.gather(futures) for row in shard]

    Raises:
        deltag.InputError: a bad header (an unknown or repeated column, a unit that does not
            fit, no ``sample`` column), a case file that cannot be read, with file, line and key.
    """
    frame = None
    if hasattr(table, "to_dict") and hasattr(table, "columns"):
        frame = table
        columns = [str(c) for c in table.columns]
        rows = table.to_dict("records")
    else:
        rows = list(table)
        columns = []
        for r in rows:
            for k in r:
                if str(k) not in columns:
                    columns.append(str(k))
    lines = [",".join(_csv_field(c) for c in columns)]
    for r in rows:
        lines.append(",".join(_csv_field(r.get(c)) for c in columns))
    out, summary = _core.run_samples_json(str(case), "\n".join(lines) + "\n", water or "", database or "",
                                          int(threads))
    result = _json.loads(out)
    if frame is not None:
        import pandas
        df = pandas.DataFrame(result)
        df.attrs["summary"] = summary
        return df
    return result


# --- the case text deltag.speciate builds from its arguments --------------------------------

def _toml_string(s):
    # JSON escapes are TOML basic-string escapes; TOML also forbids a raw DEL.
    return _json.dumps(s, ensure_ascii=False).replace("\x7f", "\\u007F")


def _toml_value(v, key):
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, _numbers.Integral):
        return str(int(v))
    if isinstance(v, _numbers.Real):
        f = float(v)
        if _math.isnan(f):
            return "nan"
        if _math.isinf(f):
            return "inf" if f > 0 else "-inf"
        return repr(f)
    if isinstance(v, str):
        return _toml_string(v)
    if isinstance(v, _Mapping):
        return "{" + ", ".join(_toml_key(k, key) + " = " + _toml_value(x, key + "." + str(k))
                               for k, x in v.items()) + "}"
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(_toml_value(x, key) for x in v) + "]"
    raise TypeError(f"deltag: '{key}': expected a number, a string such as \"<0.05\" or a dict "
                    f"{{value, unit, as}}, found {type(v).__name__}")


def _toml_key(k, key):
    if not isinstance(k, str):
        raise TypeError(f"deltag: '{key}': keys must be strings, found {type(k).__name__} {k!r}")
    return _toml_string(k)


def _case_text(name, analytes, water_keys, top_keys):
    lines = [f"{k} = {_toml_value(v, k)}" for k, v in top_keys.items() if v is not None]
    lines.append(f"[water.{_toml_string(name)}]")
    lines += [f"{k} = {_toml_value(v, k)}" for k, v in water_keys.items() if v is not None]
    lines.append(f"[water.{_toml_string(name)}.analytes]")
    for k, v in analytes.items():
        lines.append(f"{_toml_key(k, 'analytes')} = {_toml_value(v, 'analytes.' + str(k))}")
    return "\n".join(lines) + "\n"


# --- speciation ----------------------------------------------------------------------------

class Water:
    """A speciated water, as returned by :func:`speciate`.

    Attributes:
        label: the water's name.
        temperature_c: temperature, degC.
        pH: the pH (given, or from the charge balance).
        pe: the pe, or None when the water has no redox level.
        ionic_strength: ionic strength, mol/kg of water.
        species: name -> (molality in mol/kgw, activity), every species of the water.
        saturation: mineral -> (saturation index, Delta G of dissolution in kJ/mol);
            SI > 0 (Delta G > 0): the water would precipitate it.
        gases: gas -> log10 of its partial pressure in equilibrium with the water (atm).
        indices: the water-treatment indices, keyed as in the JSON report: "langelier",
            "ryznar", "ph_s" (None, with "langelier_unavailable_because", when calcite
            saturation is out of reach; Standard Methods 2330, Ryznar 1944),
            "ccpp_mg_per_l_as_caco3" (calcium carbonate precipitation potential; None with
            "ccpp_unavailable_because"), the simplified-formula cross-checks and readings.
        warnings: what the calculation assumed or noticed, in words.
        database: the database used.
    """

    __slots__ = ("label", "temperature_c", "pH", "pe", "ionic_strength", "species", "saturation",
                 "gases", "warnings", "database", "indices", "_json")

    def __init__(self, core_water):
        for name in self.__slots__[:-2]:
            setattr(self, name, getattr(core_water, name))
        self._json = core_water.json
        self.indices = self.to_dict()["indices"]

    def to_dict(self):
        """The water as plain Python objects: exactly its entry in the "results" of
        ``deltag run --format json`` (species, saturation, indices, figures, outlook, solver)."""
        return _json.loads(self._json)["results"][0]

    def __repr__(self):
        return (f"<deltag.Water {self.label!r}: pH {self.pH:.3f}, I {self.ionic_strength:.4g} mol/kgw, "
                f"{self.temperature_c:g} degC>")


def speciate(analytes=None, units="mg/L", temperature_c=25.0, pH=None, *, pe=None, eh_mv=None,
             reference=None, dissolved_oxygen_mg_per_l=None, charge_balance=None,
             density_kg_per_l=None, below_detection=None, measured_tds_mg_per_l=None,
             measured_conductance_25c_us_per_cm=None, activity_model=None, database="core",
             name="sample"):
    """Speciates one water from a lab analysis and returns a :class:`Water`.

    The arguments are the keys of a water in a case file, with the same meaning, defaults
    and checks: the function writes them as a case with one water and runs it as
    :func:`run_case` does.

    Args:
        analytes: dict of analyte -> value, as a case file's analytes table takes them: a
            number (in ``units``), a string below a detection limit (``"<0.05"``), a dict
            ``{"value": 120, "unit": "mg/L", "as": "CaCO3"}``, or for an element given by
            redox state a dict of states (``{"+2": 2.4, "+3": 0.3}``). None or {}: pure water.
        units: the default unit of the analytes ("mg/L", "mmol/L", "mg/kg", "ug/L", ...).
        temperature_c: temperature, degC (0-100).
        pH: the measured pH; None: the pH closes the charge balance.
        pe, eh_mv, dissolved_oxygen_mg_per_l: the redox level (at most one); ``reference``
            names the electrode ``eh_mv`` was read against (default SHE).
        charge_balance: "pH" or the analyte adjusted to close the charge balance.
        density_kg_per_l: solution density; default from the temperature and dissolved solids.
        below_detection: what a "<limit" value counts as: "half" (default), "zero", "limit".
        measured_tds_mg_per_l, measured_conductance_25c_us_per_cm: the lab's measured values,
            checked against the calculated ones (Standard Methods 1030 E) in to_dict().
        activity_model: "davies" (default), "ideal", "debye-huckel", "truesdell-jones", "b-dot".
        database: "core" (the embedded database) or the path of a database file.
        name: the water's name in results and messages.

    Raises:
        deltag.InputError: a value the library refuses; ``e.key`` names the argument
            ("analytes.Ca", "pH") and ``e.file`` is "deltag.speciate".
        deltag.NoSolutionError: no water satisfies the input.
        deltag.ConvergenceError: the solver did not converge.
    """
    if analytes is None:
        analytes = {}
    if not isinstance(analytes, _Mapping):
        raise TypeError(f"deltag.speciate: analytes must be a dict, found {type(analytes).__name__}")
    water_keys = {
        "temperature_c": temperature_c, "pH": pH, "pe": pe, "eh_mv": eh_mv, "reference": reference,
        "dissolved_oxygen_mg_per_l": dissolved_oxygen_mg_per_l, "charge_balance": charge_balance,
        "units": units, "density_kg_per_l": density_kg_per_l, "below_detection": below_detection,
        "measured_tds_mg_per_l": measured_tds_mg_per_l,
        "measured_conductance_25c_us_per_cm": measured_conductance_25c_us_per_cm,
    }
    top_keys = {"activity_model": activity_model, "database": database}
    text = _case_text(str(name), analytes, water_keys, top_keys)
    return Water(_core.speciate_text(text, "deltag.speciate", str(name)))


# --- electrochemistry ------------------------------------------------------------------------

class Cell:
    """An electrochemical cell, as returned by :func:`cell`.

    Attributes:
        cathode, anode: the half-reactions as given.
        temperature_c: degC.
        n: electrons of the cell reaction.
        e0_v: standard cell potential E°cathode - E°anode at the temperature, V.
        e_v: cell potential at the activities (Nernst), V.
        delta_g0_kj_per_mol, delta_g_kj_per_mol: -n F E° and -n F E, kJ/mol.
        log_k: log10 of the equilibrium constant, n F E° / (RT ln 10).
        spontaneous: E > 0, the cell runs as written (the cathode is reduced).
        cathode_origin, anode_origin: where each E° came from (electrode and source).
        warnings: notes on the calculation.

    ``to_dict()`` adds each electrode's potential and where each activity came from.
    """

    __slots__ = ("cathode", "anode", "temperature_c", "n", "e0_v", "e_v", "delta_g0_kj_per_mol",
                 "delta_g_kj_per_mol", "log_k", "spontaneous", "cathode_origin", "anode_origin",
                 "warnings", "_json")

    def __init__(self, core_cell):
        for name in self.__slots__[:-1]:
            setattr(self, name, getattr(core_cell, name))
        self._json = core_cell.json

    def to_dict(self):
        """The cell as plain Python objects: exactly its entry in the "cells" of
        ``deltag cell --format json``."""
        return _json.loads(self._json)["cells"][0]

    def __repr__(self):
        return f"<deltag.Cell E° {self.e0_v:+.4f} V, E {self.e_v:+.4f} V, n {self.n:g}>"


def cell(cathode, anode, activities=None, temperature_c=25.0, pH=None, metal_ion_activity=None,
         database="core"):
    """An electrochemical cell from two half-reactions; returns a :class:`Cell`.

    Args:
        cathode, anode: half-reactions as written in a case file, e.g.
            ``"Cu^2+ + 2 e- = Cu(s)"``. E° comes from a database electrode with the same
            reaction, else from the log K of its species.
        activities: dict species -> activity (gases: fugacity in atm) for the Nernst
            equation; solids and water are 1 unless given. Every dissolved species and gas
            of the two reactions needs one.
        temperature_c: degC (0-100).
        pH: sets the activity of H+ (10^-pH); an "H+" in activities takes precedence.
        metal_ion_activity: every dissolved species of an electrode's metal at this activity
            (the corrosion convention: 1e-6, common practice); a value in activities wins.
        database: "core" or the path of a database file.

    Raises:
        deltag.InputError: an unreadable or unknown half-reaction, a missing or non-positive
            activity, a temperature out of range; ``e.file`` is "deltag.cell".
    """
    acts = {} if activities is None else dict(activities)
    return Cell(_core.cell(cathode, anode, acts, float(temperature_c),
                           None if pH is None else float(pH),
                           None if metal_ion_activity is None else float(metal_ion_activity), database))


def convert_potential(value_v, from_electrode, to_electrode, temperature_c=25.0):
    """A potential read against one reference electrode, expressed against another, V.

    Args:
        value_v: the potential, V, against ``from_electrode``.
        from_electrode, to_electrode: reference electrode names ("SHE", "SCE",
            "Ag/AgCl(sat KCl)", ... see :func:`reference_electrodes`).
        temperature_c: degC (0-100); the electrodes' potentials follow it.

    Reference electrode potentials are common-practice values; they vary by a few mV
    between makers.

    Raises:
        deltag.InputError: an unknown electrode (with the nearest name in ``e.suggestion``)
            or a temperature out of range; ``e.file`` is "deltag.convert_potential".
    """
    return _core.convert_potential(float(value_v), from_electrode, to_electrode, float(temperature_c))


def reference_electrodes():
    """The names of the reference electrodes :func:`convert_potential` knows."""
    return list(_core.reference_electrodes())
