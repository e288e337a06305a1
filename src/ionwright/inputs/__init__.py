"""What users give: recipes (files and mappings), quantities and units, water analyses.

Internal: the public entry points are in :mod:`ionwright`.
"""
