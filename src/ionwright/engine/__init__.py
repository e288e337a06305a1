"""The forward engine: a recipe, its tables and activity model, compiled and solved.

Internal: the public entry points are in :mod:`ionwright`.
"""
