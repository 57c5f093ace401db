"""The words of every finding, one function per kind, in one place.

Stages decide *what* was found (kind, weight, place, numbers) and call the kind's function
here for the sentence; the memo, the comment logs and the terminal all show that sentence.
Forces are shown in the claim's own unit where a claim is involved (a claim in lbf is answered
in lbf), else in the project's (``Display``).
"""

from __future__ import annotations

from audit.core.units import Display


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
    kind: str,
    member: str,
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
        f"{_cap(kind)} bearing of {member} at {where} fails: recomputed Qf = {d.force(qf)} > Qr = {d.force(qr)} "
        f"(Qf/Qr = {util:.2f}, {combo}); {stance}. {remedy}"
    )


def missing(kind: str, member: str, where: str, why: str, qf: float, qr: float, combo: str, d: Display) -> str:
    return (
        f"Missing {kind} check of {member} at {where}: required because {why}. "
        f"Recomputed Qf = {d.force(qf)}, Qr = {d.force(qr)} ({combo})."
    )


def ratio_only(
    kind: str,
    member: str,
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
        f"{_cap(kind)} check of {member} at {where}: the calc states only Qf/Qr = {claimed:.2f}; recomputed "
        f"Qf/Qr = {util:.2f} ({direction}; recomputed Qf = {d.force(qf)}, Qr = {d.force(qr)}, {combo})."
    )


def differs(
    kind: str,
    member: str,
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
        f"{_cap(kind)} check of {member} at {where}: claimed {quantity} = {d.force(claimed)}, recomputed "
        f"{d.force(recomputed)} ({relative:+.0%}, {direction}). "
    )
    if factor_notes:
        text += "Factors that differ: " + "; ".join(factor_notes) + ". "
    if causes:
        text += "Likely cause: " + "; or ".join(causes) + "."
    else:
        text += f"No single common slip reproduces the claimed {what}."
    return text


def confirmed(kind: str, member: str, where: str, qf: float, qr: float, d: Display) -> str:
    return (
        f"{_cap(kind)} check of {member} at {where} confirmed: claimed and recomputed agree within tolerance "
        f"(Qf = {d.force(qf)}, Qr = {d.force(qr)})."
    )


def covered(check_words: str, member: str, where: str, label: str, page: str, governing: str) -> str:
    return (
        f"{check_words} of {member} at {where}: covered by typical claim '{label}' ({page}), whose governing "
        f"check is {governing}."
    )


def not_covered(check_words: str, member: str, where: str, label: str, page: str, reasons: list[str]) -> str:
    return (
        f"{check_words} of {member} at {where} is not covered by typical claim '{label}' ({page}): "
        f"{'; '.join(reasons)}."
    )


def exceeds(quantity: str, ours: float, claimed: float, d: Display) -> str:
    return f"its {quantity} = {d.force(ours)} exceeds the claim's {d.force(claimed)}"


def below(quantity: str, ours: float, claimed: float, d: Display) -> str:
    return f"its {quantity} = {d.force(ours)} is below the claim's {d.force(claimed)}"


def unmatched(label: str, page: str, reason: str, hint: str) -> str:
    return f"Claim '{label}' ({page}) matches no required check: {reason}; {hint}."


def uplift(bearing: str, placed: str, force: float, small: bool, threshold: float, whose: str, d: Display) -> str:
    advice = (
        f"below {whose} of {d.force(threshold)}: likely continuity of the statics; confirm the fastening holds it."
        if small
        else "a bearing cannot resist uplift, confirm the tie-down."
    )
    return f"Bearing {bearing}: {placed} gives an upward force of {d.force_not_zero(force)}; {advice}"


def unseen_support(member: str, spots: str) -> str:
    return (
        f"{member} is modelled as continuously supported on something the model does not show, and {spots} land on "
        f"it: the underside of {member} and the squeeze through it at those spots are not checked. Give the wall "
        "under it (support: studs, with a stud pack under each concentrated load) or the member below; for a sill "
        "on concrete or masonry, name that material with bears_on."
    )
