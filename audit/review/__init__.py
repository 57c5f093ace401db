"""The review: runs the stages, joins the calc's claims to the checks, collects findings."""
