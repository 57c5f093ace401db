"""Stage 5: read what the calc package claims, one record per claimed bearing check.

Claims come from a YAML file the reviewer writes (or that ``extract`` writes from the calc's
PDF). Each keeps where in the calc it stands, so the memo can cite the page.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from pathlib import Path

from audit.core.errors import ErrorCollector, Location
from audit.core.located_yaml import Node, node_text, read_yaml_file
from audit.core.suggest import did_you_mean
from audit.core.units import force_unit_of
from audit.inputs.fields import FieldReader, describe_value, list_items
from audit.standards.base import Standard
from audit.standards.registry import DEFAULT_STANDARD, standard_named, standards
from audit.standards.resistance import ANGLE

CLAIM_KEYS = {"id", "where", "location", "member", "kind", "Qf", "Qr", "utilisation", "factors", "adequate", "text"}
FILE_KEYS = {"claims"}
WHERE_KEYS = {"page", "sheet", "table", "item", "x", "y"}
# What a claim may state of its contact under any standard, with the dimension it is read in; its factors it
# names in its standard's own symbols (``Standard.symbols``: O86 KB, KZcp, KD, fcp; NDS Cb, CM, Ct, Ci, Fc-perp;
# EC5 kc,90, kmod, gamma_M, fc,90,d).
CONTACT_FACTORS: dict[str, str | None] = {"Ab": "area", "length": "length", "width": "length"}
KINDS = ("local", "near-support")


@dataclass(frozen=True)
class Where:
    page: int | None = None
    sheet: str = ""
    table: str = ""
    item: str = ""
    x: float | None = None  # position on the page (points), when extracted from a PDF
    y: float | None = None

    def cite(self) -> str:
        parts = []
        if self.page is not None:
            parts.append(f"p. {self.page}")
        if self.sheet:
            parts.append(f"sheet {self.sheet}")
        if self.table:
            parts.append(self.table)
        if self.item:
            parts.append(f"item {self.item}")
        return ", ".join(parts) or "no page reference"


@dataclass(frozen=True)
class Claim:
    id: str
    where: Where
    label: str  # the calc's own label for the location
    member: str  # "" when the calc does not say
    kind: str
    qf: float | None  # N
    qr: float | None  # N
    utilisation: float | None
    factors: dict[str, float] = field(default_factory=dict)  # SI values
    adequate: bool | None = None
    text: str = ""  # raw text it came from, when extracted
    loc: Location = field(default=Location(""), compare=False)
    kind_stated: bool = True  # False when the claims file left 'kind' to its default
    labels: tuple[str, ...] = ()  # a typical claim given as a list of locations
    unit: str = ""  # the force unit the claim was written in (kN, lbf, kip), shown back in it; "" unknown

    @property
    def claimed_qr(self) -> float | None:
        if self.qr is not None:
            return self.qr
        if self.qf is not None and self.utilisation:
            return self.qf / self.utilisation
        return None


def read_claims(path: Path | str, standard: Standard | None = None) -> tuple[Claim, ...]:
    """The claims of a file, their factors in ``standard``'s symbols (the project's; O86 where none is given)."""
    root = read_yaml_file(path)
    return build_claims(root, standard)


def claim_factors(standard: Standard) -> dict[str, str | None]:
    """Every factor a claim may state under the standard, with the dimension it is read in (None: a plain number)."""
    own = {name: s.dimension for name, s in standard.symbols.items() if s.role != ANGLE}
    return {**own, **CONTACT_FACTORS}


def build_claims(root: Node, standard: Standard | None = None) -> tuple[Claim, ...]:
    vocabulary = claim_factors(standard or standard_named(DEFAULT_STANDARD))
    title = (standard or standard_named(DEFAULT_STANDARD)).title
    errors = ErrorCollector()
    top = FieldReader(root, FILE_KEYS, errors, "the claims file")
    if top.ok and "claims" not in top.map:
        errors.add("missing section 'claims'", root.child_loc("claims"))
    errors.raise_if_any()
    out: list[Claim] = []
    ids: set[str] = set()
    for index, item in enumerate(list_items(top.map["claims"], "claims", errors)):
        claim = _read_claim(item, index, errors, vocabulary, title)
        if claim is None:
            continue
        if claim.id in ids:
            errors.add(f"duplicate claim id '{claim.id}'", item.child_loc("id"))
            continue
        ids.add(claim.id)
        out.append(claim)
    errors.raise_if_any()
    return tuple(out)


def _read_claim(
    item: Node, index: int, errors: ErrorCollector, vocabulary: dict[str, str | None], title: str
) -> Claim | None:
    f = FieldReader(item, CLAIM_KEYS, errors, "claim")
    if not f.ok:
        return None
    claim_id = f.text("id", required=False, limit=120) or f"claim{index + 1}"
    labels: tuple[str, ...] = ()
    if f.has("location") and isinstance(f.map["location"].value, list):
        labels = tuple(node_text(n).strip() for n in f.map["location"].value if not isinstance(n.value, (dict, list)))
        if not labels or len(labels) != len(f.map["location"].value):
            errors.add("a list of locations must hold labels only", f.loc("location"))
            return None
        label = "; ".join(labels)
    else:
        label = f.text("location", limit=300)
    kind = f.choice("kind", KINDS, required=False, default="local")
    qf = f.quantity("Qf", "force", required=False)
    qr = f.quantity("Qr", "force", required=False, positive=True)
    util = f.number("utilisation", 0.0, 1e6, -1.0)
    if qf is None and qr is None and util < 0:
        errors.add("a claim needs at least one of Qf, Qr or utilisation", item.loc)
        return None
    adequate = None
    if f.has("adequate"):
        value = f.map["adequate"].value
        if not isinstance(value, bool):
            errors.add(f"adequate must be true or false, got {describe_value(value)}", f.loc("adequate"))
            return None
        adequate = value
    where = _read_where(f, errors)
    factors = _read_factors(f, errors, vocabulary, title)
    if not f.ok or where is None or factors is None:
        return None
    return Claim(
        id=claim_id,
        where=where,
        label=label,
        member=f.text("member", required=False, limit=120),
        kind=kind,
        qf=qf,
        qr=qr,
        kind_stated=f.has("kind"),
        utilisation=None if util < 0 else util,
        factors=factors,
        adequate=adequate,
        text=f.text("text", required=False, limit=2000),
        loc=item.loc,
        labels=labels,
        unit=next((u for k in ("Qf", "Qr") if f.has(k) and (u := force_unit_of(f.map[k].value))), ""),
    )


def _read_where(f: FieldReader, errors: ErrorCollector) -> Where | None:
    if not f.has("where"):
        return Where()
    node = f.map["where"]
    if isinstance(node.value, (str, int)) and not isinstance(node.value, bool):
        return Where(item=str(node.value)) if isinstance(node.value, str) else Where(page=int(node.value))
    w = FieldReader(node, WHERE_KEYS, errors, "where")
    if not w.ok:
        return None
    page = None
    if w.has("page"):
        raw = w.map["page"].value
        if isinstance(raw, bool) or not isinstance(raw, int) or raw < 1:
            errors.add(f"page must be a whole number from 1, got {describe_value(raw)}", w.loc("page"))
            return None
        page = raw
    x = w.number("x", -1e6, 1e6, math.nan)
    y = w.number("y", -1e6, 1e6, math.nan)
    return Where(
        page=page,
        sheet=w.text("sheet", required=False),
        table=w.text("table", required=False),
        item=w.text("item", required=False),
        x=None if math.isnan(x) else x,
        y=None if math.isnan(y) else y,
    )


def _read_factors(
    f: FieldReader, errors: ErrorCollector, vocabulary: dict[str, str | None], title: str
) -> dict[str, float] | None:
    if not f.has("factors"):
        return {}
    node = f.map["factors"]
    if isinstance(node.value, dict) and not _known_symbols(node, errors, vocabulary, title):
        return None
    ff = FieldReader(node, set(vocabulary), errors, "claim factors")
    if not ff.ok:
        return None
    out: dict[str, float] = {}
    for name, dimension in vocabulary.items():
        if not ff.has(name):
            continue
        if dimension is None:
            value = ff.number(name, 0.0, 10.0, math.nan)
        else:
            q = ff.quantity(name, dimension, positive=True)
            value = math.nan if q is None else q
        if math.isnan(value):
            return None
        out[name] = value
    return out


def _known_symbols(node: Node, errors: ErrorCollector, vocabulary: dict[str, str | None], title: str) -> bool:
    """Every factor named in the project's standard's symbols; another standard's symbol is refused naming whose it
    is and the symbols this standard uses."""
    ok = True
    for key in node.value:
        if key in vocabulary:
            continue
        whose = [s.title for s in standards().values() if key in s.symbols and s.title != title]
        said = f"'{key}' is a symbol of {' and '.join(whose)}, not of {title}" if whose else f"unknown factor '{key}'"
        errors.add(
            f"{said}: under {title} a claim names its factors {', '.join(vocabulary)}{did_you_mean(key, vocabulary)}",
            node.key_loc(key),
        )
        ok = False
    return ok


def merge_claim_sources(first: tuple[Claim, ...], second: tuple[Claim, ...], source: str) -> tuple[Claim, ...]:
    """Claims of two sources in one run, every id unique: a clashing id of the second source is
    prefixed with that source's name (and numbered if it still clashes), so each claim is still
    accounted for once and can be told apart in the memo."""
    taken = {c.id for c in first}
    out = list(first)
    for claim in second:
        new_id = claim.id
        if new_id in taken:
            new_id = f"{source}:{claim.id}"
            n = 2
            while new_id in taken:
                new_id, n = f"{source}:{claim.id}#{n}", n + 1
        taken.add(new_id)
        out.append(replace(claim, id=new_id) if new_id != claim.id else claim)
    return tuple(out)
