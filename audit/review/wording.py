"""The words of every finding, one function per kind, in one place.

Stages decide *what* was found (kind, weight, place, numbers) and call the kind's function
here for the sentence; the memo, the comment logs and the terminal all show that sentence.
Forces are shown in the claim's own unit where a claim is involved (a claim in lbf is answered
in lbf), else in the project's (``Display``).
"""

from __future__ import annotations

from audit.core.units import Display
from audit.engine.model import Member
from audit.standards.checks import NEAR, RequiredCheck


def support_word(other: Member | None) -> str:
    """What a vertical support is called before its id: 'post ', 'stud ', 'stud pack '; nothing for a beam."""
    if other is None or not other.vertical:
        return ""
    if other.label.startswith("stud pack"):
        return "stud pack "
    if other.label.startswith("stud "):
        return "stud "
    return "post "


def check_name(check: RequiredCheck, other: Member | None) -> str:
    """A check as engineers name it: 'bearing of GB2 on post P1' (the member above crushed on its support),
    'B1 under J1' (the member below crushed under the one on it), 'near-support check of GB2 over P1',
    'B under point load leg' (``other`` is None where the other side is a load, not a member)."""
    if check.load:
        return f"{check.member} under point load {check.load}"
    if check.kind == NEAR:
        return f"near-support check of {check.member} over {check.other_member}"
    if check.face == "bottom":
        return f"bearing of {check.member} on {support_word(other)}{check.other_member}"
    return f"{check.member} under {check.other_member}"


def group_name(checks: list[RequiredCheck], other: Member | None) -> str:
    """Alike checks named together: 'bearings of J1, J2 and J3 on B1', 'B1 under J1 and J2'."""
    first = checks[0]
    if len(checks) == 1:
        return check_name(first, other)
    if first.load:
        return f"{first.member} under point loads {_names(c.load for c in checks)}"
    if first.kind == NEAR:
        return f"near-support checks of {first.member} over {_names(c.other_member for c in checks)}"
    if first.face == "bottom":
        return f"bearings of {_names(c.member for c in checks)} on {support_word(other)}{first.other_member}"
    return f"{first.member} under {_names(c.other_member for c in checks)}"


def _names(items) -> str:
    names = list(dict.fromkeys(items))
    return ", ".join(names[:-1]) + (" and " if len(names) > 1 else "") + names[-1]


def _cap(text: str) -> str:
    return text[:1].upper() + text[1:]


def _by_case(forces: dict[str, float], d: Display) -> str:
    return ", ".join(f"{case} {d.force(v)}" for case, v in sorted(forces.items())) or "none"


def calc_force(bearing: str, stated: dict[str, float], d: Display) -> str:
    return (
        f"The force through bearing {bearing} is taken from the calc ({_by_case(stated, d)}), not from the "
        "model's take-down; the members below carry it as given."
    )


def force_differs(
    bearing: str, stated: dict[str, float], modelled: dict[str, float], worst: str, share: float, d: Display
) -> str:
    return (
        f"At bearing {bearing} the calc's force ({_by_case(stated, d)}) differs from what the model's loads give "
        f"there ({_by_case(modelled, d)}): {worst} by {share:.0%}, beyond the project's tolerance. The checks use the "
        "calc's force; confirm the calc's take-down."
    )


def failing(
    name: str,
    where: str,
    qf: float,
    qr: float,
    util: float,
    combo: str,
    stance: str,
    remedy: str,
    d: Display,
) -> str:
    return (
        f"{_cap(name)} at {where} fails: recomputed Qf = {d.force(qf)} > Qr = {d.force(qr)} "
        f"(Qf/Qr = {util:.2f}, {combo}); {stance}. {remedy}"
    )


def missing(name: str, where: str, why: str, qf: float, qr: float, combo: str, d: Display) -> str:
    return (
        f"Missing from the calc: {name} at {where}, required because {why}. "
        f"Recomputed Qf = {d.force(qf)}, Qr = {d.force(qr)} ({combo})."
    )


def ratio_only(
    name: str,
    where: str,
    claimed: float,
    util: float,
    direction: str,
    qf: float,
    qr: float,
    combo: str,
    d: Display,
) -> str:
    return (
        f"{_cap(name)} at {where}: the calc states only Qf/Qr = {claimed:.2f}; recomputed "
        f"Qf/Qr = {util:.2f} ({direction}; recomputed Qf = {d.force(qf)}, Qr = {d.force(qr)}, {combo})."
    )


def differs(
    name: str,
    where: str,
    quantity: str,
    claimed: float,
    recomputed: float,
    relative: float,
    direction: str,
    factor_notes: list[str],
    causes: list[str],
    d: Display,
) -> str:
    what = "factored load" if quantity == "Qf" else "resistance"
    text = (
        f"{_cap(name)} at {where}: claimed {quantity} = {d.force(claimed)}, recomputed "
        f"{d.force(recomputed)} ({relative:+.0%}, {direction}). "
    )
    if factor_notes:
        text += "Factors that differ: " + "; ".join(factor_notes) + ". "
    if causes:
        text += "Likely cause: " + "; or ".join(causes) + "."
    else:
        readings = " (alone, or with every span loaded, only the bearings in Qf' or unfactored loads)"
        text += f"No common slip{readings if quantity == 'Qf' else ''} reproduces the claimed {what}."
    return text


def confirmed(name: str, where: str, qf: float, qr: float, d: Display) -> str:
    return (
        f"{_cap(name)} at {where} confirmed: claimed and recomputed agree within tolerance "
        f"(Qf = {d.force(qf)}, Qr = {d.force(qr)})."
    )


def covered(name: str, where: str, label: str, page: str, governing: str) -> str:
    return (
        f"{_cap(name)} at {where}: covered by typical claim '{label}' ({page}), whose governing check is {governing}."
    )


def not_covered(name: str, where: str, label: str, page: str, reasons: list[str]) -> str:
    return f"{_cap(name)} at {where} is not covered by typical claim '{label}' ({page}): {'; '.join(reasons)}."


def exceeds(quantity: str, ours: float, claimed: float, d: Display) -> str:
    return f"its {quantity} = {d.force(ours)} exceeds the claim's {d.force(claimed)}"


def below(quantity: str, ours: float, claimed: float, d: Display) -> str:
    return f"its {quantity} = {d.force(ours)} is below the claim's {d.force(claimed)}"


def unmatched(label: str, page: str, reason: str, hint: str) -> str:
    return f"Claim '{label}' ({page}) matches no required check: {reason}; {hint}."


def uplift(bearing: str, placed: str, force: float, small: bool, threshold: float, whose: str, d: Display) -> str:
    advice = (  # below the threshold nothing is asked: the ordinary framing nails hold it (the pack's source)
        f"below {whose} of {d.force(threshold)}, which the ordinary framing nails hold: continuity of the "
        "statics, noted for the record; nothing is asked."
        if small
        else "a bearing cannot resist uplift, confirm the tie-down."
    )
    return f"Bearing {bearing}: {placed} gives an upward force of {d.force_not_zero(force)}; {advice}"


def no_bearing_length(member: str, loads: list[str]) -> str:
    if len(loads) == 1:
        return (
            f"Point load {loads[0]} on {member} states no bearing length: the crushing of {member} under it is not "
            f"checked. Give the load's bearing length along {member} (length, and width where narrower than the "
            "member)."
        )
    named = ", ".join(loads[:-1]) + f" and {loads[-1]}"
    return (
        f"Point loads {named} on {member} state no bearing length: the crushing of {member} under them is not "
        f"checked. Give each load's bearing length along {member} (length, and width where narrower than the "
        "member)."
    )


def unseen_support(member: str, spots: str) -> str:
    return (
        f"{member} is modelled as continuously supported on something the model does not show, and {spots} land on "
        f"it: the underside of {member} and the squeeze through it at those spots are not checked. Give the wall "
        "under it (support: studs, with a stud pack under each concentrated load) or the member below; for a sill "
        "on concrete or masonry, name that material with bears_on."
    )


def hanger_capacity(
    bearing: str, hanger: str, combination: str, qf: float, capacity: float, how: str, source: str, d: Display
) -> str:
    ratio = max(qf, 0.0) / capacity
    if ratio <= 1.0 + 1e-9:
        verdict = f"within it (Qf/capacity {ratio:.2f}), listed for the record; nothing is asked."
    else:
        verdict = f"over it (Qf/capacity {ratio:.2f}): give a hanger whose listed capacity carries it."
    return (
        f"Hanger {hanger} at {bearing}: the factored reaction under {combination} is {d.force(qf)} against the "
        f"listed capacity of {d.force(capacity)} ({how}; {source}); {verdict}"
    )


def hanger_flange(bearing: str, hanger: str, carrier: str, flange: float, width: float) -> str:
    return (
        f"Hanger {hanger} at {bearing}: its top flange reaches {flange * 1000:.0f} mm across {carrier}, which is "
        f"{width * 1000:.0f} mm wide; give a hanger whose flange fits the carrier, or a carrier as wide as the flange."
    )


def hanger_side(carrier: str, bearing: str, carried: str, hanger: str) -> str:
    return (
        f"{carrier} carries {carried} (bearing {bearing}) in face-mount hanger {hanger}: the load enters its side "
        "through the hanger's fasteners, not a bearing on its grain, so no bearing check of the carrier is made "
        "there; noted for the record, nothing is asked."
    )


def short_bearing(
    bearing: str, member: str, role: str, length: float, minimum: float, clause: str, status: str, d: Display
) -> str:
    return (
        f"Bearing {bearing}: the {role} {member} bears {_length(length, d)} along its grain, less than the "
        f"{_length(minimum, d)} {clause} asks at the end of a {role} (the value is {status}). Give a longer seat "
        f"or show that {clause} does not apply."
    )


def _length(metres: float, d: Display) -> str:
    """A bearing length in the project's units: mm (SI), inches to a hundredth (US)."""
    if d.force_unit in ("lbf", "kip"):
        return f"{metres / 0.0254:.2f} in"
    return f"{metres * 1000:.0f} mm"
