"""Each standard speaks its own symbols: every factor carries its role and the standard's symbol, and no standard
pours its factors into another's (NDS Cb is not O86's KB, EC5's 1/gamma_M is not a phi).

Hand values: EN 1995-1-1 6.1.5 fc,90,d = kmod fc,90,k / gamma_M (values as recalled: from memory, verify);
NDS 3.10.4 Fc-perp' = Fc-perp CM Ct Ci Cb; CSA O86 Qr = phi Fcp Ab KB KZcp, Fcp = fcp KD KScp KT.
"""

from __future__ import annotations

import pytest

from audit.review.review import review_model
from audit.standards.registry import standards
from audit.standards.resistance import (
    LENGTH,
    MATERIAL,
    ROLES,
    SERVICE,
    STRENGTH,
    Factor,
    ResistanceInputs,
    resistance,
)
from tests.conftest import ROOT

DEMOS = {"o86": "demo", "nds": "demo-nds", "ec5": "demo-ec5"}


@pytest.mark.parametrize("standard_id", sorted(DEMOS))
def test_every_factor_of_every_check_carries_its_role_and_its_own_standards_symbol(standard_id):
    review = review_model(ROOT / "fixtures" / DEMOS[standard_id] / "model.yaml")
    assert review.standard.id == standard_id
    own = review.standard.symbols
    others = {s for sid, std in standards().items() if sid != standard_id for s in std.symbols} - set(own)
    for r in review.results:
        for f in r.inputs.factors:
            assert f.role in ROLES
            assert f.name in own, f"{f.name} is not a symbol of {standard_id}"
            assert own[f.name].role == f.role
            assert f.name not in others or f.name in own


def test_nds_length_factor_is_cb_and_ec5s_is_kc90_never_o86s_kb():
    length = {sid: [s for s, sym in std.symbols.items() if sym.role == LENGTH] for sid, std in standards().items()}
    assert length == {"o86": ["KB"], "nds": ["Cb"], "ec5": ["kc,90"]}


def test_ec5_resistance_divides_by_gamma_m_and_multiplies_by_kmod():
    # EN 1995-1-1 6.1.5: Fc,90,Rd = kc,90 (kmod fc,90,k / gamma_M) Aef. By hand: 2.5 MPa x 0.80 / 1.3 = 1.5385 MPa,
    # x 1.5 = 2.3077 MPa, x (100 x 200 mm = 0.02 m^2) = 46.15 kN.
    inputs = ResistanceInputs(
        factors=(
            Factor("fc,90,k", 2.5e6, "", role=STRENGTH),
            Factor("gamma_M", 1.3, "", role=MATERIAL),
            Factor("kc,90", 1.5, "", role=LENGTH),
        ),
        area=0.02,
        uses_duration=True,
        fc_parallel=None,
        angle=None,
    )
    assert resistance(inputs, 0.80) == pytest.approx(46_153.8, rel=1e-4)
    assert inputs.modified_strength(0.80) == pytest.approx(2.0e6, rel=1e-9)  # kmod fc,90,k, before gamma_M


def test_a_changed_factor_replaces_the_one_of_its_symbol_and_a_new_one_is_added():
    # NDS: Fc-perp' = Fc-perp CM Cb; 625 psi x 0.67 x 1.25 over 1.5 x 3.5 in = 5.25 in^2: 2,748 lbf (by hand)
    psi, inch2, lbf = 6894.757, 0.0254**2, 4.4482216
    base = ResistanceInputs(
        factors=(Factor("Fc-perp", 625 * psi, "", role=STRENGTH), Factor("CM", 0.67, "", role=SERVICE)),
        area=5.25 * inch2,
        uses_duration=False,
        fc_parallel=None,
        angle=None,
    )
    with_cb = base.changed((Factor("Cb", 1.25, "", role=LENGTH),))
    assert resistance(with_cb, 1.0) / lbf == pytest.approx(625 * 0.67 * 1.25 * 5.25, rel=1e-6)
    dry = with_cb.changed((Factor("CM", 1.0, "", role=SERVICE),))
    assert resistance(dry, 1.0) / lbf == pytest.approx(625 * 1.25 * 5.25, rel=1e-6)
    assert [f.name for f in dry.factors] == ["Fc-perp", "CM", "Cb"]


def test_a_factor_without_a_role_in_a_resistance_is_refused():
    with pytest.raises(ValueError, match="no role"):
        ResistanceInputs((Factor("KX", 1.1, "", role="made-up"),), 0.01, False, None, None)
