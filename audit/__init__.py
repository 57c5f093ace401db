"""bearing-audit: recompute and reconcile timber bearing checks (CSA O86, compression
perpendicular to grain) in a calculation package under review.

One package per stage; each imports only the ones below it:

    inputs (read the model, claims, PDF) -> engine (take loads down the framing)
    -> standards (list the required checks, compute resistances from a rule pack)
    -> review (reconcile claims with checks) -> report (write the memo)

``core`` (errors, located YAML, units, safe writes) sits under all of them; ``cli`` on top.
"""

__version__ = "0.1.0"
