"""A generator beside the sun: derating, fuel curve, the generator check, inputs and cautions.

Engine only (no UI imports).  The dispatch over synthetic weather is in
:mod:`offgrid.simulate.dispatch`, its costs in :mod:`offgrid.economics.generator_costs`.
"""
