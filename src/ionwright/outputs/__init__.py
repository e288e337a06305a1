"""What a solve gives back: the result object, derived quantities, cautions, provenance,
the text report and plots.

Internal: the public entry points are in :mod:`ionwright`.
"""
