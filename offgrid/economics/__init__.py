"""Economics of a design: bill of materials, price lists, lifecycle cost, variants.

* :mod:`offgrid.economics.bom` -- the parts of a design with quantities and keys;
* :mod:`offgrid.economics.prices` -- the one price-list reader and the part-key rules;
* :mod:`offgrid.economics.costs` -- capital, replacements and present-worth lifecycle cost;
* :mod:`offgrid.economics.variants` -- overrides of a project designed and compared.

Engine code: plain data, no UI; the report and the text UI render what it returns.
"""
