"""bearing-audit: recompute and reconcile timber bearing checks (CSA O86, compression
perpendicular to grain) in a calculation package under review.

The pipeline, one module per stage:

    read_model -> take_down -> list_checks -> resist -> read_claims -> reconcile -> write_memo
"""

__version__ = "0.1.0"
