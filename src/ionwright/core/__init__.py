"""The numerical core: a chemical system compiled into arrays, the vectorised Newton solver
and its steps (``_newton``), sparse algebra over a batch, the method for solids and gases,
and sensitivities from the converged Jacobian.

Internal: the public entry points are in :mod:`ionwright`.
"""
