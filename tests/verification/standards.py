"""One invented contact reviewed under every standard, each worked out by hand beside the tool's number.

The contact: a sawn softwood beam 89 mm wide and 235 mm deep, 3 m long, on two steel posts
89 x 89 mm at its ends (centres 44.5 mm in), carrying 2 kN/m dead and 3 kN/m live load; each
post takes D = 3.0 kN and L = 4.5 kN (w L / 2 by symmetry, common practice). The beam's
local bearing on a post is 89 mm along the grain by 89 mm across, flush with the beam's end.
Each standard's formula is written out here from its published form; strengths and factors are
as recalled (from memory: verify), the same values as the bundled packs.
"""

from __future__ import annotations

from tests.verification.cases import Case

PSI = 6894.757293168  # Pa
INCH = 0.0254  # m
SIDE = 0.089  # m, the contact's length and width


def contact_model(standard: str) -> dict:
    """The contact as a model under ``standard`` (o86, nds-asd, nds-lrfd, ec5)."""
    spf = {"family": "sawn_lumber", "species": "Spruce-Pine-Fir", "grade": "No.2"}
    packs = {
        "o86": ("o86-2019-recalled", "nbcc-2015-recalled", {**spf, "species": "S-P-F"}),
        "nds-asd": ("nds-2018-recalled", "asce7-16-asd-recalled", spf),
        "nds-lrfd": ("nds-2018-recalled", "asce7-16-lrfd-recalled", spf),
        "ec5": ("ec5-2004-recalled", "en1990-recalled", {"family": "sawn_lumber", "species": "C24", "grade": "EN 338"}),
    }
    rule_pack, combinations, timber = packs[standard]
    post = {"material": "STEEL", "b": "89 mm", "d": "89 mm", "length": "3 m", "orientation": "vertical"}
    return {
        "project": {"title": f"One contact under {standard} (invented)", "rule_pack": rule_pack,
                    "combinations": combinations, "date": "2026-12-01"},
        "materials": {"SW": timber, "STEEL": {"family": "steel"}},
        "members": [
            {"id": "B", "material": "SW", "b": "89 mm", "d": "235 mm", "length": "3 m"},
            {"id": "P1", **post},
            {"id": "P2", **post},
        ],
        "bearings": [
            {"upper": {"member": "B", "at": "44.5 mm"}, "lower": "P1"},
            {"upper": {"member": "B", "at": "2955.5 mm"}, "lower": "P2"},
        ],
        "loads": [{"id": "w", "member": "B", "type": "uniform", "specified": {"D": "2 kN/m", "L": "3 kN/m"}}],
    }  # fmt: skip


def by_hand() -> dict[str, tuple[float, float, str, str]]:
    """standard -> (Qf N, Qr N, the governing combination, how Qr was worked)."""
    area = SIDE * SIDE
    o86 = 0.8 * 5.3e6 * 1.0 * 1.0 * 1.0 * area * 1.0 * 1.15  # phi fcp KD KScp KT Ab KB(end) KZcp(b/d <= 1)
    nds_asd = 425 * PSI * 1.0 * 1.0 * 1.0 * 1.0 * area  # Fc-perp CM Ct Ci Cb(at the end) Ab
    nds_lrfd = nds_asd * 1.67 * 0.9  # x KF phi
    lef = SIDE + 0.0 + 0.030  # no room past the member end; 30 mm towards mid-span
    ec5 = 1.5 * 0.8 * 2.5e6 / 1.3 * SIDE * lef  # kc,90 (discrete, solid, l1 >= 2h) kmod (medium) fc,90,k / gamma_M Aef
    return {
        "o86": (1.25 * 3000 + 1.5 * 4500, o86, "1.25D+1.5L", "Qr = 0.8 x 5.3 MPa x 89 x 89 mm² x KB 1.00 x KZcp 1.15"),
        "nds-asd": (3000 + 4500, nds_asd, "D+L", "P' = 425 psi x 3.50 x 3.50 in² (Cb 1.00 at the member end)"),
        "nds-lrfd": (1.2 * 3000 + 1.6 * 4500, nds_lrfd, "1.2D+1.6L+0.5S", "P' = 425 psi x 12.28 in² x KF 1.67 x 0.90"),
        "ec5": (1.35 * 3000 + 1.5 * 4500, ec5, "1.35G+1.5Q", "kc,90 1.5 x 0.8 x 2.5 MPa / 1.3 x 89 x (89 + 30) mm²"),
    }  # fmt: skip


SOURCES = {
    "o86": "CSA O86 6.5.6.2 (from memory)",
    "nds-asd": "NDS 3.10.2, ASD (from memory)",
    "nds-lrfd": "NDS 3.10.2 and Appendix N, LRFD (from memory)",
    "ec5": "EN 1995-1-1 6.1.5 (from memory)",
}


def standards_cases() -> list[Case]:
    from tests.conftest import review_dict

    out = []
    for standard, (qf, qr, combo, how) in by_hand().items():
        result = review_dict(contact_model(standard)).result_at("B/P1", "B", "local")
        assert result is not None
        g = result.governing
        out.append(
            Case("One contact under each standard", f"{standard} Qr (kN)", SOURCES[standard], qr / 1000, g.qr / 1000,
                 1e-6, "1e-6", how)
        )  # fmt: skip
        out.append(
            Case("One contact under each standard", f"{standard} Qf (kN), {combo}", SOURCES[standard], qf / 1000,
                 g.qf / 1000, 1e-6, "1e-6", "")
        )  # fmt: skip
    return out


def ec5_rule_cases() -> list[Case]:
    """EN 1995-1-1 rules worked by hand on the contact: storage's class and companion factor, the capped
    effective length, compression at an angle (clauses as recalled: verify)."""
    import math

    from tests.conftest import review_dict

    def result(data: dict):
        r = review_dict(data).result_at("B/P1", "B", "local")
        assert r is not None
        return r

    group, out = "EN 1995-1-1 rules by hand", []
    storage = contact_model("ec5")
    storage["loads"][0]["live"] = "storage"
    row = {c.combination: c for c in result(storage).combinations}["1.35G+1.5Q"]
    qr = 1.5 * 0.70 * 2.5e6 / 1.3 * SIDE * (SIDE + 0.030)
    out.append(
        Case(
            group,
            "Qr (kN), storage live load long-term",
            "EN 1995-1-1 2.3.1.2, Table 3.1 (from memory)",
            qr / 1000,
            row.qr / 1000,
            1e-6,
            "1e-6",
            "kc,90 1.5 x kmod 0.70 x 2.5 MPa / 1.3 x 89 x 119 mm",
        )
    )
    storage["loads"][0]["specified"]["S"] = "1 kN/m"
    row = {c.combination: c for c in result(storage).combinations}["1.35G+1.5S+1.5Q"]
    qf = 1.35 * 3000 + 1.5 * 1500 + 1.5 * 4500
    out.append(
        Case(
            group,
            "Qf (kN), snow leading, storage companion",
            "EN 1990 Table A1.1, A1.2(B) (from memory)",
            qf / 1000,
            row.qf / 1000,
            1e-6,
            "1e-6",
            "1.35 x 3.0 + 1.5 x 1.5 + gamma_Q psi0 1.5 x 1.0 x 4.5",
        )
    )
    short = contact_model("ec5")
    short["members"][1].update({"b": "25 mm", "d": "25 mm"})
    short["bearings"][0]["upper"]["at"] = "12.5 mm"
    qr = 1.5 * 0.8 * 2.5e6 / 1.3 * 0.025 * (0.025 + 0.025)
    out.append(
        Case(
            group,
            "Qr (kN), 25 mm contact at the member end",
            "EN 1995-1-1 6.1.5(1) (from memory)",
            qr / 1000,
            result(short).governing.qr / 1000,
            1e-6,
            "1e-6",
            "lef = 25 + 0 + min(30, l = 25) = 50 mm (55 mm uncapped)",
        )
    )
    angled = contact_model("ec5")
    angled["bearings"][0]["upper"]["angle"] = "60 deg"
    fc0d, fc90d, alpha = 0.8 * 21e6 / 1.3, 0.8 * 2.5e6 / 1.3, math.radians(60)
    qr = fc0d / (fc0d / (1.5 * fc90d) * math.sin(alpha) ** 2 + math.cos(alpha) ** 2) * SIDE * SIDE
    out.append(
        Case(
            group,
            "Qr (kN), bearing at 60 deg to the grain",
            "EN 1995-1-1 6.2.2, eq. 6.16 (from memory)",
            qr / 1000,
            result(angled).governing.qr / 1000,
            1e-6,
            "1e-6",
            "fc,0,d / (fc,0,d / (kc,90 fc,90,d) sin² 60 + cos² 60) x 89 x 89 mm, C24 fc,0,k 21 MPa",
        )
    )
    return out  # fmt: skip
