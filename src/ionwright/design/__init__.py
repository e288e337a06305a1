"""Tools built on the forward engine: the dose to a target pH, the buffer designer, sweeps
and the comparison of activity models.

Internal: the public entry points are in :mod:`ionwright`.
"""
