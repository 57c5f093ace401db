"""The model's ``project`` section: title, rule packs, service, tolerance, units, the readings chosen."""

from __future__ import annotations

import datetime as dt

from audit.core.errors import ErrorCollector
from audit.core.located_yaml import Node, node_text
from audit.core.suggest import did_you_mean
from audit.engine.model import Project
from audit.inputs.fields import FieldReader, describe_value
from audit.inputs.model_keys import PROJECT_KEYS, READING_KEYS, TOLERANCE_KEYS
from audit.standards.packs import SERVICES, PackCore

# ---------------------------------------------------------------- sections


def read_project(node: Node, errors: ErrorCollector) -> Project:
    f = FieldReader(node, PROJECT_KEYS, errors, "project")
    tol_rel, tol_abs = 0.03, 500.0
    if f.has("tolerance"):
        t = FieldReader(f.map["tolerance"], TOLERANCE_KEYS, errors, "project.tolerance")
        tol_rel = t.number("relative", 0.0, 1.0, tol_rel)
        abs_value = t.quantity("absolute", "force", required=False)
        if abs_value is not None:
            if abs_value < 0:
                errors.add("tolerance must not be negative", t.loc("absolute"))
            tol_abs = abs_value
    date = None
    if f.has("date"):
        raw = f.map["date"].value
        if isinstance(raw, dt.datetime):
            date = raw.date()
        elif isinstance(raw, dt.date):
            date = raw
        else:
            try:
                date = dt.date.fromisoformat(str(raw))
            except ValueError:
                errors.add(f"date must be YYYY-MM-DD, got {raw!r}", f.loc("date"))
    uplift_note = f.quantity("uplift_note_below", "force", required=False)
    if uplift_note is not None and uplift_note < 0:
        errors.add("uplift_note_below must not be negative", f.loc("uplift_note_below"))
        uplift_note = None
    own_from = _own_comment_from(f, errors)
    return Project(
        title=f.text("title"),
        calc=f.text("calc", required=False),
        reviewer=f.text("reviewer", required=False),
        rule_pack=f.text("rule_pack", required=False, default="o86-2019-recalled"),
        combinations=f.text("combinations", required=False, default="nbcc-2015-recalled"),
        service=f.choice("service", SERVICES, required=False, default="dry"),
        tolerance_relative=tol_rel,
        tolerance_absolute=tol_abs,
        date=date,
        readings=_read_reading_choices(f, errors),
        units=f.choice("units", ("SI", "US"), required=False, default="SI"),
        uplift_note_below=uplift_note,
        own_comment_from=own_from,
    )


def _own_comment_from(f: FieldReader, errors: ErrorCollector) -> float | None:
    """project.own_comment_from: the Qf/Qr from which a missing check is a comment of its own (None: the default)."""
    if not f.has("own_comment_from"):
        return None
    value = f.number("own_comment_from", 0.0, 1.0, -1.0)
    return value if value >= 0 else None


def _read_reading_choices(f: FieldReader, errors: ErrorCollector) -> dict[str, str]:
    out = {name: f.text(key, required=False) for key, name in READING_KEYS.items() if f.has(key)}
    if f.has("readings"):
        node = f.map["readings"]
        if not isinstance(node.value, dict):
            errors.add(
                "readings must map a choice of the rule pack to a reading, e.g. {kzcp.built_up: combined}", node.loc
            )
            return out
        for name, item in node.value.items():
            if isinstance(item.value, (dict, list)) or item.value is None:
                errors.add(f"expected a reading id, got {describe_value(item.value)}", item.loc)
                continue
            out[name] = node_text(item)
    return out


def check_readings(project: Project, pack: PackCore, node: Node, errors: ErrorCollector) -> None:
    """Every reading the project chooses names a choice of the pack and one of its readings."""
    keys = {name: key for key, name in READING_KEYS.items()}
    for name, reading in project.readings.items():
        where = node.value[keys[name]].loc if name in keys and keys[name] in node.value else None
        if where is None:
            readings_node = node.value["readings"]
            where = readings_node.value[name].loc
        choice = pack.choices.get(name)
        if choice is None:
            errors.add(
                f"rule pack {pack.id} has no choice '{name}'{did_you_mean(name, pack.choices)} "
                f"(choices: {', '.join(pack.choices)})",
                where,
            )
        elif reading not in choice.readings:
            errors.add(
                f"reading '{reading}' is not in rule pack {pack.id} for {name} "
                f"(readings: {', '.join(choice.readings)})",
                where,
            )
