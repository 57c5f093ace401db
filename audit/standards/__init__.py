"""Design standards: rule packs, the checks a contact requires, and resistances with their factors."""
