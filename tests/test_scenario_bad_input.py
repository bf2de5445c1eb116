"""Bad scenario input: a clear error at file:line:column naming the key, or a right answer.

Covers the reproducers of the "no silent wrong answer" issue for the scenario
layer (mixed currencies, typo'd keys, values outside their physical domain that
``scenario check`` used to pass and ``rank`` rejected without a location, work
limits) and a scenario-key matrix: every key of the starter files
(``heatpath scenario new KIND``) and of ``examples/*.toml`` × {missing, wrong
type, wrong unit, out of domain}.

Physical domains used below are common-practice facts, not taken from a
published table: a thickness, length or area is > 0; an absolute temperature is
above 0 K (the definition of the kelvin scale, SI Brochure, 9th edition, 2019,
section 2.3.1); a surface resistance is >= 0; an emissivity lies in [0, 1]
(Kirchhoff's law, any heat-transfer textbook); a share or packing fraction in
(0, 1]. The example scenarios are invented demo data.
"""

from __future__ import annotations

import copy
import re
import tomllib
from pathlib import Path

import pytest

from workbench import units
from workbench.scenario import (
    DEFAULT_LIMITS,
    ScenarioError,
    check_scenario,
    dumps_toml,
    load_scenario,
    parse_inputs,
    starter_text,
    study_kind,
)

ROOT = Path(__file__).resolve().parent.parent
EXAMPLES = ROOT / "examples"
KINDS = ("wall", "shipper", "housing")


def _write(tmp_path: Path, text: str, name: str = "bad.toml") -> Path:
    p = tmp_path / name
    p.write_text(text, "utf-8")
    return p


def _check(path: Path):
    """What ``heatpath scenario check`` does: load, then build the study as ``rank`` does."""
    return check_scenario(load_scenario(path))


def _error(path: Path) -> ScenarioError:
    with pytest.raises(ScenarioError) as err:
        _check(path)
    return err.value


def _located(err: ScenarioError, path: Path) -> list[tuple[int, int, str, str]]:
    """``(line, column, key, why)`` of every problem; each must carry file:line:column."""
    out = []
    for prob in err.problems:
        m = re.match(rf"^{re.escape(str(path))}:(\d+):(\d+): (\S+): (.+)$", prob, re.S)
        assert m, f"no file:line:column in {prob!r}"
        out.append((int(m.group(1)), int(m.group(2)), m.group(3), m.group(4)))
    return out


def _at(text: str, line: int, column: int) -> str:
    return text.splitlines()[line - 1][column - 1 :]


def _replace(kind: str, old: str, new: str) -> str:
    text = (EXAMPLES / f"{kind}.toml").read_text("utf-8")
    assert old in text, old
    return text.replace(old, new, 1)


# ---------------------------------------------------------------------------
# Reproducer 3: currencies are never mixed
# ---------------------------------------------------------------------------
@pytest.mark.parametrize(
    ("old", "new", "key", "code"),
    [
        ('rate_per_kg = "1.5 EUR/kg"', 'rate_per_kg = "1.5 USD/kg"', "inputs.rate_per_kg", "USD"),
        ('fixed_fee = "5 EUR"', 'fixed_fee = "5 GBP"', "inputs.fixed_fee", "GBP"),
        ('fixed_fee = "5 EUR"', 'fixed_fee = "5 £"', "inputs.fixed_fee", "GBP"),
        ('rate_per_kg = "1.5 EUR/kg"', 'rate_per_kg = "0.7 CHF/lb"', "inputs.rate_per_kg", "CHF"),
    ],
)
def test_shipper_money_in_another_currency_names_both(tmp_path, old, new, key, code):
    p = _write(tmp_path, _replace("shipper", old, new))
    err = _error(p)
    (line, col, k, why), *_ = _located(err, p)
    assert k == key and code in why and "EUR" in why and "converted" in why
    assert _at(p.read_text("utf-8"), line, col).startswith(key.split(".")[-1])


def test_shipper_money_as_bare_number_takes_the_scenario_currency(tmp_path):
    p = _write(tmp_path, _replace("shipper", 'fixed_fee = "5 EUR"', "fixed_fee = 5"))
    study = _check(p)
    assert study.fixed_fee == 5.0


def test_cost_limit_in_another_currency_is_refused(tmp_path):
    text = _replace(
        "wall",
        'quantity = "total_thickness"\nmax = "150 mm"',
        'quantity = "cost_per_area"\nmax = "40 USD/m²"',
    )
    p = _write(tmp_path, text)
    (line, col, key, why), *_ = _located(_error(p), p)
    assert key == "constraints[0].max" and "USD" in why and "EUR" in why
    assert _at(text, line, col).startswith("max")


def test_mixed_currencies_in_one_constraint_text(tmp_path):
    p = _write(
        tmp_path, _replace("shipper", 'rate_per_kg = "1.5 EUR/kg"', 'rate_per_kg = "1.5 EUR/USD"')
    )
    assert "inputs.rate_per_kg" in str(_error(p))


# ---------------------------------------------------------------------------
# Reproducer 4: unknown keys at every level, with "did you mean"
# ---------------------------------------------------------------------------
TYPOS = [
    # kind, old, new, reported key, suggestion
    (
        "wall",
        '{ material = "pir_32" }',
        '{ material = "pir_32", thicknes = "50 mm" }',
        "candidates[4].layers[1].thicknes",
        "thickness",
    ),
    (
        "wall",
        'name = "steel/PIR/steel panel"',
        'nme = "steel/PIR/steel panel"',
        "candidates[4].nme",
        "name",
    ),
    ("wall", 'title = "', 'titel = "', "titel", "title"),
    ("wall", "t_inside = ", "t_insde = ", "inputs.t_insde", "t_inside"),
    (
        "wall",
        'direction = "minimise"',
        'directon = "minimise"',
        "criteria[0].directon",
        "direction",
    ),
    ("wall", 'max = "150 mm"', 'maxx = "150 mm"', "constraints[0].maxx", "max"),
    ("wall", "rationale = ", "rationle = ", "decision.rationle", "rationale"),
    (
        "shipper",
        '{ material = "corrugated_double_wall", thickness = "7 mm" }',
        '{ material = "corrugated_double_wall", thicknes = "7 mm" }',
        "candidates[2].layers[1].thicknes",
        "thickness",
    ),
    ("shipper", "safety_factor = ", "safety_facter = ", "inputs.safety_facter", "safety_factor"),
    ("housing", 'material = "abs"', 'materal = "abs"', "candidates[0].materal", "material"),
    (
        "housing",
        "component_power = ",
        "component_powr = ",
        "inputs.component_powr",
        "component_power",
    ),
]


@pytest.mark.parametrize(("kind", "old", "new", "key", "hint"), TYPOS)
def test_typo_is_rejected_with_location_and_suggestion(tmp_path, kind, old, new, key, hint):
    text = _replace(kind, old, new)
    p = _write(tmp_path, text)
    probs = _located(_error(p), p)
    hits = [x for x in probs if x[2].startswith(key) and "unknown" in x[3]]
    assert hits, probs
    line, col, k, why = hits[0]
    assert f"did you mean {hint!r}" in why
    assert _at(text, line, col).startswith(k.rsplit(".", 1)[-1].split("[")[0])


def test_typo_in_air_layer_and_vacuum_panel(tmp_path):
    text = _replace(
        "shipper",
        '{ material = "corrugated_double_wall", thickness = "7 mm" }',
        '{ air_layer = "10 mm", direction = "up", emisivity_1 = 0.9 }, '
        '{ vacuum_panel = "20 mm", centre_conductivity = "0.004 W/(m·K)", length = "300 mm", '
        'width = "200 mm", psi_edge = "0.008 W/(m·K)", lenght = "1 m" }',
    )
    p = _write(tmp_path, text)
    why = {k: w for _, _, k, w in _located(_error(p), p)}
    assert "did you mean 'emissivity_1'" in why["candidates[2].layers[1].emisivity_1"]
    assert "did you mean 'length'" in why["candidates[2].layers[2].lenght"]


def test_unknown_limits_key(tmp_path):
    text = (EXAMPLES / "wall.toml").read_text("utf-8") + "\n[limits]\nmax_list_entrys = 5\n"
    p = _write(tmp_path, text)
    (line, col, key, why), *_ = _located(_error(p), p)
    assert key == "limits.max_list_entrys" and "did you mean 'max_list_entries'" in why


# ---------------------------------------------------------------------------
# Reproducer 7: check rejects everything rank would, with file:line:column
# ---------------------------------------------------------------------------
DOMAIN_CASES = [
    # kind, old, new, key reported
    (
        "wall",
        'thickness = "0.6 mm" }, { material = "pir_32" }',
        'thickness = "−5 mm" }, { material = "pir_32" }',
        "candidates[4].layers[0].thickness",
    ),
    (
        "wall",
        'thickness = "0.6 mm" }, { material = "pir_32" }',
        'thickness = "0 mm" }, { material = "pir_32" }',
        "candidates[4].layers[0].thickness",
    ),
    ("wall", '\nthickness = "100 mm"', '\nthickness = "-100 mm"', "inputs.thickness"),
    ("wall", 'area = "', 'area = "0 m²" #', "inputs.area"),
    ("wall", 'r_si = "', 'r_si = "-0.13 m²·K/W" #', "inputs.r_si"),
    ("wall", 'r_se = "', 'r_se = "-1 m²·K/W" #', "inputs.r_se"),
    ("wall", 'budget = "', 'budget = "0 W/m²" #', "inputs.budget"),
    ("wall", 'budget = "', 'budget = "-8 W/m²" #', "inputs.budget"),
    ("wall", 'max_thickness = "', 'max_thickness = "0 mm" #', "inputs.max_thickness"),
    ("wall", 't_inside = "', 't_inside = "-300 °C" #', "inputs.t_inside"),
    ("wall", 't_outside = "', 't_outside = "0 K" #', "inputs.t_outside"),
    ("shipper", 't_payload_min = "2 °C"', 't_payload_min = "9 °C"', "inputs.t_payload_min"),
    ("shipper", 't_payload_start = "5 °C"', 't_payload_start = "12 °C"', "inputs.t_payload_start"),
    (
        "shipper",
        '["12 h", "30 °C"], ["20 h", "25 °C"]',
        '["20 h", "30 °C"], ["12 h", "25 °C"]',
        "inputs.ambient_profile[2][0]",
    ),
    (
        "shipper",
        '["12 h", "30 °C"], ["20 h", "25 °C"]',
        '["12 h", "30 °C"], ["12 h", "25 °C"]',
        "inputs.ambient_profile[2][0]",
    ),
    ("shipper", '[["0 h", "25 °C"]', '[["1 h", "25 °C"]', "inputs.ambient_profile[0][0]"),
    ("shipper", 'duration = "48 h"', 'duration = "-48 h"', "inputs.duration"),
    ("shipper", 'duration = "48 h"', 'duration = "0 h"', "inputs.duration"),
    ("shipper", "safety_factor = 1.2", "safety_factor = 0.5", "inputs.safety_factor"),
    ("shipper", "safety_factor = 1.2", "safety_factor = nan", "inputs.safety_factor"),
    (
        "shipper",
        "coolant_packing_fraction = 0.8",
        "coolant_packing_fraction = 2",
        "inputs.coolant_packing_fraction",
    ),
    (
        "shipper",
        "coolant_wall_fraction = 0.8",
        "coolant_wall_fraction = -0.1",
        "inputs.coolant_wall_fraction",
    ),
    ("shipper", 'time_step = "300 s"', 'time_step = "0 s"', "inputs.time_step"),
    ("shipper", '"20 mm", "30 mm"', '"20 mm", "0 mm"', "inputs.thicknesses[1]"),
    ("shipper", 'payload_mass = "3 kg"', 'payload_mass = "0 kg"', "inputs.payload_mass"),
    ("shipper", 'fixed_fee = "5 EUR"', 'fixed_fee = "-5 EUR"', "inputs.fixed_fee"),
    ("shipper", 'divisor = "5000 cm³/kg"', 'divisor = "0 cm³/kg"', "inputs.divisor"),
    (
        "housing",
        'component_length = "40 mm"',
        'component_length = "500 mm"',
        "inputs.component_length",
    ),
    ("housing", 'power = "', 'power = "-3 W" #', "inputs.power"),
    ("housing", 'contact_duration = "', 'contact_duration = "0 s" #', "inputs.contact_duration"),
    ("housing", 'thickness = "2.5 mm" }', 'thickness = "40 mm" }', "candidates[0]"),
]


@pytest.mark.parametrize(("kind", "old", "new", "key"), DOMAIN_CASES)
def test_check_rejects_what_rank_rejects(tmp_path, kind, old, new, key):
    text = _replace(kind, old, new)
    p = _write(tmp_path, text)
    probs = _located(_error(p), p)
    line, col, k, why = probs[0]
    assert k.startswith(key), probs
    if key.endswith("]"):  # an element of a list: the column is where the element starts
        assert _at(text, line, col)[0] in "[{\"'", (line, col)
    else:
        assert _at(text, line, col).startswith(key.split(".")[-1])


def test_units_parse_enforces_the_domain():
    with pytest.raises(units.UnitError, match=r"thickness.*> 0 m"):
        units.parse("-5 mm", "thickness", "thickness")
    with pytest.raises(units.UnitError, match="> 0"):
        units.parse("0 mm", "thickness", "thickness")
    with pytest.raises(units.UnitError, match="absolute zero"):
        units.parse("-500 °F", "temperature", "t")
    with pytest.raises(units.UnitError, match="> 0 K"):
        units.parse("0 K", "temperature", "t")
    with pytest.raises(units.UnitError, match=r"\[0, 1\]"):
        units.parse(1.2, "dimensionless", "emissivity", bounds=units.EMISSIVITY)
    assert units.parse("0 h", "time", "t") == 0.0  # a profile starts at 0 h
    assert units.parse("-5 K", "temperature_difference", "dt") == -5.0  # signed kind


# ---------------------------------------------------------------------------
# Reproducer 8: work limits, refused before computing, overridable
# ---------------------------------------------------------------------------
def _thicknesses(n: int) -> str:
    return "[" + ", ".join(f'"{1 + i * 0.001:.3f} mm"' for i in range(n)) + "]"


def test_long_list_is_refused_before_parsing(tmp_path):
    n = DEFAULT_LIMITS["max_list_entries"] + 1
    old = 'thicknesses = ["20 mm", "30 mm", "40 mm", "50 mm", "60 mm", "80 mm"]'
    p = _write(tmp_path, _replace("shipper", old, f"thicknesses = {_thicknesses(n)}"))
    (line, col, key, why), *_ = _located(_error(p), p)
    assert key == "inputs.thicknesses" and "max_list_entries" in why and "[limits]" in why


def test_limits_table_raises_the_limit_deliberately(tmp_path):
    old = 'thicknesses = ["20 mm", "30 mm", "40 mm", "50 mm", "60 mm", "80 mm"]'
    text = _replace("shipper", old, f"thicknesses = {_thicknesses(12)}")
    p = _write(tmp_path, text + "\n[limits]\nmax_list_entries = 10\n")
    assert "max_list_entries" in str(_error(p))
    p = _write(tmp_path, text + "\n[limits]\nmax_list_entries = 12\n", "ok.toml")
    s = load_scenario(p)
    assert s.limits == {"max_list_entries": 12}
    assert len(parse_inputs(s)["thicknesses"]) == 12


def test_huge_duration_is_a_clear_error_not_memory(tmp_path):
    p = _write(tmp_path, _replace("shipper", 'duration = "48 h"', 'duration = "1e9 h"'))
    (line, col, key, why), *_ = _located(_error(p), p)
    assert key in ("inputs.duration", "inputs.time_step")
    assert "max_sweep_cells" in why or "step" in why


def test_too_many_candidates(tmp_path):
    names = ", ".join(['"eps_20"'] * (DEFAULT_LIMITS["max_candidates"] + 1))
    text = _replace("housing", "candidates = [", f"candidates = [{names}, ").replace(
        f"[{names}, ", f"[{names}]\nxx = [", 1
    )
    p = _write(tmp_path, text)
    assert "max_candidates" in str(_error(p))


def test_bad_limit_value(tmp_path):
    p = _write(
        tmp_path, (EXAMPLES / "wall.toml").read_text("utf-8") + "\n[limits]\nmax_sweep_cells = 0\n"
    )
    (line, col, key, why), *_ = _located(_error(p), p)
    assert key == "limits.max_sweep_cells" and ">= 1" in why


# ---------------------------------------------------------------------------
# The key matrix
# ---------------------------------------------------------------------------
_QUANTITY = re.compile(r"^\s*[-+−]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*(\S.*)$")

# Keys that may be left out, with the documented default checked below.
_OPTIONAL_TOP = {"title", "display_system", "notes", "criteria", "constraints", "decision"}
_OPTIONAL_IN_TABLES = {
    ("criteria", "direction"),
    ("criteria", "weight"),
    ("decision", "chosen"),
    ("decision", "rationale"),
    ("decision", "decided_by"),
    ("decision", "date"),
    ("candidates", "name"),
    ("candidates", "finish"),
}


def _keys(data, prefix=()):
    """Every key path (dict keys at any depth, through lists), with its value."""
    if isinstance(data, dict):
        for k, v in data.items():
            yield (*prefix, k), v
            yield from _keys(v, (*prefix, k))
    elif isinstance(data, list):
        for i, v in enumerate(data):
            yield from _keys(v, (*prefix, i))


def _dotted(path) -> str:
    out = ""
    for p in path:
        out += f"[{p}]" if isinstance(p, int) else (f".{p}" if out else str(p))
    return out


def _sources():
    for kind in KINDS:
        yield kind, "starter", starter_text(kind)
        if (EXAMPLES / f"{kind}.toml").is_file():
            yield kind, "example", (EXAMPLES / f"{kind}.toml").read_text("utf-8")


def _mutations(value, free_text: bool = False):
    yield "missing", None
    yield "wrong_type", {"x": 1} if isinstance(value, str) else "many"
    if isinstance(value, str) and _QUANTITY.match(value) and not free_text:
        yield "wrong_unit", _QUANTITY.sub(r"\1 kg*s", value)
        num = _QUANTITY.match(value)
        unit = num.group(3)
        if re.search(r"°C|degC", unit):
            yield "out_of_domain", "-300 °C"
        elif re.search(r"°F|degF", unit):
            yield "out_of_domain", "-500 °F"
        else:
            yield "out_of_domain", f"-{num.group(1)} {unit}"
    elif isinstance(value, (int, float)) and not isinstance(value, bool):
        yield "wrong_unit", f"{value} kg*s"
        yield "out_of_domain", -1.0
    elif isinstance(value, list) and value and all(isinstance(x, str) for x in value):
        if _QUANTITY.match(value[0]):
            yield "wrong_unit", [_QUANTITY.sub(r"\1 kg*s", value[0]), *value[1:]]
            yield "out_of_domain", [f"-{value[0]}", *value[1:]]
        else:  # material ids
            yield "out_of_domain", ["no_such_material", *value[1:]]
    elif isinstance(value, list) and value and all(isinstance(x, list) for x in value):
        yield "wrong_unit", [[value[0][0], "25 kg*s"], *value[1:]]
        yield "out_of_domain", [[value[0][0], "-300 °C"], *value[1:]]
    elif isinstance(value, str):
        yield "out_of_domain", "no_such_" + re.sub(r"\W", "_", value)[:20]


_FREE_TEXT = {"title", "notes", "rationale", "decided_by", "date", "name"}


def _matrix():
    cases = []
    for kind, source, text in _sources():
        data = tomllib.loads(text)
        for path, value in _keys(data):
            if isinstance(path[-1], int):
                continue
            for mutation, new in _mutations(value, free_text=path[-1] in _FREE_TEXT):
                if mutation == "out_of_domain" and path[-1] in _FREE_TEXT:
                    continue  # free text has no domain
                cases.append(
                    pytest.param(
                        kind,
                        source,
                        path,
                        mutation,
                        new,
                        id=f"{kind}-{source}-{_dotted(path)}-{mutation}",
                    )
                )
    return cases


MATRIX = _matrix()


def _optional(kind: str, data: dict, path: tuple) -> bool:
    if len(path) == 1:
        return path[0] in _OPTIONAL_TOP
    if path[0] == "inputs" and len(path) == 2:
        spec = study_kind(kind).input_spec(path[1])
        if path[1] == "t_ambient":
            return "ambient_profile" in data["inputs"]
        if path[1] == "ambient_profile":
            return "t_ambient" in data["inputs"]
        if path[1].startswith("component_"):
            return False  # the three component inputs go together
        return not spec.required
    if path[0] == "decision" and len(path) == 2:
        return True
    return (path[0], path[-1]) in _OPTIONAL_IN_TABLES


def _expect_default(kind: str, path: tuple, scenario, study) -> None:
    """A left-out optional key takes its documented default."""
    if path == ("display_system",):
        assert scenario.display_system == "SI"
    elif path in (("title",), ("notes",)):
        assert getattr(scenario, path[0]) == ""
    elif path == ("criteria",):
        assert scenario.criteria == ()  # the kind's default criteria rank it
    elif path == ("decision",):
        assert scenario.decision is None
    elif path[0] == "decision":
        assert getattr(scenario.decision, path[1]) == ""
    elif path[0] == "criteria":
        c = scenario.criteria[path[1]]
        assert (c.direction if path[-1] == "direction" else c.weight) == (
            "minimise" if path[-1] == "direction" else 1.0
        )
    elif path[0] == "inputs":
        x = parse_inputs(scenario)
        assert x[path[1]] is None
        attr = {
            "budget": "budget",
            "max_thickness": "max_thickness",
            "t_inside_max": "t_inside_max",
            "h_inside": "h_inside",
            "t_payload_min": "t_payload_min",
            "t_payload_max": "t_payload_max",
            "t_coolant_start": "t_coolant_start",
        }.get(path[1])
        if attr is not None:
            assert getattr(study, attr) is None


def _mutate(data: dict, path: tuple, new):
    d = copy.deepcopy(data)
    parent = d
    for p in path[:-1]:
        parent = parent[p]
    if new is None:
        del parent[path[-1]]
    else:
        parent[path[-1]] = new
    return d


@pytest.mark.parametrize(("kind", "source", "path", "mutation", "new"), MATRIX)
def test_key_matrix(tmp_path, kind, source, path, mutation, new):
    data = tomllib.loads(dict(_sources_by)[(kind, source)])
    mutated = _mutate(data, path, new)
    text = dumps_toml(mutated)
    p = _write(tmp_path, text, "m.toml")
    key = _dotted(path)
    try:
        scenario = load_scenario(p)
        study = check_scenario(scenario)
    except ScenarioError as err:
        probs = _located(err, p)
        if (
            mutation == "missing"
            and path[-1] == "name"
            and [x[2] for x in probs] == ["decision.chosen"]
        ):
            return  # the decision named that candidate: rightly refused at decision.chosen
        assert mutation != "missing" or not _optional(kind, data, path), (key, err.problems)
        # the first problem's key is the mutated key, one of its parents, or an element of it
        hit = [x for x in probs if x[2] == key or key.startswith(x[2]) or x[2].startswith(key)]
        if path == ("format",) or path == ("version",):
            hit = hit or [x for x in probs if x[2] in ("format", "version")]
        assert hit, (key, err.problems)
        line, col, k, why = hit[0]
        assert why.strip(), err.problems
        if mutation != "missing" and k == key:  # the column is where the key is written
            assert _at(text, line, col).startswith(path[-1]) or (
                _at(text, line, col).startswith("[") and path[-1] in _at(text, line, col)
            ), (k, line, col)
        return
    # no error: only a left-out optional key (with its default), or a value that is valid
    if mutation == "missing":
        assert _optional(kind, data, path), f"{key} missing was accepted"
        _expect_default(kind, path, scenario, study)
    else:
        pytest.fail(f"{key}: {mutation} {new!r} was accepted")


_sources_by = [((k, s), t) for k, s, t in _sources()]


def test_matrix_is_large():
    assert len(MATRIX) > 300
