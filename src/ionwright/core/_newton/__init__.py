"""The steps of the batched Newton solve that :mod:`ionwright.solver` puts together: the
system's structure, the initial guess, the fast path and the careful path."""
