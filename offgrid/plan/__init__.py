"""Community planning: a survey of many households and facilities, designed row by row
with the single-project engine, standardised into a few kits, and totalled for procurement.

Modules: :mod:`survey` (community CSV), :mod:`rows` (design every row, cached and in
parallel), :mod:`kits` (exact interval dynamic programme for K standard kits),
:mod:`prices` (price list CSV), :mod:`totals` (procurement quantities and capital cost),
:mod:`tiers` (ESMAP Multi-Tier Framework), :mod:`community` (the whole pipeline) and
:mod:`text` (plain-text and Markdown views).  No UI imports.
"""
