"""Solar water pumping: hydraulics, the pump on the array's I-V curve, the tank.

Engine only (no UI imports).  The inputs' labels, ranges and hints are the catalogue's
``water[].`` rows (:mod:`offgrid.catalogue.water`);
``design.water_design`` sizes one ``[[water]]`` supply of a project.
"""
