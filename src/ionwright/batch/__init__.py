"""Many samples at once: tables of samples in, one row of results per sample out, solved
locally in chunks or on a distributed engine.

Internal: the public entry point is :func:`ionwright.solve_batch`.
"""
